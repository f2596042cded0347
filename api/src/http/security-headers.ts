/** helmet with a same-origin-only Content-Security-Policy: the web app loads no external script, style or font. */
import type { RequestHandler } from 'express';
import helmet from 'helmet';

/** Security headers for an app served from `publicUrl`. */
export function securityHeaders(publicUrl: string): RequestHandler {
  const isHttps = publicUrl.startsWith('https:');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        'default-src': ["'self'"],
        'script-src': ["'self'"],
        // Angular Material and AG Grid set inline style attributes at run time.
        'style-src': ["'self'", "'unsafe-inline'"],
        'img-src': ["'self'", 'data:', 'blob:'],
        'font-src': ["'self'", 'data:'],
        'connect-src': ["'self'"],
        'worker-src': ["'self'", 'blob:'],
        'object-src': ["'none'"],
        'base-uri': ["'self'"],
        'form-action': ["'self'"],
        'frame-ancestors': ["'none'"],
        // Upgrading on a plain-http loopback app would break every request.
        ...(isHttps ? { 'upgrade-insecure-requests': [] } : {}),
      },
    },
    strictTransportSecurity: isHttps ? { maxAge: 15552000, includeSubDomains: false } : false,
  });
}
