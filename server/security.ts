import type { RequestHandler } from 'express';
import helmet from 'helmet';

import type { Config } from './config';
import { AppError } from './errors';
import type { OriginChecker } from './origin';

/**
 * Security headers for the web app, the API and attachments. The Expo web export
 * loads only its own scripts and fonts; react-native-web writes its styles into
 * <style> elements, hence 'unsafe-inline' for styles only. HSTS only when the
 * server is reached over https (PUBLIC_URL), where it means something.
 */
export function securityHeaders(config: Config): RequestHandler {
  const https = (config.PUBLIC_URL ?? '').startsWith('https:');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'],
        // the photo picker hands over a data: or blob: address that the page reads with fetch
        connectSrc: ["'self'", 'data:', 'blob:'],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: https ? { maxAge: 31_536_000, includeSubDomains: true } : false,
    referrerPolicy: { policy: 'same-origin' },
    crossOriginEmbedderPolicy: false,
  });
}

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request defence for every state-changing request: a browser's request
 * must come from this server's own origin (Origin, or Sec-Fetch-Site where a
 * browser sends no Origin). SameSite=Lax stops other sites, not a page on another
 * port of the same host, which is "same-site". Bodies must be JSON, multipart or CSV:
 * a text/plain or form-encoded body is what a cross-origin page can send without
 * asking first.
 */
export function crossSiteDefence(sameOrigin: OriginChecker): RequestHandler {
  return (req, _res, next) => {
    if (safeMethods.has(req.method)) return next();
    const origin = req.get('origin');
    const site = req.get('sec-fetch-site');
    if (
      origin !== undefined
        ? !sameOrigin(origin, req.get('host'))
        : site !== undefined && site !== 'same-origin' && site !== 'none'
    ) {
      throw new AppError('forbidden', 'This request came from another origin and was refused');
    }
    const length = Number(req.get('content-length') ?? 0);
    const chunked = req.get('transfer-encoding') !== undefined;
    // text/csv (imports from scripts) is not a type a page may send cross-origin without a preflight
    if ((length > 0 || chunked) && !req.is(['application/json', 'multipart/form-data', 'text/csv'])) {
      throw new AppError(
        'bad_request',
        'Send the body as JSON (application/json), multipart/form-data or, for imports, text/csv',
      );
    }
    next();
  };
}
