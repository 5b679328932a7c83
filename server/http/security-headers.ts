// Security headers on every answer (helmet). The Content-Security-Policy allows only this
// origin's own scripts, styles, fonts and workers: the built client has no inline script (Vite
// emits module files; the service worker is registered from a bundled module, injectRegister
// null in vite.config.ts), so no 'unsafe-inline' is needed. Photos shown before upload are blob:
// URLs. HSTS and upgrade-insecure-requests only in production, where the app sits behind HTTPS.
import helmet from 'helmet';
import type { RequestHandler } from 'express';

export const contentSecurityPolicy = (production: boolean) => ({
  defaultSrc: ["'self'"],
  scriptSrc: ["'self'"],
  styleSrc: ["'self'"],
  imgSrc: ["'self'", 'blob:', 'data:'],
  fontSrc: ["'self'"],
  connectSrc: ["'self'"],
  workerSrc: ["'self'"],
  manifestSrc: ["'self'"],
  objectSrc: ["'none'"],
  baseUri: ["'self'"],
  formAction: ["'self'"],
  frameAncestors: ["'none'"],
  ...(production ? { upgradeInsecureRequests: [] } : {}),
});

export function securityHeaders(production: boolean): RequestHandler {
  return helmet({
    contentSecurityPolicy: { useDefaults: false, directives: contentSecurityPolicy(production) },
    strictTransportSecurity: production ? { maxAge: 365 * 24 * 60 * 60, includeSubDomains: true } : false,
    frameguard: { action: 'deny' },
    referrerPolicy: { policy: 'same-origin' },
  });
}

/** API answers carry people's data: no browser or proxy keeps a copy (routes that may, say so). */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store');
  next();
};
