import type { RequestHandler } from 'express';
import { HttpError } from './errors.ts';
import { requestHost, type TrustFn } from './forwarded.ts';

export const CSRF_HEADER = 'x-shockwright-request';
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * CSRF defence for cookie-authenticated requests, two layers:
 * 1. every state-changing request must carry the custom header `x-shockwright-request` — a
 *    cross-site page can only add it through a CORS preflight, which this server never grants;
 * 2. when the browser sends an Origin header, its host must be ours (strict origin check).
 * Our own fetch wrapper (src/api/client.ts) always sends the header.
 */
export const csrfGuard: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  if (!req.get(CSRF_HEADER)) {
    return next(new HttpError(403, 'csrf', `Request refused: state-changing requests must carry the ${CSRF_HEADER} header (cross-site request protection).`));
  }
  const origin = req.get('origin');
  if (origin && origin !== 'null') {
    let host: string;
    try {
      host = new URL(origin).host;
    } catch {
      return next(new HttpError(403, 'csrf', 'Request refused: malformed Origin header.'));
    }
    // X-Forwarded-Host counts only when it comes from a proxy TRUST_PROXY names.
    const expected = requestHost(req, req.app.get('trust proxy fn') as TrustFn);
    if (host !== expected) {
      return next(new HttpError(403, 'csrf', `Request refused: it came from ${origin}, not from this site.`));
    }
  } else if (origin === 'null') {
    return next(new HttpError(403, 'csrf', 'Request refused: opaque origin.'));
  }
  next();
};
