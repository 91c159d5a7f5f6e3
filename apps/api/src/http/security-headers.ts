import helmet from 'helmet';
import cors from 'cors';
import type { RequestHandler } from 'express';

/**
 * Browser hardening for every answer (API, web app, API reference page). The web app ships its own
 * scripts, styles and fonts, so everything comes from 'self'. Charts and React set styles through the
 * CSSOM (element.style), which CSP does not restrict, so no 'unsafe-inline' is needed. Images also
 * allow data: URIs (icons inlined by the bundler). `upgrade-insecure-requests` is only sent when the
 * public address is HTTPS, or a plain-HTTP deployment on the loopback would break.
 */
export function securityHeaders(publicUrl: string): RequestHandler {
  const https = publicUrl.startsWith('https:');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'"],
        fontSrc: ["'self'"],
        imgSrc: ["'self'", 'data:'],
        connectSrc: ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    frameguard: { action: 'deny' },
    noSniff: true,
    referrerPolicy: { policy: 'no-referrer' },
    strictTransportSecurity: https ? { maxAge: 180 * 24 * 3600, includeSubDomains: true } : false,
  });
}

/** Cross-origin calls are allowed from the public address of the web app only (with its cookies). */
export function corsForPublicUrl(publicUrl: string): RequestHandler {
  const origin = new URL(publicUrl).origin;
  return cors({
    origin: (requestOrigin, callback) => callback(null, requestOrigin === origin ? origin : false),
    credentials: true,
    allowedHeaders: ['Content-Type', 'Authorization', 'X-CSRF-Token'],
    exposedHeaders: ['X-Request-Id', 'Retry-After', 'Content-Disposition'],
  });
}
