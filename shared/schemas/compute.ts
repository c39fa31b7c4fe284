import { z } from 'zod';
import { METHODS } from '../stats/types.js';
import { EFFECT_FIELDS, EFFECT_MEASURES, type EffectMeasure } from '../stats/effect-fields.js';

/** Largest number of effects the HTTP compute route and the CLI accept in one request. */
export const MAX_EFFECTS = 200_000;

/** The JSON shape of a pool request (route and CLI); the library re-checks every value and names the position. */
export const poolInputSchema = z.object({
  effects: z.array(z.number()).min(1).max(MAX_EFFECTS),
  variances: z.array(z.number()).min(1).max(MAX_EFFECTS),
  method: z.enum(METHODS).default('DL'),
  hksj: z.boolean().default(false),
  level: z.number().gt(0).lt(1).default(0.95),
});

/** Leave-one-out and cumulative take the pool request as it is. */
export const sensitivityInputSchema = poolInputSchema;

export const trimFillInputSchema = poolInputSchema.extend({
  side: z.enum(['left', 'right']).optional(),
});

const direction = z.union([z.literal(1), z.literal(-1)]);

function measureSchema<M extends EffectMeasure>(measure: M) {
  const shape: Record<string, z.ZodType> = { measure: z.literal(measure) };
  for (const field of EFFECT_FIELDS[measure]) shape[field] = field === 'direction' ? direction.optional() : z.number().finite().optional();
  return z.object(shape);
}

/**
 * An effect request (route and CLI): a measure and, for each field it reads (shared/stats/effect-fields.ts), a finite
 * number. Which combination of fields is complete, and each value's own range, the library checks and names.
 */
export const effectInputSchema = z.discriminatedUnion(
  'measure',
  EFFECT_MEASURES.map((m) => measureSchema(m)) as unknown as [ReturnType<typeof measureSchema>, ...ReturnType<typeof measureSchema>[]],
);
