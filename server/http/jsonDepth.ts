import type { RequestHandler } from 'express';
import { HttpError } from './errors.ts';

/**
 * Deepest JSON body any route accepts. Our deepest record (a sketch document inside a save) is
 * six levels deep; a body nested thousands deep is an attack on the validators and on anything
 * that walks it recursively (zod's error formatting, JSON.stringify: a stack overflow is a 500).
 */
export const MAX_JSON_DEPTH = 32;

/** Depth of a parsed JSON value (0 for a scalar), walked without recursion; stops past `limit`. */
export function jsonDepth(value: unknown, limit = Infinity): number {
  let deepest = 0;
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length) {
    const [v, depth] = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    const d = depth + 1;
    if (d > deepest) deepest = d;
    if (deepest > limit) return deepest;
    for (const child of Array.isArray(v) ? v : Object.values(v)) {
      if (child !== null && typeof child === 'object') stack.push([child, d]);
    }
  }
  return deepest;
}

/** After express.json(): refuses a body nested deeper than MAX_JSON_DEPTH with a 400. */
export const refuseDeepJson: RequestHandler = (req, _res, next) => {
  if (req.body !== null && typeof req.body === 'object' && jsonDepth(req.body, MAX_JSON_DEPTH) > MAX_JSON_DEPTH) {
    next(new HttpError(400, 'too_deep', `body: nested more than ${MAX_JSON_DEPTH} levels deep; no Shockwright input is that deep.`));
    return;
  }
  next();
};

/**
 * The API reads JSON only: a request that carries a body of another type (a form, a multipart
 * upload, a CSV file) is refused with 415 instead of being read as an empty body — which a route
 * whose fields are all optional would otherwise accept. (Coordinates files are read in the
 * browser and sent as JSON.) It also keeps plain HTML forms, which cannot send JSON, out.
 */
export const refuseNonJsonBodies: RequestHandler = (req, _res, next) => {
  const hasBody = req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0;
  if (hasBody && !req.is('application/json')) {
    next(new HttpError(415, 'unsupported_media_type', `body: send JSON (Content-Type: application/json), not ${req.headers['content-type'] ?? 'an untyped body'}.`));
    return;
  }
  next();
};
