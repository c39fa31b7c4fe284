import type { SYNTHESIS_EXPORT_FILES, SynthesisRequest } from '../../../../shared/schemas/synthesis';

/** A live synthesis as a download: a link the browser follows (nothing is saved). */
export const synthesisExportHref = (request: SynthesisRequest, file: (typeof SYNTHESIS_EXPORT_FILES)[number]) =>
  `/api/syntheses/export/${file}?request=${encodeURIComponent(JSON.stringify(request))}`;
