/** What POST /api/syntheses answers (defined once in shared/schemas/synthesis.ts). */
export type { SynthesisAnswer as SynthesisResponse } from '../../../../shared/schemas/synthesis';
