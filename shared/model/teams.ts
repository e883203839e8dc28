import { z } from 'zod';
import { emailSchema, newPasswordSchema } from './auth.ts';
import { roleSchema } from './roles.ts';
import { textSchema } from './text.ts';

export const teamNameSchema = textSchema({ error: 'is required' }).trim().min(1, 'is required').max(100, 'must be at most 100 characters');
export const createTeamSchema = z.object({ name: teamNameSchema });

export const inviteSchema = z.object({ email: emailSchema, role: roleSchema });
export type Invite = z.infer<typeof inviteSchema>;

export const changeRoleSchema = z.object({ role: roleSchema });

export const tokenSchema = textSchema({ error: 'is required' }).min(20, 'is not a valid link token').max(100, 'is not a valid link token').regex(/^[A-Za-z0-9_-]+$/, 'is not a valid link token');

/** Accepting an invitation: signed-in people send only the token; newcomers also create an account. */
export const acceptInvitationSchema = z.object({
  token: tokenSchema,
  name: textSchema().trim().min(1, 'is required').max(100, 'must be at most 100 characters').optional(),
  password: newPasswordSchema.optional(),
});

export const resetRequestSchema = z.object({ email: emailSchema });
export const resetConfirmSchema = z.object({ token: tokenSchema, password: newPasswordSchema });

export const memberSchema = z.object({ userId: z.string(), name: z.string(), email: z.string(), role: roleSchema, since: z.string() });
export type Member = z.infer<typeof memberSchema>;

export const pendingInvitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: roleSchema,
  createdAt: z.string(),
  expiresAt: z.string(),
  invitedByName: z.string().nullable(),
});
export type PendingInvitation = z.infer<typeof pendingInvitationSchema>;

export const invitationPreviewSchema = z.object({
  teamId: z.string(),
  teamName: z.string(),
  email: z.string(),
  role: roleSchema,
  invitedByName: z.string().nullable(),
  expiresAt: z.string(),
  /** True when an account with the invited e-mail exists (sign in, then accept). */
  accountExists: z.boolean(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

/**
 * What the audit trail records (`audit_events.action`; one list for the database enum, the
 * writers and the members page's sentences). Every name ever written is here.
 */
export const AUDIT_ACTIONS = [
  'team.created',
  'member.invited',
  'invitation.revoked',
  'invitation.accepted',
  'member.role_changed',
  'member.removed',
  'member.left',
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export const auditEntrySchema = z.object({
  id: z.string(),
  action: z.enum(AUDIT_ACTIONS),
  actorName: z.string().nullable(),
  targetEmail: z.string().nullable(),
  detail: z.record(z.string(), z.unknown()),
  createdAt: z.string(),
  /** One plain sentence for the members page. */
  summary: z.string(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

/** Pagination for every list endpoint: ?limit=&offset= → { items, total, limit, offset }. */
export const pageQuerySchema = z.object({
  limit: z.coerce.number().int().min(1, 'must be at least 1').max(100, 'must be at most 100').default(20),
  offset: z.coerce.number().int().min(0, 'must be at least 0').default(0),
});
export type PageQuery = z.infer<typeof pageQuerySchema>;

export function pageOf<T extends z.ZodType>(item: T) {
  return z.object({ items: z.array(item), total: z.number().int(), limit: z.number().int(), offset: z.number().int() });
}
