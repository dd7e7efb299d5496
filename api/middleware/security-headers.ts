/**
 * Security headers on every answer (helmet), with a content security policy the built web
 * app really runs under (checked in real Chromium by tests/e2e/security.test.ts):
 * - scripts only from the app's own origin (vite emits no inline script);
 * - styles from the origin plus inline: naive-ui renders its CSS-in-JS into <style> elements
 *   at run time, which a nonce-free policy can only allow with 'unsafe-inline';
 * - images also as data: and blob: URLs (icons, the plot's image export);
 * - workers from the origin and blob: (the design map's worker);
 * - no plugins, no framing, forms and fetches to the origin only.
 * The app is often served over plain HTTP inside a company network, so the policy does not
 * ask browsers to upgrade requests to HTTPS (that would break every asset there).
 */
import helmet from 'helmet'
import type { NextFunction, Request, RequestHandler, Response } from 'express'

/**
 * HSTS only on an answer to a request that came over TLS, directly or through the trusted
 * proxy (X-Forwarded-Proto from loopback, app.ts): sent over plain HTTP it means nothing to
 * a browser, and on a company network it would pin a host name to HTTPS that does not have it.
 * One year with subdomains, helmet's default value.
 */
export const HSTS_VALUE = 'max-age=31536000; includeSubDomains'

export const CONTENT_SECURITY_POLICY: Record<string, string[]> = {
  'default-src': ["'self'"],
  'script-src': ["'self'"],
  'style-src': ["'self'", "'unsafe-inline'"],
  'img-src': ["'self'", 'data:', 'blob:'],
  'font-src': ["'self'", 'data:'],
  'connect-src': ["'self'"],
  'worker-src': ["'self'", 'blob:'],
  'object-src': ["'none'"],
  'base-uri': ["'self'"],
  'form-action': ["'self'"],
  'frame-ancestors': ["'none'"],
}

export function securityHeaders(): RequestHandler {
  const headers = helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: CONTENT_SECURITY_POLICY,
    },
    // links out of the app do not carry its paths (entry ids, share tokens) to other sites
    referrerPolicy: { policy: 'same-origin' },
    strictTransportSecurity: false,
  })
  return function securityHeadersWithHsts(req: Request, res: Response, next: NextFunction) {
    if (req.secure) res.setHeader('Strict-Transport-Security', HSTS_VALUE)
    headers(req, res, next)
  }
}
