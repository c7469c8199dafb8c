// The optional CSP report endpoint (CSP_REPORTS=on): browsers post a violation here, and the log gets the
// directive that was violated and nothing else (a report also carries the page's address and a sample of the
// blocked text, either of which could hold a case value). Both report formats are read: the classic
// application/csp-report ({"csp-report": {"effective-directive": ...}}) and the Reporting API's
// application/reports+json ([{"type": "csp-violation", "body": {"effectiveDirective": ...}}]).
import { Hono } from 'hono';
import { bodyLimit } from './limits.ts';

export const CSP_REPORT_PATH = '/csp-report';
/** a report is small: a few hundred bytes; this leaves room and no more */
const REPORT_LIMIT_BYTES = 8 * 1024;
/** the directive names of CSP Level 3 (W3C Content Security Policy Level 3, section 6); anything else: "unknown" */
const DIRECTIVES = new Set(
  [
    'base-uri child-src connect-src default-src fenced-frame-src font-src form-action frame-ancestors frame-src',
    'img-src manifest-src media-src object-src prefetch-src report-to report-uri require-trusted-types-for',
    'sandbox script-src script-src-attr script-src-elem style-src style-src-attr style-src-elem trusted-types',
    'upgrade-insecure-requests webrtc worker-src',
  ]
    .join(' ')
    .split(' '),
);

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

/** The violated directives a report names, each a bare directive name ("script-src-elem") or "unknown". */
export function reportedDirectives(body: unknown): string[] {
  const reports = Array.isArray(body) ? body : [body];
  return reports.slice(0, 20).map((report) => {
    if (!isObject(report)) return 'unknown';
    const classic = isObject(report['csp-report']) ? report['csp-report'] : null;
    const modern = isObject(report.body) ? report.body : null;
    const named =
      classic?.['effective-directive'] ??
      classic?.['violated-directive'] ??
      modern?.effectiveDirective;
    // a violated-directive may carry its sources after the name: the name alone is kept
    const name = typeof named === 'string' ? named.trim().split(/\s/)[0]!.toLowerCase() : '';
    return DIRECTIVES.has(name) ? name : 'unknown';
  });
}

export function cspReportRoute(log: (line: string) => void): Hono {
  const route = new Hono();
  route.post(
    CSP_REPORT_PATH,
    bodyLimit({ maxSize: REPORT_LIMIT_BYTES, onError: (c) => c.body(null, 413) }),
    async (c) => {
      let body: unknown;
      try {
        body = JSON.parse(await c.req.text());
      } catch {
        return c.body(null, 400);
      }
      for (const directive of reportedDirectives(body)) log(`csp violation: ${directive}`);
      return c.body(null, 204);
    },
  );
  return route;
}
