// The part of autocannon's programmatic API the benchmark uses.
declare module 'autocannon' {
  interface Options {
    url: string;
    method?: string;
    connections?: number;
    duration?: number;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Histogram {
    average: number;
    p50: number;
    p99: number;
    max: number;
  }
  interface Result {
    requests: Histogram;
    latency: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
  }
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
