import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { FIRST_REFERENCES_PAGE as FIRST_ATLAS_REFERENCES, atlasReferencesQueryOptions } from '../features/atlas/api/get-atlas-references';
import { atlasManipulationQueryOptions } from '../features/atlas/api/get-atlas-manipulation';
import { atlasOutcomeQueryOptions } from '../features/atlas/api/get-atlas-outcome';
import { atlasQueryOptions } from '../features/atlas/api/get-atlas';
import { meQueryOptions } from '../features/auth/api/get-me';
import { extractionQueryOptions } from '../features/extraction/api/get-extraction';
import { CURRENT_VOCABULARY, WHOLE_VOCABULARY, manipulationsQueryOptions } from '../features/manipulations/api/get-manipulations';
import { pairQueryOptions } from '../features/reconciliation/api/get-pair';
import { referenceQueryOptions } from '../features/references/api/get-reference';
import { firstReferencesQuery, referencesQueryOptions } from '../features/references/api/get-references';
import { countsQueryOptions } from '../features/screening/api/get-counts';
import { QUEUE_LIMIT, queueQueryOptions, stageFromParam } from '../features/screening/api/get-queue';
import { snapshotQueryOptions } from '../features/snapshots/api/get-snapshot';
import { facetsQueryOptions } from '../features/synthesis/api/get-facets';
import { synthesisQueryOptions } from '../features/synthesis/api/run-synthesis';
import { decodeRequest } from '../features/synthesis/codec';

/**
 * Route loaders put a screen's first data in the cache before it renders (each screen then reads it through its
 * own query hooks). A refusal is not thrown: the cached error is what the screen shows, in its own words.
 */
const settled = (...work: Array<Promise<unknown> | null | undefined | false>) => Promise.allSettled(work.filter(Boolean)).then(() => null);

const positiveId = (raw: string | undefined) => {
  const n = Number(raw);
  return Number.isInteger(n) && n > 0 ? n : null;
};

export function screenLoaders(qc: QueryClient) {
  const me = () => qc.ensureQueryData(meQueryOptions());
  return {
    references: ({ request }: LoaderFunctionArgs) => {
      const batch = Number(new URL(request.url).searchParams.get('batch')) || undefined;
      return settled(me(), qc.ensureQueryData(referencesQueryOptions(firstReferencesQuery(batch))));
    },
    reference: ({ params }: LoaderFunctionArgs) => {
      const id = positiveId(params.id);
      return settled(me(), id !== null && qc.ensureQueryData(referenceQueryOptions(id)));
    },
    screening: ({ request }: LoaderFunctionArgs) => {
      const params = new URL(request.url).searchParams;
      const batch = Number(params.get('batch')) || undefined;
      return settled(
        me(),
        qc.ensureQueryData(queueQueryOptions({ limit: QUEUE_LIMIT, stage: stageFromParam(params.get('stage')), batch })),
        qc.ensureQueryData(countsQueryOptions()),
        qc.ensureQueryData(manipulationsQueryOptions(CURRENT_VOCABULARY)),
      );
    },
    prismaFlow: () => settled(qc.ensureQueryData(countsQueryOptions())),
    atlas: () => settled(qc.ensureQueryData(atlasQueryOptions())),
    atlasManipulation: ({ params }: LoaderFunctionArgs) => {
      const term = params.term ?? '';
      return settled(qc.ensureQueryData(atlasManipulationQueryOptions(term)), qc.ensureQueryData(atlasReferencesQueryOptions('manipulations', term, FIRST_ATLAS_REFERENCES)));
    },
    atlasOutcome: ({ params }: LoaderFunctionArgs) => {
      const kind = params.kind ?? '';
      return settled(qc.ensureQueryData(atlasOutcomeQueryOptions(kind)), qc.ensureQueryData(atlasReferencesQueryOptions('outcomes', kind, FIRST_ATLAS_REFERENCES)));
    },
    snapshot: ({ params }: LoaderFunctionArgs) => settled(qc.ensureQueryData(snapshotQueryOptions(params.id ?? ''))),
    synthesis: ({ request }: LoaderFunctionArgs) => {
      const submitted = decodeRequest(new URL(request.url).searchParams);
      return settled(me(), qc.ensureQueryData(facetsQueryOptions()), submitted && qc.ensureQueryData(synthesisQueryOptions(submitted)));
    },
    extraction: ({ params }: LoaderFunctionArgs) => {
      const id = positiveId(params.id);
      return settled(me(), id !== null && qc.ensureQueryData(extractionQueryOptions(id)), qc.ensureQueryData(manipulationsQueryOptions(WHOLE_VOCABULARY)));
    },
    reconcilePair: ({ params }: LoaderFunctionArgs) => {
      const id = positiveId(params.id);
      return settled(me(), id !== null && qc.ensureQueryData(pairQueryOptions(id)), qc.ensureQueryData(manipulationsQueryOptions(CURRENT_VOCABULARY)));
    },
  };
}
