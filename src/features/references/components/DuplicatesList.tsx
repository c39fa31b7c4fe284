import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { useDismissDuplicate } from '../api/dismiss-duplicate';
import { useDuplicates, type DuplicateCandidate, type DuplicateSide } from '../api/get-duplicates';
import { useMergeDuplicate } from '../api/merge-duplicate';
import { ScreeningStatusWord } from './StatusWord';

const ROWS: Array<[string, (s: DuplicateSide) => React.ReactNode, boolean?]> = [
  ['Title', (s) => s.title],
  ['Authors', (s) => s.authors.join('; ') || '—'],
  ['Year', (s) => s.year ?? '—', true],
  ['Journal', (s) => s.container ?? '—'],
  ['DOI', (s) => s.doi ?? '—'],
  ['Source', (s) => s.source],
  ['Screening', (s) => <ScreeningStatusWord status={s.screeningStatus} />],
  ['Fields in record', (s) => s.fields, true],
  ['Richness score', (s) => s.richness.toFixed(1), true],
];

function Pair({ c, onDone }: { c: DuplicateCandidate; onDone: (message: string) => void }) {
  const merge = useMergeDuplicate();
  const dismiss = useDismissDuplicate();
  const richer = c.a.richness >= c.b.richness ? c.a : c.b;
  const busy = merge.isPending || dismiss.isPending;
  return (
    <section aria-label={`Candidate pair ${c.id}`} className="mb-5 rounded border border-paper-edge bg-white/50 p-3">
      <p className="mb-2 text-sm text-ink-soft">
        Pair {c.id}: {c.reason}. {c.status === 'open' ? `The richer record is #${richer.id}.` : c.status === 'merged' ? `✓ Merged; #${c.keptRef} kept${c.decidedBy ? ` by @${c.decidedBy.login}` : ''}.` : `≠ Marked as different${c.decidedBy ? ` by @${c.decidedBy.login}` : ''}.`}
      </p>
      <table>
        <thead>
          <tr>
            <th scope="col" className="w-40">
              Field
            </th>
            {[c.a, c.b].map((s) => (
              <th scope="col" key={s.id}>
                <Link to={`/references/${s.id}`}>Reference #{s.id}</Link>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {ROWS.map(([label, get, num]) => (
            <tr key={label}>
              <th scope="row" className="bg-transparent font-normal text-ink-soft">
                {label}
              </th>
              <td className={num ? 'num' : undefined}>{get(c.a)}</td>
              <td className={num ? 'num' : undefined}>{get(c.b)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {c.status === 'open' && (
        <div className="mt-2 flex flex-wrap gap-2">
          {[c.a, c.b].map((keep) => {
            const other = keep.id === c.a.id ? c.b : c.a;
            return (
              <Button key={keep.id} variant={keep.id === richer.id ? 'primary' : 'plain'} disabled={busy} onClick={() => merge.mutate({ candidateId: c.id, keep: keep.id }, { onSuccess: (d) => onDone(`✓ Merged #${d.merged} into #${d.kept}; moved ${Object.values(d.moved).reduce((s, n) => s + n, 0)} linked rows.`) })}>
                Keep #{keep.id}, merge #{other.id} into it
              </Button>
            );
          })}
          <Button disabled={busy} onClick={() => dismiss.mutate(c.id, { onSuccess: () => onDone(`≠ Pair ${c.id} marked as two different papers.`) })}>
            Not the same paper
          </Button>
        </div>
      )}
      <ErrorNote error={merge.error ?? dismiss.error} />
    </section>
  );
}

export function DuplicatesList() {
  const [status, setStatus] = useState<'open' | 'merged' | 'dismissed'>('open');
  const [page, setPage] = useState(1);
  const [done, setDone] = useState<string | null>(null);
  const pageSize = 10;
  const { data, error, isLoading } = useDuplicates({ status, page, pageSize, sort: 'created_at', order: status === 'open' ? 'asc' : 'desc' });
  return (
    <div>
      <fieldset className="mb-3 flex gap-4 text-sm">
        <legend className="sr-only">Which pairs</legend>
        {(['open', 'merged', 'dismissed'] as const).map((s) => (
          <label key={s} className="flex items-center gap-1">
            <input
              type="radio"
              name="dup-status"
              checked={status === s}
              onChange={() => {
                setStatus(s);
                setPage(1);
              }}
            />
            {s === 'open' ? 'Waiting for a decision' : s === 'merged' ? 'Merged' : 'Marked as different'}
          </label>
        ))}
      </fieldset>
      {done && (
        <p role="status" className="mb-2 text-sm font-semibold">
          {done}
        </p>
      )}
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading candidate pairs" />}
      {data && data.total === 0 && (
        <EmptyState>{status === 'open' ? 'No likely duplicates are waiting. New ones appear here when an import finds the same title, year and first author.' : 'None yet.'}</EmptyState>
      )}
      {data?.items.map((c) => <Pair key={c.id} c={c} onDone={setDone} />)}
      {data && data.total > pageSize && <Pager page={page} pageSize={pageSize} total={data.total} onPage={setPage} />}
    </div>
  );
}
