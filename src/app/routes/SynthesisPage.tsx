import { useEffect, useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigation, useSearchParams } from 'react-router-dom';
import type { SynthesisRequest } from '../../../shared/schemas/synthesis';
import type { PoolingChoice } from '../../../shared/synthesis/metric-choice';
import { ApiRequestError } from '../../lib/api-client';
import { formResolver } from '../../lib/forms/resolver';
import { showServerErrors } from '../../lib/forms/server-errors';
import { signInHref } from '../../lib/sign-in';
import { Button } from '../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useHasRole, useMe } from '../../features/auth/api/get-me';
import { useFacets } from '../../features/synthesis/api/get-facets';
import { useSynthesis } from '../../features/synthesis/api/run-synthesis';
import { synthesisExportHref } from '../../features/synthesis/api/export-synthesis';
import { DEFAULT_REQUEST, decodeRequest, encodeRequest, requestToFormValues, synthesisFormSchema, type SynthesisFormValues } from '../../features/synthesis/codec';
import { SynthesisFormPanel } from '../../features/synthesis/components/SynthesisFormPanel';
import { SynthesisResults } from '../../features/synthesis/components/SynthesisResults';
import { SaveSnapshotForm } from '../../features/snapshots/components/SaveSnapshotForm';
import { FollowForm } from '../../features/following/components/FollowForm';
import { PlotFigure } from '../../features/plots/components/PlotFigure';

const FORM_FIELDS = [
  'filters.manipulation',
  'filters.outcome',
  'filters.parameter',
  'filters.unit',
  'filters.metric',
  'filters.population',
  'filters.modality',
  'filters.task',
  'filters.design',
  'filters.yearFrom',
  'filters.yearTo',
  'method',
  'hksj',
  'level',
  'dependence.mode',
  'dependence.r',
  'dependence.rule',
  'dependence.robust',
  'dependence.weighted',
  'subgroup',
  'moderator',
  'moderators',
  'subgroupTau2',
  'smdFamily',
] as const;

