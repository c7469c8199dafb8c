// Headers and the origin check: Hono's own middleware, with our settings.
import type { MiddlewareHandler } from 'hono';
import { secureHeaders } from 'hono/secure-headers';
import { csrf } from 'hono/csrf';

/**
 * A strict Content-Security-Policy (no inline script or style, no eval), no referrer, no sniffing, and no framing
 * unless frameAncestors lists the record's origins (FRAME_ANCESTORS) that may embed the page after a launch.
 */
export const securityHeaders = (frameAncestors: readonly string[] = []): MiddlewareHandler =>
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
    },
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
