import { rateLimit, ipKeyGenerator, type Options, type Store, type IncrementResponse } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';

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

  async increment(key: string): Promise<IncrementResponse> {
    const k = this.prefix + key;
    const windowMs = this.windowMs;
    const { rows } = await this.db.execute<{ hits: number; reset_at: Date }>(sql`
      insert into rate_limits (key, hits, reset_at)
      values (${k}, 1, now() + make_interval(secs => ${windowMs / 1000}))
      on conflict (key) do update set
        hits = case when rate_limits.reset_at <= now() then 1 else rate_limits.hits + 1 end,
        reset_at = case when rate_limits.reset_at <= now() then excluded.reset_at else rate_limits.reset_at end
      returning hits, reset_at`);
    return { totalHits: Number(rows[0].hits), resetTime: new Date(rows[0].reset_at) };
  }

  async decrement(key: string): Promise<void> {
    await this.db.execute(sql`update rate_limits set hits = greatest(hits - 1, 0) where key = ${this.prefix + key}`);
  }

  async resetKey(key: string): Promise<void> {
    await this.db.execute(sql`delete from rate_limits where key = ${this.prefix + key}`);
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
}

function minutes(ms: number): string {
  const m = Math.max(1, Math.ceil(ms / 60_000));
  return m === 1 ? '1 minute' : `${m} minutes`;
}

/**
 * A limiter that answers a locked-out request with 429, a Retry-After header and the usual error
 * shape saying when to try again.
 */
export function createLimiter(db: Db, options: LimitOptions): RequestHandler {
  return rateLimit({
    windowMs: options.windowMs,
    limit: options.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipFailedRequests: false,
    skipSuccessfulRequests: options.onlyFailures ?? false,
    store: new PostgresRateLimitStore(db, `${options.name}:`),
    keyGenerator: (req) => options.key(req),
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

/** Client address for limiter keys (IPv6 collapsed to its /56, as express-rate-limit advises). */
export function clientKey(req: Request): string {
  return ipKeyGenerator(req.ip ?? 'unknown');
}
