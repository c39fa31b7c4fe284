import { z } from 'zod';
import { roleSchema } from '../roles.js';
import { pagingSchema } from './common.js';

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
export type Me = z.infer<typeof meSchema>['user'];

export const userListQuerySchema = pagingSchema(['login', 'name', 'created_at', 'last_seen_at'] as const, 'login').extend({
  q: z.string().trim().max(100).optional(),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

export const roleChangeParamsSchema = z.object({
  id: z.coerce.number().int().positive(),
  role: roleSchema,
});

export const tokenCreateSchema = z.object({
  name: z.string().trim().min(1, 'give the token a name').max(80),
});
