import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { ApiRequestError } from '../../lib/api-client';
import { signInHref } from '../../lib/sign-in';
import { Button } from '../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useHasRole, useMe } from '../../features/auth/api/get-me';
import { useFacets } from '../../features/synthesis/api/get-facets';
import { useSynthesis } from '../../features/synthesis/api/run-synthesis';
import { SynthesisFormPanel } from '../../features/synthesis/components/SynthesisFormPanel';
import { SynthesisResults } from '../../features/synthesis/components/SynthesisResults';
import { formFromParams, paramsFromForm, requestFromForm, type SynthesisForm } from '../../features/synthesis/url-state';
import { valueLabel } from '../../features/synthesis/labels';
import { useCreateSnapshot } from '../../features/snapshots/api/create-snapshot';
import { PlotFigure } from '../../features/plots/components/PlotFigure';

/** Server field paths ("filters.yearTo", "dependence.r") to the form's field names. */
function serverFieldErrors(err: unknown): Record<string, string> {
  if (!(err instanceof ApiRequestError) || err.status !== 400) return {};
  const out: Record<string, string> = {};
  for (const [path, message] of Object.entries(err.fieldErrors())) {
    const parts = path.split('.');
    const key = parts[0] === 'filters' ? parts[1] : parts[0] === 'dependence' ? (parts[1] === 'r' ? 'r' : 'rule') : parts[0];
    out[key] ??= message;
  }
  return out;
}

export function SynthesisPage() {
  const [params, setParams] = useSearchParams();
  const [form, setForm] = useState<SynthesisForm>(() => formFromParams(params));
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const [title, setTitle] = useState('');
  const facets = useFacets();
  const { data: me } = useMe();
  const isReviewer = useHasRole('reviewer');
  // The URL is the submitted request: a link from the atlas or a colleague reruns the same synthesis.
  const submitted = useMemo(() => (params.size ? requestFromForm(formFromParams(params)).request : null), [params]);
  const synthesis = useSynthesis(submitted);
  const save = useCreateSnapshot();

  const run = (next: SynthesisForm) => {
    const { request, errors } = requestFromForm(next);
    setClientErrors(errors);
    if (!request) return;
    save.reset();
    setParams(paramsFromForm(next));
  };
  const errors = { ...serverFieldErrors(synthesis.error), ...clientErrors };
  const mixed = synthesis.error instanceof ApiRequestError && synthesis.error.status === 422 ? (synthesis.error.details as { metrics?: Array<{ metric: string; count: number }> } | undefined)?.metrics : undefined;
  const data = synthesis.error ? undefined : synthesis.data;

  return (
    <div>
      <h1>Synthesis</h1>
      <p className="reading mb-3 max-w-3xl text-sm text-ink-soft">
        Pool settled effects from the registry with a random-effects (or fixed-effect) model. Anyone may run a synthesis; reviewers can freeze one as a
        citable snapshot. Start from the <Link to="/atlas">atlas</Link> to see what has been coded.
      </p>
      <SynthesisFormPanel form={form} onChange={setForm} onSubmit={() => run(form)} facets={facets.data} errors={errors} running={synthesis.isFetching} />
      {facets.error && <ErrorNote error={facets.error} title="Filter values could not be loaded" />}

      {synthesis.isFetching && <Loading what="Pooling the settled effects" />}
      {synthesis.error && !(synthesis.error instanceof ApiRequestError && synthesis.error.status === 400) && (
        <div className="mt-3">
          <ErrorNote error={synthesis.error} title={mixed ? 'Not pooled' : 'Refused'} />
          {mixed && (
            <div className="flex flex-wrap items-center gap-2 text-sm">
              <span>Pool only one metric:</span>
              {mixed.map((m) => (
                <Button key={m.metric} onClick={() => { const next = { ...form, metric: m.metric }; setForm(next); run(next); }}>
                  {valueLabel('metric', m.metric)} ({m.count})
                </Button>
              ))}
            </div>
          )}
        </div>
      )}
      {!submitted && !synthesis.isFetching && (
        <EmptyState>Choose a manipulation (and a metric if it was coded in several), then press “Run synthesis”. Leave a field on “Any” to include everything.</EmptyState>
      )}

      {data && submitted && (
        <>
          <section aria-label="Save as snapshot" className="mt-4 flex flex-wrap items-end gap-3 rounded border border-paper-edge p-3">
            {isReviewer ? (
              <>
                <div className="flex flex-col text-sm">
                  <label htmlFor="snap-title" className="font-semibold">
                    Snapshot title (optional)
                  </label>
                  <input id="snap-title" value={title} maxLength={200} onChange={(e) => setTitle(e.target.value)} className="w-96 rounded border border-paper-edge bg-white/70 px-2 py-1" placeholder="Named from the filters when left empty" />
                </div>
                <Button variant="primary" disabled={save.isPending} onClick={() => save.mutate({ ...submitted, ...(title.trim() ? { title: title.trim() } : {}) })}>
                  {save.isPending ? 'Saving…' : 'Save snapshot'}
                </Button>
                {save.data && (
                  <p role="status" className="text-sm">
                    ✓ Saved, frozen at registry version {save.data.registryVersion}: <Link to={`/snapshots/${save.data.id}`}>{save.data.url}</Link>
                  </p>
                )}
                <ErrorNote error={save.error} title="Not saved" />
              </>
            ) : (
              <p className="text-sm text-ink-soft">
                {me ? 'Saving a snapshot needs the Reviewer role.' : <><a href={signInHref()}>Sign in</a> as a reviewer to freeze this synthesis as a citable snapshot.</>}
              </p>
            )}
            <p className="ml-auto text-xs text-ink-faint">Computed on registry version {synthesis.data?.registryVersion}</p>
          </section>
          <SynthesisResults data={data} Figure={PlotFigure} fileStem="chronometa-synthesis" />
        </>
      )}
    </div>
  );
}
