import type { NextFunction, Request, Response } from 'express'
import helmet from 'helmet'
import { AppError } from '../lib/errors.js'

/**
 * Security headers (helmet) with the content-security-policy tightened beyond helmet's defaults to
 * ASVS 5.0 3.4.3 and 3.4.6: object-src, base-uri and frame-ancestors 'none'.
 */
export function securityHeaders(httpsOnly: boolean) {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: true,
      directives: {
        'default-src': ["'self'"],
        'script-src': ["'self'"],
        // Vuetify sets inline style attributes at run time (vuetifyjs/vuetify#3950).
        'style-src': ["'self'", "'unsafe-inline'"],
        'img-src': ["'self'", 'data:'],
        'font-src': ["'self'"],
        'connect-src': ["'self'"],
        'object-src': ["'none'"],
        'base-uri': ["'none'"],
        'frame-ancestors': ["'none'"],
        'form-action': ["'self'"],
        'upgrade-insecure-requests': httpsOnly ? [] : null,
      },
    },
    strictTransportSecurity: { maxAge: 31536000, includeSubDomains: true },
    crossOriginOpenerPolicy: { policy: 'same-origin' },
    referrerPolicy: { policy: 'no-referrer' },
  })
}

/** API answers may hold personal data: never cache them (ASVS 14.3.2). */
export function noStore(_req: Request, res: Response, next: NextFunction) {
  res.setHeader('Cache-Control', 'no-store')
  next()
}

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

/**
 * A second layer in front of the CSRF token (OWASP CSRF Cheat Sheet, "Fetch Metadata"): state-changing
 * requests must be same-origin when the browser says where they come from, and carry JSON (or a file
 * upload), so no "simple" cross-site form or text/plain request reaches a route.
 */
export function sameOriginWrites(publicOrigin: string) {
  return function checkOrigin(req: Request, _res: Response, next: NextFunction) {
    if (!STATE_CHANGING.has(req.method)) return next()
    const site = req.get('sec-fetch-site')
    if (site && site !== 'same-origin' && site !== 'none') {
      return next(new AppError(403, 'cross-site', 'Cross-site request refused', 'Requests must come from Heardwell itself.'))
    }
    const origin = req.get('origin')
    if (origin && origin !== 'null') {
      let host: string
      try {
        host = new URL(origin).host
      } catch {
        host = ''
      }
      if (origin !== publicOrigin && host !== req.get('host')) {
        return next(new AppError(403, 'cross-site', 'Cross-site request refused', 'Requests must come from Heardwell itself.'))
      }
    }
    const hasBody = Number(req.get('content-length') ?? 0) > 0 || req.get('transfer-encoding') !== undefined
    if (hasBody && !req.is(['application/json', 'application/*+json', 'multipart/form-data'])) {
      return next(new AppError(415, 'unsupported-media-type', 'Unsupported media type', 'Send JSON (Content-Type: application/json).'))
    }
    next()
  }
}
