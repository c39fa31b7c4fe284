import { z } from 'zod';
import { idParam } from './common.js';
import { synthesisRequestSchema } from './synthesis.js';

/** Follow a synthesis request; thresholds default to common practice (half an SE, 20% weight). */
export const followCreateSchema = z
  .object({
    request: synthesisRequestSchema,
    seShare: z.number().gt(0).max(10).default(0.5),
    weightShare: z.number().gt(0).lt(1).default(0.2),
  })
  .strict();
export type FollowCreate = z.infer<typeof followCreateSchema>;

export const followIdSchema = z.object({ id: idParam });
export const unsubscribeSchema = z.object({ token: z.string().regex(/^[0-9a-f]{48}$/, 'not an unsubscribe token') }).strict();

export const followSchema = z.object({
  id: z.number(),
  request: z.unknown(),
  seShare: z.number(),
  weightShare: z.number(),
  lastVersion: z.number(),
  createdAt: z.string(),
  feedUrl: z.string(),
});
export type Follow = z.infer<typeof followSchema>;

/** One of the caller's own follows, with the followed request in words. */
export const followListItemSchema = followSchema.extend({ summary: z.string() });
export type FollowListItem = z.infer<typeof followListItemSchema>;
export const followListSchema = z.object({ items: z.array(followListItemSchema) });
export type FollowList = z.infer<typeof followListSchema>;

/** The signed-out unsubscribe link's answer: false when the token no longer names a follow. */
export const unsubscribeAnswerSchema = z.object({ unsubscribed: z.boolean() });
export type UnsubscribeAnswer = z.infer<typeof unsubscribeAnswerSchema>;