export function SynthesisPage() {
  const [params, setParams] = useSearchParams();
  // The address is the submitted request: a link from the atlas or a colleague reruns the same synthesis.
  const submitted = useMemo(() => decodeRequest(params), [params]);
  const form = useForm<SynthesisFormValues, unknown, SynthesisRequest>({
    resolver: formResolver(synthesisFormSchema),
    defaultValues: requestToFormValues(submitted ?? DEFAULT_REQUEST),
  });
  const { reset, setError } = form;
  // Back, forward or a new link: the form shows what the address asks for.
  useEffect(() => reset(requestToFormValues(submitted ?? DEFAULT_REQUEST)), [submitted, reset]);
  const facets = useFacets();
  const { data: me } = useMe();
  const isReviewer = useHasRole('reviewer');
  const synthesis = useSynthesis(submitted);
  const navigation = useNavigation();
  const pooling = synthesis.isFetching || (navigation.state === 'loading' && navigation.location.pathname === '/synthesis');
  const refusedInput = synthesis.error instanceof ApiRequestError && synthesis.error.status === 400;
  useEffect(() => {
    if (synthesis.error) showServerErrors(synthesis.error, setError, FORM_FIELDS);
  }, [synthesis.error, setError]);

  const run = (request: SynthesisRequest) => setParams(encodeRequest(request));
  const refusal = synthesis.error instanceof ApiRequestError && synthesis.error.status === 422 ? (synthesis.error.details as { choices?: PoolingChoice[]; inWords?: string } | undefined) : undefined;
  const choices = refusal?.choices;
  const data = synthesis.error ? undefined : synthesis.data;

  return (
    <div>
      <h1>Synthesis</h1>
      <p className="reading mb-3 max-w-3xl text-sm text-ink-soft">
        Pool settled effects from the registry with a random-effects (or fixed-effect) model. Anyone may run a synthesis; reviewers can freeze one as a
        citable snapshot. Start from the <Link to="/atlas">atlas</Link> to see what has been coded.
      </p>
      <SynthesisFormPanel form={form} onRun={run} facets={facets.data} running={pooling} />
      {facets.error && <ErrorNote error={facets.error} title="Filter values could not be loaded" />}

      {pooling && <Loading what="Pooling the settled effects" />}
      {synthesis.error && !refusedInput && (
        <div className="mt-3">
          <ErrorNote error={choices && refusal?.inWords ? refusal.inWords : synthesis.error} title={choices ? 'Not pooled' : 'Refused'} />
          {choices && choices.length > 0 && (
            <div className="flex flex-wrap items-center gap-2 text-sm" role="group" aria-label="Pool one quantity instead">
              <span>Pool one quantity instead:</span>
              {choices.map((c) => (
                <Button key={c.label} onClick={() => run(c.request)}>
                  {c.label}
                </Button>
              ))}
            </div>
          )}
        </div>
      )}
      {!submitted && !pooling && (
        <EmptyState>Choose a manipulation (and a metric if it was coded in several), then press “Run synthesis”. Leave a field on “Any” to include everything.</EmptyState>
      )}

      {data && submitted && (
        <>
          <section aria-label="Save as snapshot" className="mt-4 flex flex-wrap items-end gap-3 rounded border border-paper-edge p-3">
            {isReviewer ? (
              <SaveSnapshotForm key={encodeRequest(submitted).toString()} request={submitted} />
            ) : (
              <p className="text-sm text-ink-soft">
                {me ? 'Saving a snapshot needs the Reviewer role.' : <><a href={signInHref()}>Sign in</a> as a reviewer to freeze this synthesis as a citable snapshot.</>}
              </p>
            )}
            <p className="ml-auto text-xs text-ink-faint">Computed on registry version {synthesis.data?.registryVersion}</p>
          </section>
          <section aria-label="Follow this synthesis" className="mt-3 flex flex-wrap items-end gap-3 rounded border border-paper-edge p-3">
            {me ? (
              <FollowForm key={encodeRequest(submitted).toString()} target={{ request: submitted }} what="synthesis" />
            ) : (
              <p className="text-sm text-ink-soft">
                <a href={signInHref()}>Sign in</a> to follow this synthesis: it is run again whenever the registry grows, and you hear when it moves.
              </p>
            )}
          </section>
          <section aria-label="Export this synthesis" className="mt-3 text-sm">
            <h2 className="text-base">Export without saving</h2>
            <ul className="flex flex-wrap gap-x-5 gap-y-1">
              <li>
                <a href={synthesisExportHref(submitted, 'studies.csv')} download>
                  ↓ CSV, one row per {submitted.dependence.mode === 'multilevel' ? 'effect pooled (with its paper)' : 'study pooled'}
                </a>
              </li>
              <li>
                <a href={synthesisExportHref(submitted, 'effects.csv')} download>
                  ↓ CSV, every effect as coded
                </a>
              </li>
              <li>
                <a href={synthesisExportHref(submitted, 'synthesis.json')} download>
                  ↓ JSON
                </a>
              </li>
              <li>
                <a href={synthesisExportHref(submitted, 'flow.svg')} download>
                  ↓ PRISMA 2020 flow diagram (SVG)
                </a>
              </li>
            </ul>
            <p className="mt-1 text-xs text-ink-faint">
              Computed on today’s registry (the file names carry its version); figures download as SVG or PNG beside each plot. Save a snapshot for a
              version that never changes.
            </p>
          </section>
          <SynthesisResults
            data={data}
            Figure={PlotFigure}
            fileStem={`chronometa-synthesis-v${data.registryVersion}`}
            onUseMultilevel={() => run({ ...submitted, dependence: { mode: 'multilevel', robust: true } })}
          />
        </>
      )}
    </div>
  );
}
