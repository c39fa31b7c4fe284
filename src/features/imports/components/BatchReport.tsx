import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { EntryStatus } from '../../../../shared/schemas/references';
import { Caution, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { useImportEntries } from '../api/get-import-entries';
import { batchAtWork, useImport } from '../api/get-import';
import { useRefreshWhenFinished } from '../api/refresh-when-finished';

const LOOK: Record<EntryStatus, { symbol: string; word: string; className: string }> = {
  imported: { symbol: '✓', word: 'Imported', className: '' },
  duplicate: { symbol: '≡', word: 'Duplicate', className: 'text-ink-soft' },
  rejected: { symbol: '✕', word: 'Rejected', className: 'text-refusal' },
  pending: { symbol: '…', word: 'Waiting', className: 'text-ink-faint' },
};

function EntryStatusWord({ status }: { status: EntryStatus }) {
  const l = LOOK[status];
  return (
    <span className={`whitespace-nowrap ${l.className}`}>
      <span aria-hidden="true">{l.symbol}</span> {l.word}
    </span>
  );
}

export function BatchReport({ id }: { id: number }) {
  const { data, error, isLoading } = useImport(id);
  const [page, setPage] = useState(1);
  const [status, setStatus] = useState<EntryStatus | ''>('');
  const processed = data?.batch.processed ?? 0;
  const unreachable = data?.resolverUnreachable ?? 0;
  const entries = useImportEntries(id, { page, status, processed, unreachable });
  useRefreshWhenFinished(data?.batch.state);
  if (isLoading) return <Loading what="Loading the import report" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const { batch } = data;
  const pct = batch.total ? Math.round((100 * batch.processed) / batch.total) : 100;
  return (
    <div>
      <p className="mb-2 text-sm text-ink-soft">
        Batch {batch.id} · {batch.format === 'doi' ? 'DOI list' : batch.format === 'ris' ? 'RIS' : 'BibTeX'}
        {batch.label ? ` · ${batch.label}` : ''} · {batch.createdAt.slice(0, 16).replace('T', ' ')} UTC{batch.createdBy ? ` · by @${batch.createdBy.login}` : ''}
      </p>
      {batchAtWork(batch.state) ? (
        <div className="mb-3 max-w-xl">
          <p role="status" className="text-sm">
            {batch.state === 'queued'
              ? `… Queued: ${batch.total} entries wait for the import to start. You may leave this page.`
              : batch.format === 'doi'
                ? `… Looking up DOIs: ${batch.processed} of ${batch.total} done (${pct}%).`
                : `… Importing: ${batch.processed} of ${batch.total} entries read (${pct}%). You may leave this page.`}
          </p>
          <progress className="h-3 w-full" max={batch.total} value={batch.processed} aria-label="Import progress" />
          {unreachable > 0 && (
            <Caution title="DOI resolver unreachable">
              {unreachable === 1 ? '1 DOI waits' : `${unreachable} DOIs wait`}: the resolver could not be reached, so the look-up will retry by
              itself, more slowly each time, for about an hour. You may leave this page; the report fills in once the resolver answers.
            </Caution>
          )}
        </div>
      ) : batch.state === 'failed' ? (
        <p role="status" className="mb-3 max-w-3xl text-sm font-semibold text-refusal">
          ✕ Stopped: {batch.failure ?? 'the import failed'}.
        </p>
      ) : (
        <p role="status" className="mb-3 text-sm font-semibold">
          ✓ Finished: {batch.total} entries read.
        </p>
      )}
      <table className="mb-3 w-auto">
        <tbody>
          {(['imported', 'duplicate', 'rejected', 'pending'] as const)
            .filter((s) => s !== 'pending' || batch.counts.pending > 0)
            .map((s) => (
              <tr key={s}>
                <th scope="row" className="bg-transparent font-normal">
                  <EntryStatusWord status={s} />
                </th>
                <td className="num w-20" data-count={s}>
                  {batch.counts[s]}
                </td>
              </tr>
            ))}
        </tbody>
      </table>
      {batch.counts.imported > 0 && (batch.state === 'done' || batch.state === 'failed') && (
        <p className="mb-3 text-sm">
          Next: <Link to={`/screening?batch=${batch.id}`}>screen the {batch.counts.imported} new references</Link> or{' '}
          <Link to={`/references?batch=${batch.id}`}>see them in the references table</Link>.
        </p>
      )}
      <label className="mb-2 block text-sm">
        Show{' '}
        <select
          className="rounded border border-paper-edge bg-white px-2 py-1"
          value={status}
          onChange={(e) => {
            setStatus(e.target.value as EntryStatus | '');
            setPage(1);
          }}
        >
          <option value="">every entry</option>
          <option value="imported">imported</option>
          <option value="duplicate">duplicates</option>
          <option value="rejected">rejected</option>
          {batch.format === 'doi' && batch.state === 'running' && <option value="pending">waiting</option>}
        </select>
      </label>
      <ErrorNote error={entries.error} />
      {entries.data && (
        <>
          <table>
            <thead>
              <tr>
                <th className="num">Entry</th>
                <th>Key or DOI</th>
                <th>Outcome</th>
                <th>What happened</th>
                <th>Reference</th>
              </tr>
            </thead>
            <tbody>
              {entries.data.entries.map((e) => (
                <tr key={e.index}>
                  <td className="num">{e.index}</td>
                  <td className="font-mono text-xs">{e.key ?? '—'}</td>
                  <td>
                    <EntryStatusWord status={e.status} />
                  </td>
                  <td>{e.message ?? (e.status === 'imported' ? 'new reference' : '')}</td>
                  <td>{e.referenceId ? <Link to={`/references/${e.referenceId}`}>#{e.referenceId}</Link> : '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={page} pageSize={100} total={entries.data.entriesTotal} onPage={setPage} />
        </>
      )}
    </div>
  );
}
