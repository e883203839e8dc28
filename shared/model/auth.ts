import { z } from 'zod';
import { textSchema } from './text.ts';
import { roleSchema } from './roles.ts';

export const emailSchema = textSchema({ error: 'is required' })
  .trim()
  .min(1, 'is required')
  .max(254, 'is too long')
  .email('must be an e-mail address')
  .transform((v) => v.toLowerCase());

export const newPasswordSchema = textSchema({ error: 'is required' })
  .min(10, 'must be at least 10 characters')
  .max(200, 'must be at most 200 characters');

export const signInSchema = z.object({
  email: emailSchema,
  password: textSchema({ error: 'is required' }).min(1, 'is required').max(200, 'is too long'),
});
export type SignIn = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: textSchema({ error: 'is required' }).trim().min(1, 'is required').max(100, 'must be at most 100 characters'),
  email: emailSchema,
  password: newPasswordSchema,
  teamName: textSchema({ error: 'is required' }).trim().min(1, 'is required').max(100, 'must be at most 100 characters'),
});
export type SignUp = z.infer<typeof signUpSchema>;

/** What GET /api/auth/me answers. */
export const meSchema = z.object({
  user: z.object({ id: z.string(), email: z.string(), name: z.string() }),
  teams: z.array(z.object({ teamId: z.string(), teamName: z.string(), role: roleSchema })),
  /** Whether the development mailbox exists on this server (not in production). */
  devMailbox: z.boolean().default(false),
  /** Whether this person may read every message of the development mailbox (else only their own). */
  mailboxOperator: z.boolean().default(false),
});
export type Me = z.infer<typeof meSchema>;
