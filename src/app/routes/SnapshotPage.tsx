import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ApiRequestError } from '../../lib/api-client';
import { Button } from '../../components/ui/Button';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { useSnapshot } from '../../features/snapshots/api/get-snapshot';
import { SynthesisResults } from '../../features/synthesis/components/SynthesisResults';
import { synthesisHref } from '../../features/synthesis/codec';
import { modelLabel, valueLabel } from '../../features/synthesis/labels';
import { PlotFigure } from '../../features/plots/components/PlotFigure';
import { labelOf } from '../../../shared/vocabulary/labels';
import { FlowTable } from '../../features/synthesis/components/FlowTable';
import { CiteSnapshot } from '../../features/snapshots/components/CiteSnapshot';
import { useMe } from '../../features/auth/api/get-me';
import { FollowForm } from '../../features/following/components/FollowForm';
import { signInHref } from '../../lib/sign-in';
import { useSnapshotDiff } from '../../features/snapshots/api/get-snapshot-diff';
import { EffectChanges, ResultsThenNow } from '../../features/following/components/Comparison';

/** How today's registry differs from the snapshot, with one click to run it again on today's. */
function RegistryToday({ id, rerun }: { id: string; rerun: string }) {
  const { data: d, error, isLoading } = useSnapshotDiff(id);
  return (
    <section id="registry-today" aria-label="Today’s registry against this snapshot">
      <h2>Today’s registry against this snapshot</h2>
      {isLoading && <Loading what="Comparing with today’s registry" />}
      <ErrorNote error={error} title="Not compared" />
      {d && (
        <>
          <ResultsThenNow then={d.then} now={d.now} thenLabel="In this snapshot" />
          <div className="mt-2">
            <EffectChanges changes={d} />
          </div>
        </>
      )}
      <p className="mt-2">
        <Link to={rerun} className="inline-block rounded bg-action px-3 py-1.5 text-sm font-medium text-white no-underline">
          Re-run on today’s registry
        </Link>
      </p>
    </section>
  );
}

function filterText(filters: Record<string, unknown>): string {
  const parts = Object.entries(filters).map(([k, v]) => `${labelOf('filter', k)}: ${Array.isArray(v) ? v.map((x) => valueLabel(k, String(x))).join(' + ') : valueLabel(k, String(v))}`);
  return parts.length ? parts.join('; ') : 'all settled effects';
}

