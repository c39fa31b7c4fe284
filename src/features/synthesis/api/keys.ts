import type { SynthesisRequest } from '../../../../shared/schemas/synthesis';

export const synthesisKeys = {
  all: ['syntheses'] as const,
  facets: () => [...synthesisKeys.all, 'facets'] as const,
  runs: () => [...synthesisKeys.all, 'run'] as const,
  run: (request: SynthesisRequest) => [...synthesisKeys.runs(), request] as const,
};
