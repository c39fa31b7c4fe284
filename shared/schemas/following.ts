import { z } from 'zod';
import { idParam } from './common.js';
import { snapshotIdSchema, synthesisRequestSchema } from './synthesis.js';
import type { PlotFigure } from '../synthesis/types.js';

/** Thresholds a follower may set; the defaults are common practice (half an SE, 20% weight). */
export const followThresholdsSchema = z.object({
  seShare: z.number().gt(0, 'must be more than 0').max(10, 'at most 10 SEs').default(0.5),
  weightShare: z.number().gt(0, 'must be more than 0').lt(1, 'must be below 1 (a share of the weight)').default(0.2),
});

/** Follow a synthesis request, or a snapshot (its request, starting from the snapshot's own result). */
export const followCreateSchema = z
  .object({
    request: synthesisRequestSchema.optional(),
    snapshotId: snapshotIdSchema.shape.id.optional(),
    ...followThresholdsSchema.shape,
  })
  .strict()
  .superRefine((v, ctx) => {
    if ((v.request === undefined) === (v.snapshotId === undefined))
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: [v.request === undefined ? 'request' : 'snapshotId'], message: 'follow either a synthesis or a snapshot, one of the two' });
  });
export type FollowCreate = z.infer<typeof followCreateSchema>;

export const followIdSchema = z.object({ id: idParam });
export const unsubscribeSchema = z.object({ token: z.string().regex(/^[0-9a-f]{48}$/, 'not an unsubscribe token') }).strict();

export const followSchema = z.object({
  id: z.number(),
  request: z.unknown(),
  /** the followed snapshot, when a snapshot was followed */
  snapshotId: z.string().nullable(),
  seShare: z.number(),
  weightShare: z.number(),
  lastVersion: z.number(),
  createdAt: z.string(),
  feedUrl: z.string(),
  /** the "what changed since" page */
  changesUrl: z.string(),
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

const effectBriefSchema = z.object({
  id: z.number().int(),
  referenceId: z.number().int(),
  studyId: z.number().int(),
  referenceLabel: z.string(),
  studyLabel: z.string(),
  effect: z.number(),
  variance: z.number(),
});

/** One side of a comparison: a result and its forest plot (null when no settled effect matched). */
export const comparedResultSchema = z
  .object({
    /** the version the result was computed on (null: a follow from before versions were kept with it) */
    registryVersion: z.number().int().nullable(),
    k: z.number().int(),
    estimate: z.number(),
    ciLower: z.number(),
    ciUpper: z.number(),
    tau2: z.number().nullable(),
    forest: z.custom<PlotFigure>().nullable(),
  })
  .nullable();
export type ComparedResult = z.infer<typeof comparedResultSchema>;

const comparisonShape = {
  then: comparedResultSchema,
  now: comparedResultSchema,
  /** the registry version the comparison was read at */
  registryVersion: z.number().int(),
  added: z.array(effectBriefSchema),
  withdrawn: z.array(effectBriefSchema),
  corrected: z.array(z.object({ before: effectBriefSchema, after: effectBriefSchema })),
  /** false when the earlier side's effects were not kept (a follow from before they were), so no list is given */
  effectsRecorded: z.boolean(),
};

/** GET /api/snapshots/:id/diff: how today's registry differs from a snapshot. */
export const snapshotDiffSchema = z.object({ snapshotId: z.string(), request: z.unknown(), ...comparisonShape });
export type SnapshotDiff = z.infer<typeof snapshotDiffSchema>;

export const followChangesQuerySchema = z.object({ since: idParam.optional() }).strict();

/** GET /api/follows/:id/changes: what changed since the follower was last told (or since a chosen feed entry). */
export const followChangesSchema = z.object({
  follow: followListItemSchema,
  /** the feed entry the comparison starts before; null: since the follow began */
  since: z.object({ eventId: z.number().int().nullable(), at: z.string() }),
  /** every feed entry, newest first, to choose another starting point */
  events: z.array(z.object({ id: z.number().int(), at: z.string(), registryVersion: z.number().int(), text: z.string() })),
  ...comparisonShape,
});
export type FollowChanges = z.infer<typeof followChangesSchema>;
