import type { IncomingMessage } from 'node:http';
import { itemAt } from '../../shared/util/invariant.ts';

/** express's compiled `trust proxy` setting: is the hop at `index` a proxy we believe? */
export type TrustFn = (address: string | undefined, index: number) => boolean;

/**
 * The host a request was addressed to, by the same rule Express uses for `req.host`: the first
 * X-Forwarded-Host value when the peer is a trusted proxy (TRUST_PROXY), else Host. The CSRF
 * origin check and the socket.io handshake both use it, so REST and sockets agree behind a proxy.
 */
export function requestHost(req: IncomingMessage, trust: TrustFn): string | undefined {
  const forwarded = req.headers['x-forwarded-host'];
  const value = Array.isArray(forwarded) ? forwarded[0] : forwarded;
  if (value && trust(req.socket.remoteAddress, 0)) return itemAt(value.split(','), 0).trim();
  return req.headers.host;
}

/** True when a present Origin header names `host` (an absent Origin is not a cross-site request). */
export function originMatches(origin: string | undefined, host: string | undefined): boolean {
  if (!origin) return true;
  try {
    return new URL(origin).host === host;
  } catch {
    return false;
  }
}
