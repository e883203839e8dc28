import { z } from 'zod';

/** Team roles, most powerful first. */
export const ROLES = ['owner', 'editor', 'reviewer', 'viewer'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

const RANK: Record<Role, number> = { owner: 3, editor: 2, reviewer: 1, viewer: 0 };

/** True when `role` grants at least what `needed` grants. */
export function roleAtLeast(role: Role | null | undefined, needed: Role): boolean {
  return role != null && RANK[role] >= RANK[needed];
}

/** What each role may do, in words the 403 page shows. */
export const ROLE_PURPOSE: Record<Role, string> = {
  owner: 'manage members, delete sketches and reset reviews',
  editor: 'create and edit sketches',
  reviewer: 'read sketches, place review pins, approve or request changes',
  viewer: 'read sketches',
};
