// The part of autocannon's programmatic API the benchmark uses.
declare module 'autocannon' {
  interface Options {
    url: string;
    method?: string;
    connections?: number;
    /** seconds to run, unless amount is given */
    duration?: number;
    /** requests to send, then stop */
    amount?: number;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Result {
    requests: { total: number; average: number };
    errors: number;
    timeouts: number;
    non2xx: number;
  }
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
