import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { EXCLUSION_REASONS, EXCLUSION_REASON_KEYS, EXCLUSION_REASON_LABELS, type ExclusionReason } from '../../../../shared/vocabulary/screening';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { useDecide } from '../api/decide';
import { useQueue } from '../api/get-queue';
import { useUndoDecision } from '../api/undo';

/**
 * One reference at a time, decided from the keyboard: I includes, 1–6 exclude with that reason (6 asks for
 * a note first), S skips for now. Keys are ignored while typing in the note.
 */
export function ScreeningQueue({ batch }: { batch?: number }) {
  const [skipped, setSkipped] = useState<number[]>([]);
  const { data, error, isLoading } = useQueue({ limit: 50, batch });
  const decide = useDecide();
  const [note, setNote] = useState('');
  const [needNote, setNeedNote] = useState(false);
  const [last, setLast] = useState<{ text: string; refId: number; version: number } | null>(null);
  const undo = useUndoDecision();
  const [undone, setUndone] = useState<string | null>(null);
  const noteRef = useRef<HTMLInputElement>(null);
  const current = data?.items.find((i) => !skipped.includes(i.id));

  const record = (decision: 'included' | 'excluded', reason?: ExclusionReason) => {
    if (!current || decide.isPending) return;
    if (reason === 'other' && !note.trim()) {
      setNeedNote(true);
      noteRef.current?.focus();
      return;
    }
    const { title, id: refId, version } = current;
    decide.mutate(
      { refId: current.id, input: { decision, version: current.version, ...(reason ? { reason } : {}), ...(note.trim() ? { note: note.trim() } : {}) } },
      {
        onSuccess: () => {
          // A decision moves the reference one version on.
          setLast({ text: `${decision === 'included' ? '✓ Included' : `✕ Excluded (${EXCLUSION_REASON_LABELS[reason!]})`}: ${title}`, refId, version: version + 1 });
          setNote('');
          setNeedNote(false);
        },
      },
    );
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const target = e.target as HTMLElement;
      if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.tagName === 'SELECT')) {
        if (e.key === 'Enter' && target === noteRef.current && needNote) record('excluded', 'other');
        return;
      }
      if (e.ctrlKey || e.metaKey || e.altKey) return;
      const key = e.key.toLowerCase();
      if (key === 'i') record('included');
      else if (key === 's' && current) setSkipped((s) => [...s, current.id]);
      else if (key === 'n') {
        e.preventDefault();
        noteRef.current?.focus();
      } else {
        const reason = EXCLUSION_REASONS.find((r) => EXCLUSION_REASON_KEYS[r] === key);
        if (reason) record('excluded', reason);
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  if (isLoading) return <Loading what="Loading the queue" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const left = data.remaining;
  return (
    <div>
      <p className="mb-2 text-sm" role="status">
        {left} {left === 1 ? 'reference' : 'references'} waiting{batch ? ` from batch ${batch}` : ''}
        {skipped.length ? ` · ${skipped.length} skipped for now` : ''}.
      </p>
      {last && (
        <p className="mb-2 text-sm text-ink-soft">
          Last: {last.text}{' '}
          <Button
            onClick={() => undo.mutate({ refId: last.refId, input: { version: last.version } }, {
                  onSuccess: (r) => {
                    setLast(null);
                    setUndone(`↶ Taken back: ${r.undone.decision} on #${r.refId}, now ${r.screeningStatus}`);
                  },
                })}
            disabled={undo.isPending}
          >
            ↶ Take back
          </Button>
        </p>
      )}
      {undone && !last && <p className="mb-2 text-sm text-ink-soft" role="status">{undone}</p>}
      <ErrorNote error={undo.error} />
      {!current ? (
        <EmptyState>
          {left === 0 ? (
            <>
              Nothing is waiting. <Link to="/import">Import more references</Link>, or look at the counts below.
            </>
          ) : (
            <>
              You skipped the rest. <Button onClick={() => setSkipped([])}>Show the skipped ones again</Button>
            </>
          )}
        </EmptyState>
      ) : (
        <article aria-label="Reference to screen" className="rounded border border-paper-edge bg-white/60 p-4">
          <h2 className="mt-0">{current.title}</h2>
          <p className="text-sm">
            {current.authors.join(', ') || 'Anonymous'} · <span className="tabular-nums">{current.year ?? 'n.d.'}</span>
            {current.container ? ` · ${current.container}` : ''}
            {current.doi ? ` · doi:${current.doi}` : ''} · <Link to={`/references/${current.id}`}>open #{current.id}</Link>
          </p>
          <p className="reading mt-2 max-w-3xl text-sm">{current.abstract ?? <span className="text-ink-faint">No abstract in the record.</span>}</p>
          <div className="mt-3 flex flex-wrap gap-2">
            <Button variant="primary" onClick={() => record('included')} disabled={decide.isPending}>
              <kbd>I</kbd> Include
            </Button>
            {EXCLUSION_REASONS.map((r) => (
              <Button key={r} onClick={() => record('excluded', r)} disabled={decide.isPending}>
                <kbd>{EXCLUSION_REASON_KEYS[r]}</kbd> ✕ {EXCLUSION_REASON_LABELS[r]}
              </Button>
            ))}
            <Button onClick={() => setSkipped((s) => [...s, current.id])}>
              <kbd>S</kbd> Skip for now
            </Button>
          </div>
          <label className="mt-3 block text-sm">
            Note (<kbd>N</kbd>){needNote ? ', required for “Other”, then press Enter' : ''}
            <input
              ref={noteRef}
              className="ml-2 w-96 rounded border border-paper-edge bg-white px-2 py-1"
              value={note}
              onChange={(e) => setNote(e.target.value)}
              aria-invalid={needNote && !note.trim()}
              aria-describedby="queue-note-error"
            />
          </label>
          {needNote && !note.trim() && (
            <p id="queue-note-error" className="text-sm text-refusal">
              ✕ Say why, when the reason is “Other”.
            </p>
          )}
          <ErrorNote error={decide.error} />
        </article>
      )}
    </div>
  );
}
