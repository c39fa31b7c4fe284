import { z } from 'zod';
import { roleSchema } from '../roles.js';
import { idParam, pageSchema, pagingSchema, timestamp } from './common.js';

export const meSchema = z.object({
  user: z.object({
    id: z.number(),
    login: z.string(),
    name: z.string().nullable(),
    email: z.string().nullable(),
    roles: z.array(roleSchema),
    effectiveRoles: z.array(roleSchema),
  }),
});
export type MeAnswer = z.infer<typeof meSchema>;
export type Me = MeAnswer['user'];

export const userListQuerySchema = pagingSchema(['login', 'name', 'created_at', 'last_seen_at'] as const, 'login').extend({
  q: z.string().trim().max(100).optional(),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

export const roleChangeParamsSchema = z.object({
  id: idParam,
  role: roleSchema,
});

export const tokenCreateSchema = z.object({
  name: z.string().trim().min(1, 'give the token a name').max(80),
});

// ---- answers

export const adminUserSchema = z.object({
  id: z.number().int(),
  login: z.string(),
  name: z.string().nullable(),
  email: z.string().nullable(),
  createdAt: timestamp,
  lastSeenAt: timestamp.nullable(),
  roles: z.array(roleSchema),
});
export type AdminUser = z.infer<typeof adminUserSchema>;
export const adminUserPageSchema = pageSchema(adminUserSchema);
export type AdminUserPage = z.infer<typeof adminUserPageSchema>;

/** PUT or DELETE /api/admin/users/:id/roles/:role */
export const roleChangeResultSchema = z.object({ user: z.object({ id: z.number().int(), login: z.string(), roles: z.array(roleSchema) }) });
export type RoleChangeResult = z.infer<typeof roleChangeResultSchema>;

export const apiTokenSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  prefix: z.string(),
  createdAt: timestamp,
  lastUsedAt: timestamp.nullable(),
  revokedAt: timestamp.nullable(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;
export const apiTokenListSchema = z.object({ items: z.array(apiTokenSchema) });
export type ApiTokenList = z.infer<typeof apiTokenListSchema>;
/** The one answer that shows the token itself. */
export const createdTokenSchema = apiTokenSchema.pick({ id: true, name: true, prefix: true, createdAt: true }).extend({ token: z.string() });
export type CreatedToken = z.infer<typeof createdTokenSchema>;
