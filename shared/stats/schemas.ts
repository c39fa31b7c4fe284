import { z } from 'zod';
import { METHODS } from './types.js';

/** Largest number of effects the HTTP compute route accepts in one request. */
export const MAX_EFFECTS = 200_000;

/** The JSON shape of a pool request (route and CLI); the library re-checks every value and names the position. */
export const poolInputSchema = z.object({
  effects: z.array(z.number()).min(1).max(MAX_EFFECTS),
  variances: z.array(z.number()).min(1).max(MAX_EFFECTS),
  method: z.enum(METHODS).default('DL'),
  hksj: z.boolean().default(false),
  level: z.number().gt(0).lt(1).default(0.95),
});

export const trimFillInputSchema = poolInputSchema.extend({
  side: z.enum(['left', 'right']).optional(),
});
