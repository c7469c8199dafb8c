// Headers and the origin check: Hono's own middleware, with our settings.
import type { MiddlewareHandler } from 'hono';
import { secureHeaders } from 'hono/secure-headers';
import { csrf } from 'hono/csrf';
import { isIP } from 'node:net';

export interface HeaderSettings {
  /** origins of the record allowed to embed the page (FRAME_ANCESTORS); none: no framing */
  frameAncestors?: readonly string[];
  /** Strict-Transport-Security (HSTS=on); off by default: the TLS proxy in front sends it */
  hsts?: boolean;
  /** where browsers report a CSP violation (CSP_REPORTS=on); none: no reports */
  reportUri?: string | null;
}

/** HSTS when turned on: a year, subdomains included (OWASP HTTP Strict Transport Security cheat sheet). */
export const HSTS_VALUE = 'max-age=31536000; includeSubDomains';

/**
 * A strict Content-Security-Policy (no inline script or style, no eval), no referrer, no sniffing, and no framing
 * unless frameAncestors lists the record's origins (FRAME_ANCESTORS) that may embed the page after a launch.
 */
export const securityHeaders = ({
  frameAncestors = [],
  hsts = false,
  reportUri = null,
}: HeaderSettings = {}): MiddlewareHandler =>
  secureHeaders({
    contentSecurityPolicy: {
      defaultSrc: ["'self'"],
      scriptSrc: ["'self'"],
      styleSrc: ["'self'"],
      imgSrc: ["'self'"],
      connectSrc: ["'self'"],
      fontSrc: ["'self'"],
      formAction: ["'self'"],
      frameAncestors: frameAncestors.length ? [...frameAncestors] : ["'none'"],
      baseUri: ["'none'"],
      objectSrc: ["'none'"],
      ...(reportUri ? { reportUri } : {}),
    },
    strictTransportSecurity: hsts ? HSTS_VALUE : false,
    // X-Frame-Options cannot name several origins: CSP frame-ancestors alone governs a listed embedding
    xFrameOptions: frameAncestors.length ? false : 'DENY',
    referrerPolicy: 'no-referrer',
    xContentTypeOptions: 'nosniff',
    crossOriginResourcePolicy: 'same-origin',
    permissionsPolicy: {
      camera: [],
      microphone: [],
      geolocation: [],
      payment: [],
      usb: [],
      serial: [],
      bluetooth: [],
      displayCapture: [],
      fullscreen: [],
    },
  });

/**
 * Form posts must come from this page: Hono's CSRF check of Sec-Fetch-Site and Origin. A browser always sends
 * at least one of the two on a cross-site post; a request with neither (curl, a test, an integration) cannot
 * carry a victim's browser session and is let through. Behind a reverse proxy that terminates TLS, the public
 * origin can be listed in ALLOWED_ORIGINS (comma-separated).
 */
export function originCheck(allowedOrigins: readonly string[] = []): MiddlewareHandler {
  const check = csrf({
    origin: (origin, c) => origin === new URL(c.req.url).origin || allowedOrigins.includes(origin),
    secFetchSite: 'same-origin',
  });
  return async (c, next) => {
    if (c.req.header('origin') === undefined && c.req.header('sec-fetch-site') === undefined)
      return next();
    return check(c, next);
  };
}

/** The host names a request may name (Host), against DNS rebinding: the names of PUBLIC_URL, ALLOWED_ORIGINS
 *  and ALLOWED_HOSTS, lower case; localhost and IP addresses are always accepted (see hostCheck). */
export function allowedHostNames(urls: readonly string[], names: readonly string[]): string[] {
  const out = new Set<string>();
  for (const raw of urls) {
    try {
      out.add(new URL(raw).hostname.toLowerCase());
    } catch {
      // the settings are checked at start-up (server/config.ts); nothing to add from a value that is not a URL
    }
  }
  for (const name of names) out.add(name.trim().toLowerCase());
  out.delete('');
  return [...out];
}

const isAddress = (hostname: string) => isIP(hostname.replace(/^\[|\]$/g, '')) !== 0;

/**
 * DNS rebinding: a hostile site's name made to point at this server reaches it with that name in Host. Only the
 * listed names, localhost, and IP addresses (a literal address is no rebinding) are answered; any other name gets
 * 421 Misdirected Request (RFC 9110, 15.5.20), before anything else is done.
 */
export function hostCheck(allowed: readonly string[]): MiddlewareHandler {
  const names = new Set(['localhost', ...allowed.map((n) => n.toLowerCase())]);
  return async (c, next) => {
    const hostname = new URL(c.req.url).hostname.toLowerCase();
    if (names.has(hostname) || isAddress(hostname)) return next();
    return c.json(
      {
        ok: false,
        errors: [
          {
            path: '(host)',
            message:
              'This server does not answer for that host name: use the address it is published at',
          },
        ],
      },
      421,
      { 'cache-control': 'no-store' },
    );
  };
}