export function SnapshotPage() {
  const { id = '' } = useParams();
  const { data: s, isLoading, error } = useSnapshot(id);
  const { data: me } = useMe();
  const [copied, setCopied] = useState(false);
  if (isLoading) return <Loading what="Opening the snapshot" />;
  if (error)
    return (
      <div>
        <h1>Snapshot</h1>
        <ErrorNote error={error instanceof ApiRequestError && error.status === 404 ? `There is no snapshot ${id}. Check the address, or browse the snapshot list.` : error} />
        <Link to="/snapshots">All snapshots</Link>
      </div>
    );
  if (!s) return null;
  const q = s.request;
  const api = `/api/snapshots/${s.id}`;
  const copy = async () => {
    await navigator.clipboard?.writeText(s.methods).catch(() => undefined);
    setCopied(true);
  };
  return (
    <article>
      <p className="text-xs uppercase tracking-wide text-ink-faint">Snapshot · frozen, never changes</p>
      <h1>{s.title}</h1>
      <dl className="grid max-w-4xl grid-cols-[minmax(0,7rem)_minmax(0,1fr)] sm:grid-cols-[12rem_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm">
        <dt className="text-ink-soft">Stable address</dt>
        <dd>
          <a href={s.url}>{s.url}</a>
        </dd>
        <dt className="text-ink-soft">Saved</dt>
        <dd>
          {new Date(s.createdAt).toISOString().replace('T', ' ').slice(0, 16)} UTC{s.createdBy ? ` by ${s.createdBy.name ?? s.createdBy.login}` : ''}
        </dd>
        <dt className="text-ink-soft">Registry version</dt>
        <dd className="tabular-nums">{s.registryVersion}</dd>
        <dt className="text-ink-soft">Filters</dt>
        <dd>{filterText(q.filters)}</dd>
        <dt className="text-ink-soft">Options</dt>
        <dd>
          {modelLabel(q)}, {Math.round(q.level * 1000) / 10}% intervals
          {q.subgroup ? `; subgroups by ${labelOf('subgroup', q.subgroup).toLowerCase()} (${labelOf('subgroupTau2', q.subgroupTau2 ?? 'separate').toLowerCase()})` : ''}
          {q.moderator ? `; meta-regression on ${labelOf('moderator', q.moderator).toLowerCase()}` : ''}
          {q.moderators ? `; meta-regression on ${q.moderators.map((m) => labelOf('moderator', m).toLowerCase()).join(', ')} at once` : ''}
        </dd>
        <dt className="text-ink-soft">Software</dt>
        <dd>{s.software}</dd>
      </dl>

      <CiteSnapshot citation={s.citation} />

      <h2>Exports</h2>
      <ul className="flex flex-wrap gap-x-5 gap-y-1 text-sm" aria-label="Exports">
        <li>
          <a href={`${api}/export.csv`} download>
            ↓ CSV, one row per study pooled
          </a>
        </li>
        <li>
          <a href={`${api}/effects.csv`} download>
            ↓ CSV, every effect as coded
          </a>
        </li>
        <li>
          <a href={`${api}/export.json`} download>
            ↓ JSON
          </a>
        </li>
        <li>
          <a href={`${api}/references.bib`} download>
            ↓ BibTeX ({s.references.length} references)
          </a>
        </li>
        <li>
          <a href={`${api}/methods.txt`} download>
            ↓ Methods paragraph
          </a>
        </li>
      </ul>
      <p className="mt-1 text-xs text-ink-faint">
        The first CSV has the effect and variance of each pooled unit (a study's effects already combined): pooling its two columns with the same estimator gives
        these numbers. The second keeps every settled effect with its study id, for your own dependence handling.
      </p>

      <RegistryToday id={s.id} rerun={synthesisHref(q)} />

      <h2>Follow</h2>
      <section aria-label="Follow this snapshot" className="flex flex-wrap items-end gap-3 rounded border border-paper-edge p-3">
        {me ? (
          <FollowForm key={s.id} target={{ snapshotId: s.id }} what="snapshot" />
        ) : (
          <p className="text-sm text-ink-soft">
            <a href={signInHref()}>Sign in</a> to follow this snapshot: you hear when today’s registry moves away from it.
          </p>
        )}
        <p className="basis-full text-xs text-ink-faint">
          Anyone can read how the registry moved from this snapshot: <a href={`${api}/feed.atom`}>Atom feed</a>.
        </p>
      </section>

      <h2>Methods</h2>
      <p className="reading max-w-4xl text-sm leading-relaxed">{s.methods}</p>
      <Button onClick={() => void copy()}>{copied ? '✓ Copied' : 'Copy the methods paragraph'}</Button>

      {s.flow ? (
        <section aria-label="Study flow">
          <h2>Study flow (PRISMA 2020)</h2>
          <FlowTable flow={s.flow} />
          <figure className="mt-3 max-w-3xl overflow-x-auto">
            <img src={`${api}/flow.svg`} alt="PRISMA 2020 flow diagram of the counts in the table above" className="max-w-full" />
          </figure>
          <p className="text-sm">
            <a href={`${api}/flow.svg`} download>
              ↓ Flow diagram (SVG)
            </a>
          </p>
        </section>
      ) : s.prisma && (
        <>
          <h2>Study flow (PRISMA 2020)</h2>
          <table className="max-w-xl">
            <caption className="sr-only">PRISMA counts</caption>
            <tbody>
              <tr><td>Records identified in the registry</td><td className="num">{s.prisma.identified}</td></tr>
              <tr><td>Duplicates removed</td><td className="num">{s.prisma.duplicatesRemoved}</td></tr>
              <tr><td>Records screened</td><td className="num">{s.prisma.screened}</td></tr>
              <tr><td>Excluded</td><td className="num">{s.prisma.excluded}</td></tr>
              {(s.prisma.excludedReasons ?? []).map((r) => (
                <tr key={r.reason}><td className="pl-6 text-ink-soft">{r.reason}</td><td className="num">{r.count}</td></tr>
              ))}
              <tr><td>Included in the registry</td><td className="num">{s.prisma.included}</td></tr>
              <tr><td><strong>In this synthesis</strong> (references / studies / effects)</td><td className="num"><strong>{s.counts.references} / {s.counts.studies} / {s.counts.effects}</strong></td></tr>
            </tbody>
          </table>
        </>
      )}

      <SynthesisResults data={s} Figure={PlotFigure} fileStem={`chronometa-snapshot-${s.id}`} />
    </article>
  );
}
