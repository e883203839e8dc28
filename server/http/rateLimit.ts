import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { rateLimit, ipKeyGenerator, type Options, type Store, type IncrementResponse } from 'express-rate-limit';
import type { Request, RequestHandler, Response } from 'express';
import type { Db } from '../db/client.ts';
import { clearRateLimit, hitRateLimit, unhitRateLimit } from './repository.ts';
import { errorForLog } from '../log.ts';

/**
 * express-rate-limit store over the `rate_limits` table, so every server instance on the same
 * database shares the counters (an attacker cannot multiply attempts by hitting two instances).
 * One statement per increment: insert, or restart the window when it has expired, or add a hit.
 */
class PostgresRateLimitStore implements Store {
  prefix: string;
  localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly db: Db,
    prefix: string,
  ) {
    this.prefix = prefix;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  /**
   * The stored key: the limiter's name and a digest of what it counts (address, account…), so
   * no e-mail address or client address sits in the table or in a query's parameters, and any
   * text a person typed — however long, whatever characters — makes a short, storable key.
   */
  private stored(key: string): string {
    return this.prefix + createHash('sha256').update(key).digest('base64url');
  }

  async increment(key: string): Promise<IncrementResponse> {
    const { hits, resetAt } = await hitRateLimit(this.db, this.stored(key), this.windowMs);
    return { totalHits: hits, resetTime: resetAt };
  }

  async decrement(key: string): Promise<void> {
    await unhitRateLimit(this.db, this.stored(key));
  }

  async resetKey(key: string): Promise<void> {
    await clearRateLimit(this.db, this.stored(key));
  }
}

export interface LimitOptions {
  /** Distinguishes limiters sharing the table. */
  name: string;
  windowMs: number;
  limit: number;
  /** What the person was trying to do, for the 429 message ("sign-in attempts"). */
  what: string;
  key: (req: Request) => string;
  /** Count only failed requests (status ≥ 400): right for sign-in. */
  onlyFailures?: boolean;
  /** Requests this limiter leaves alone. */
  skip?: (req: Request) => boolean;
}

function minutes(ms: number): string {
  const m = Math.max(1, Math.ceil(ms / 60_000));
  return m === 1 ? '1 minute' : `${m} minutes`;
}

/**
 * A limiter that answers a locked-out request with 429, a Retry-After header and the usual error
 * shape saying when to try again.
 */
export function createLimiter(db: Db, options: LimitOptions, log: (line: string) => void): RequestHandler {
  return rateLimit({
    // express-rate-limit prints store errors to the console by default, raw: a Drizzle error's
    // message carries the query's parameters. Ours go to the app's (redacting) log as one line.
    logger: {
      warn: (...args: unknown[]) => log(`[rate-limit] ${options.name}: ${describeLimiterLog(args)}`),
      error: (...args: unknown[]) => log(`[rate-limit] ${options.name}: ${describeLimiterLog(args)}`),
    },
    windowMs: options.windowMs,
    limit: options.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipFailedRequests: false,
    skipSuccessfulRequests: options.onlyFailures ?? false,
    store: new PostgresRateLimitStore(db, `${options.name}:`),
    keyGenerator: (req) => options.key(req),
    ...(options.skip ? { skip: options.skip } : {}),
    handler: (req, res) => {
      const info = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit;
      const waitMs = info?.resetTime ? info.resetTime.getTime() - Date.now() : options.windowMs;
      const retryAfterSeconds = Math.max(1, Math.ceil(waitMs / 1000));
      res.setHeader('Retry-After', String(retryAfterSeconds));
      res.status(429).json({
        error: {
          code: 'rate_limited',
          message: `Too many ${options.what}. Try again in ${minutes(waitMs)}.`,
          details: { retryAfterSeconds },
        },
      });
    },
  });
}

/** express-rate-limit's log arguments (an error and its own sentence) as one safe line. */
function describeLimiterLog(args: unknown[]): string {
  return args.map((a) => (typeof a === 'string' ? a : errorForLog(a, false))).join(' ');
}

/** Client address for limiter keys (IPv6 collapsed to its /56, as express-rate-limit advises). */
export function clientKey(req: Request): string {
  return ipKeyGenerator(req.ip ?? 'unknown');
}

// ── Known devices: the right password keeps working through someone else's failures ─────────

export const DEVICE_COOKIE = 'sw.device';
const DEVICE_MAX_AGE_MS = 365 * 24 * 60 * 60 * 1000;

/**
 * Sign-in failures are counted per account *and* per device or address. A browser that has
 * signed in to an account before carries a device cookie for it (a random nonce and an HMAC of
 * nonce + account under the session secret, so it cannot be made up or moved to another
 * account); its failures are counted on their own. Someone else failing on the account — even
 * from the same address (an office behind one NAT) — cannot lock that browser out, while an
 * attacker without the cookie is limited per address and account.
 */
export function createDeviceKeys(secret: string) {
  const sign = (nonce: string, email: string) => createHmac('sha256', secret).update(`device|${nonce}|${email}`).digest('base64url');
  return {
    /** The nonce of a valid device cookie for `email`, or null. */
    deviceOf(req: Request, email: string): string | null {
      const raw = parseCookies(req.headers.cookie)[DEVICE_COOKIE];
      const [nonce, mac] = (raw ?? '').split('.');
      if (!nonce || !mac || !/^[A-Za-z0-9_-]{22}$/.test(nonce)) return null;
      const expected = Buffer.from(sign(nonce, email));
      const given = Buffer.from(mac);
      return expected.length === given.length && timingSafeEqual(expected, given) ? nonce : null;
    },
    /** After a successful sign-in: this browser becomes a known device of `email`. */
    remember(req: Request, res: Response, email: string): void {
      const nonce = randomBytes(16).toString('base64url');
      res.cookie(DEVICE_COOKIE, `${nonce}.${sign(nonce, email)}`, { httpOnly: true, sameSite: 'lax', secure: req.secure, maxAge: DEVICE_MAX_AGE_MS, path: '/api/auth' });
    },
  };
}

function parseCookies(header: string | undefined): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of (header ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i <= 0) continue;
    try {
      out[part.slice(0, i).trim()] = decodeURIComponent(part.slice(i + 1).trim());
    } catch {
      // A malformed value is no device cookie.
    }
  }
  return out;
}
