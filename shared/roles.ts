import { z } from 'zod';

export const ROLES = ['reader', 'contributor', 'curator', 'reviewer', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Roles a held role also grants (a curator can do all a contributor can; an admin holds every role). */
const IMPLIED: Record<Role, Role[]> = {
  reader: [],
  contributor: ['reader'],
  curator: ['contributor', 'reader'],
  reviewer: ['reader'],
  admin: ['curator', 'reviewer', 'contributor', 'reader'],
};

export function effectiveRoles(held: readonly Role[]): Role[] {
  const all = new Set<Role>(['reader']);
  for (const r of held) {
    all.add(r);
    for (const i of IMPLIED[r]) all.add(i);
  }
  return ROLES.filter((r) => all.has(r));
}

/** Every role whose holder also holds `role` (itself included): who counts as a curator, and so on. */
export function rolesImplying(role: Role): Role[] {
  return ROLES.filter((r) => effectiveRoles([r]).includes(role));
}

export function hasRole(held: readonly Role[], needed: Role): boolean {
  return effectiveRoles(held).includes(needed);
}

export const ROLE_LABELS: Record<Role, string> = {
  reader: 'Reader',
  contributor: 'Contributor',
  curator: 'Curator',
  reviewer: 'Reviewer',
  admin: 'Administrator',
};
