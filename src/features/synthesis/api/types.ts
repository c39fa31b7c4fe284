import type { SynthesisOutput } from '../../../../shared/synthesis/types';

/** What POST /api/syntheses answers. */
export type SynthesisResponse = SynthesisOutput & { registryVersion: number };
