import { z } from 'zod';
import express from 'express';
import { firstItem } from '../shared/util/invariant.ts';

/**
 * The server's whole configuration, parsed once at boot. A bad value stops the process with a
 * one-line reason (see `loadEnv`) rather than surfacing later as a confusing runtime failure.
 */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: z.coerce
    .number({ error: 'must be a whole number from 0 to 65535' })
    .int('must be a whole number from 0 to 65535')
    .min(0, 'must be a whole number from 0 to 65535')
    .max(65535, 'must be a whole number from 0 to 65535')
    .default(3000),
  DATABASE_URL: z
    .string({ error: 'is required (a postgres:// connection URL)' })
    .refine((v) => /^postgres(ql)?:\/\//.test(v), 'must be a postgres:// or postgresql:// URL'),
  SESSION_SECRET: z.string({ error: 'is required (at least 32 characters)' }).min(32, 'must be at least 32 characters'),
  /** SMTP server for outgoing mail, e.g. smtp://127.0.0.1:2525. Unset: mail is logged, not sent. */
  SMTP_URL: z
    .string()
    .refine((v) => /^smtps?:\/\//.test(v), 'must be an smtp:// or smtps:// URL')
    .optional(),
  MAIL_FROM: z.string().default('Shockwright <no-reply@shockwright.local>'),
  /** The address people use to reach the app; used in links inside e-mails. */
  PUBLIC_URL: z.url('must be an absolute URL such as http://127.0.0.1:3000').optional(),
  /** Serve the built client from this folder (relative to the repo root). */
  CLIENT_DIST: z.string().default('dist/client'),
  /**
   * Which proxy's X-Forwarded-* headers to believe (client address, host, https): `false` (none,
   * the default), `true` (the one proxy in front), a number of proxies, or a comma-separated
   * list of proxy addresses / subnets (`127.0.0.1`, `10.0.0.0/8`, `loopback`). Trusting a header
   * nobody strips lets any client pick its address (and escape rate limits).
   */
  TRUST_PROXY: z
    .string()
    .default('false')
    .transform((v, ctx): boolean | number | string[] => {
      const t = v.trim();
      if (t === 'false' || t === '0') return false;
      if (t === 'true') return 1;
      if (/^\d+$/.test(t)) return Number(t);
      const list = t.split(',').map((s) => s.trim()).filter(Boolean);
      try {
        express().set('trust proxy', list);
      } catch {
        ctx.addIssue({ code: 'custom', message: 'must be true, false, a number of proxies, or a comma-separated list of proxy addresses or subnets' });
        return z.NEVER;
      }
      return list;
    }),
  /**
   * Development only: accounts (comma-separated e-mail addresses) that may read every message
   * of the local mail sink. Everyone else reads only mail addressed to them. Refused in
   * production, where the mailbox does not exist.
   */
  MAILBOX_OPERATOR: z
    .string()
    .optional()
    .transform((v) => (v ?? '').split(',').map((s) => s.trim().toLowerCase()).filter(Boolean)),
  LOG_REQUESTS: z
    .enum(['true', 'false', '0', '1'])
    .optional()
    .transform((v) => (v === undefined ? undefined : v === 'true' || v === '1')),
  /**
   * Tests only: the process kills itself (SIGKILL) right after committing an edit whose op id
   * starts with this, before acking or broadcasting it — the crash the realtime layer must heal.
   */
  FAULT_DIE_AFTER_COMMIT: z.string().min(1).optional(),
  /**
   * Tests only: a server study waits this long between its slices, so it is still running when
   * a test acts on it (another instance, a kill, a stop).
   */
  FAULT_STUDY_PAUSE_MS: z.coerce.number().int().min(1).max(60_000).optional(),
  /**
   * Tests only: a server study's slice computes at most this many points, so how long a study
   * runs (slices × FAULT_STUDY_PAUSE_MS) does not depend on how fast the machine solves.
   */
  FAULT_STUDY_SLICE_POINTS: z.coerce.number().int().min(1).max(100_000).optional(),
  /**
   * Tests only: a join waits this long between its first access check and entering the room,
   * so a removal can be committed inside that window on purpose [A5].
   */
  FAULT_JOIN_PAUSE_MS: z.coerce.number().int().min(1).max(60_000).optional(),
});

export type Env = z.infer<typeof envSchema>;

const checkedEnvSchema = envSchema.superRefine((env, ctx) => {
  if (env.NODE_ENV !== 'test' && env.FAULT_DIE_AFTER_COMMIT !== undefined) {
    ctx.addIssue({ code: 'custom', path: ['FAULT_DIE_AFTER_COMMIT'], message: 'is for tests only (NODE_ENV=test)' });
  }
  if (env.NODE_ENV !== 'test' && env.FAULT_STUDY_PAUSE_MS !== undefined) {
    ctx.addIssue({ code: 'custom', path: ['FAULT_STUDY_PAUSE_MS'], message: 'is for tests only (NODE_ENV=test)' });
  }
  if (env.NODE_ENV !== 'test' && env.FAULT_STUDY_SLICE_POINTS !== undefined) {
    ctx.addIssue({ code: 'custom', path: ['FAULT_STUDY_SLICE_POINTS'], message: 'is for tests only (NODE_ENV=test)' });
  }
  if (env.NODE_ENV !== 'test' && env.FAULT_JOIN_PAUSE_MS !== undefined) {
    ctx.addIssue({ code: 'custom', path: ['FAULT_JOIN_PAUSE_MS'], message: 'is for tests only (NODE_ENV=test)' });
  }
  if (env.NODE_ENV === 'production' && env.MAILBOX_OPERATOR.length > 0) {
    ctx.addIssue({ code: 'custom', path: ['MAILBOX_OPERATOR'], message: 'is for development only; production has no mailbox to read' });
  }
});

export class EnvError extends Error {}

/** Parses `source` (normally process.env); throws EnvError whose message is one line. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = checkedEnvSchema.safeParse(source);
  if (result.success) return result.data;
  const first = firstItem(result.error.issues);
  const name = String(first.path[0] ?? 'environment');
  const raw = source[name];
  const got = raw === undefined ? 'not set' : `got ${JSON.stringify(raw.length > 40 ? raw.slice(0, 40) + '…' : raw)}`;
  const shown = name === 'SESSION_SECRET' || name === 'DATABASE_URL' ? (raw === undefined ? 'not set' : 'value hidden') : got;
  throw new EnvError(`Refusing to start: ${name} ${first.message} (${shown}).`);
}
