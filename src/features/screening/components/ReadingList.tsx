import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { EXCLUSION_REASON_LABELS, referenceSourceLabel, type ScreeningStage } from '../../../../shared/vocabulary/screening';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import type { Choice } from '../choices';
import { useDecideMany } from '../api/decide-many';
import { QUEUE_LIMIT, useQueue, type QueueItem } from '../api/get-queue';
import { useUndoMany } from '../api/undo-many';
import { DecisionChooser } from './DecisionChooser';
import { RecordReader } from './RecordReader';

const whyHere = (it: QueueItem) =>
  it.why.kind === 'conflict'
    ? '⚑ conflict: awaiting a curator’s settlement'
    : it.why.kind === 'second_screener_needed'
      ? '◐ second screener needed'
      : it.why.kind === 'passed_title_abstract'
        ? 'included on title and abstract'
        : it.why.batch
          ? `new in batch ${it.why.batch}`
          : `new (${referenceSourceLabel(it.source).toLowerCase()})`;
const isConflict = (it: QueueItem) => it.why.kind === 'conflict';

/** Keys the list answers when nothing that takes typing has the focus. */
const typingIn = (el: EventTarget | null) => el instanceof HTMLElement && (el.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(el.tagName));
const pressable = (el: EventTarget | null) => el instanceof HTMLElement && ['BUTTON', 'A'].includes(el.tagName);

const records = (ids: number[]) => `record${ids.length === 1 ? '' : 's'} ${ids.map((id) => `#${id}`).join(', ')}`;

type Last = { text: string; items: { refId: number; version: number }[] };

/**
 * The queue as a reading list: the records on the left, the one under the cursor on the right with a decision
 * chooser beside its abstract. ↑ ↓ move, Space marks records for one decision together, Enter opens the chooser,
 * U takes back the last decision (a whole batch at once), Esc clears the marks.
 */
export function ReadingList({ stage, batch, terms }: { stage: ScreeningStage; batch?: number; terms: string[] }) {
  const { data, error, isLoading } = useQueue({ limit: QUEUE_LIMIT, stage, batch });
  const decide = useDecideMany();
  const undo = useUndoMany();
  const [cursorId, setCursorId] = useState<number | null>(null);
  const [marked, setMarked] = useState<ReadonlySet<number>>(new Set());
  const [chooserFor, setChooserFor] = useState<{ ids: number[]; marked: boolean } | null>(null);
  const [last, setLast] = useState<Last | null>(null);
  const [told, setTold] = useState<string | null>(null);
  const listRef = useRef<HTMLUListElement>(null);

  const items = data?.items ?? [];
  const at = Math.max(0, items.findIndex((i) => i.id === cursorId));
  const current = items[at] as QueueItem | undefined;
  const markedItems = items.filter((i) => marked.has(i.id) && !isConflict(i));

  const moveTo = (i: number) => items[i] && setCursorId(items[i].id);
  const toggle = (id: number) => !items.find((i) => i.id === id && isConflict(i)) && setMarked((m) => (m.has(id) ? new Set([...m].filter((x) => x !== id)) : new Set([...m, id])));
  const openChooser = () => {
    if (!current || (isConflict(current) && !markedItems.length)) return;
    decide.reset();
    setChooserFor(markedItems.length ? { ids: markedItems.map((i) => i.id), marked: true } : { ids: [current.id], marked: false });
  };
  const closeChooser = () => {
    setChooserFor(null);
    listRef.current?.focus();
  };

  const save = (choice: Choice, note: string) => {
    const targets = items.filter((i) => chooserFor?.ids.includes(i.id));
    if (!targets.length) return;
    const inBatch = new Set(targets.map((t) => t.id));
    const lastAt = Math.max(...targets.map((t) => items.indexOf(t)));
    // The cursor moves on to the next record not decided now (or back, at the end of the list).
    const next = items.slice(lastAt + 1).find((i) => !inBatch.has(i.id)) ?? [...items.slice(0, lastAt)].reverse().find((i) => !inBatch.has(i.id));
    decide.mutate(
      { items: targets.map((t) => ({ refId: t.id, version: t.version })), stage, ...choice, ...(note ? { note } : {}) },
      {
        onSuccess: (answer) => {
          const what =
            choice.decision === 'included'
              ? stage === 'title_abstract'
                ? '✓ Included on title and abstract'
                : '✓ Included'
              : `✕ Excluded${choice.reason ? ` (${EXCLUSION_REASON_LABELS[choice.reason]})` : ''}`;
          const withdrawn = answer.results.flatMap((r) => r.withdrawnRecords);
          const also = withdrawn.length ? `; settled ${records(withdrawn)} withdrawn` : '';
          const blind = answer.results.filter((r) => r.dual && !r.dual.settled).length;
          const settled = answer.results.filter((r) => r.dual?.settled).length;
          const dual = answer.results.some((r) => r.dual)
            ? ` (your blind decision${blind ? `; ${blind} waiting for the other screener or a curator` : ''}${settled ? `; ${settled} settled, both screeners agreed` : ''})`
            : '';
          setLast({ text: `${what}: ${targets.length === 1 ? targets[0].title : `${targets.length} records`}${also}${dual}`, items: answer.results.map((r) => ({ refId: r.refId, version: r.version })) });
          setTold(null);
          setMarked(new Set());
          setCursorId(next?.id ?? null);
          closeChooser();
        },
      },
    );
  };

  const takeBack = () => {
    if (!last || undo.isPending) return;
    undo.mutate(
      { items: last.items },
      {
        onSuccess: (answer) => {
          const n = answer.results.length;
          const restored = answer.results.flatMap((r) => r.restoredRecords);
          const also = restored.length ? `; ${records(restored)} settled again` : '';
          setTold(`↶ Taken back: ${n === 1 ? `#${answer.results[0].refId} is` : `${n} records are`} waiting again${also}`);
          setLast(null);
          setCursorId(answer.results[0]?.refId ?? null);
          listRef.current?.focus();
        },
      },
    );
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (chooserFor || typingIn(e.target) || e.ctrlKey || e.metaKey || e.altKey) return;
      if ((e.key === 'Enter' || e.key === ' ') && pressable(e.target)) return;
      const act: Record<string, () => void> = {
        ArrowDown: () => moveTo(Math.min(at + 1, items.length - 1)),
        ArrowUp: () => moveTo(Math.max(at - 1, 0)),
        Home: () => moveTo(0),
        End: () => moveTo(items.length - 1),
        ' ': () => current && toggle(current.id),
        Enter: openChooser,
        Escape: () => setMarked(new Set()),
        u: takeBack,
        U: takeBack,
      };
      const run = act[e.key];
      if (!run) return;
      e.preventDefault();
      run();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const currentId = current?.id;
  useEffect(() => {
    if (currentId) document.getElementById(`queue-${currentId}`)?.scrollIntoView({ block: 'nearest' });
  }, [currentId]);

  // Once the list is there, it has the focus (the keys work without it too).
  const loaded = !!data;
  useEffect(() => {
    if (loaded) listRef.current?.focus({ preventScroll: true });
  }, [loaded]);

  if (isLoading) return <Loading what="Loading the reading list" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const left = data.remaining;

  return (
    <div>
      <p className="mb-2 text-sm" role="status">
        {left} {left === 1 ? 'record' : 'records'} waiting{stage === 'full_text' ? ' for full text' : ''}{batch ? ` from batch ${batch}` : ''}
        {left > items.length ? ` (the first ${items.length} listed)` : ''}
        {markedItems.length ? ` · ${markedItems.length} marked` : ''}
      </p>
      {last && (
        <p className="mb-2 text-sm text-ink-soft">
          Last: {last.text}{' '}
          <Button onClick={takeBack} disabled={undo.isPending}>
            ↶ Take back (U)
          </Button>
        </p>
      )}
      {told && !last && (
        <p className="mb-2 text-sm text-ink-soft" role="status">
          {told}
        </p>
      )}
      <ErrorNote error={undo.error} />
      {!current ? (
        <EmptyState>
          Nothing is waiting{stage === 'full_text' ? ' for full text' : ''}{batch ? ' from this batch' : ''}.{' '}
          {stage === 'full_text' ? 'Records included on title and abstract come here.' : <Link to="/import">Import more references</Link>}, or see the{' '}
          <Link to="/screening/counts">PRISMA 2020 flow</Link>.
        </EmptyState>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[minmax(16rem,2fr)_minmax(0,3fr)]">
          <ul
            ref={listRef}
            tabIndex={0}
            role="listbox"
            aria-label="Records to screen"
            aria-multiselectable="true"
            aria-activedescendant={`queue-${current.id}`}
            className="max-h-[40vh] list-none overflow-y-auto rounded border border-paper-edge bg-white/60 pl-0 text-sm focus:outline-2 focus:outline-action lg:max-h-[75vh]"
          >
            {items.map((it) => {
              const isCurrent = it.id === current.id;
              const isMarked = marked.has(it.id);
              return (
                <li
                  key={it.id}
                  id={`queue-${it.id}`}
                  role="option"
                  aria-selected={isMarked}
                  aria-current={isCurrent ? 'true' : undefined}
                  onClick={() => setCursorId(it.id)}
                  className={`flex cursor-pointer gap-2 border-b border-paper-edge px-2 py-1.5 last:border-b-0 ${isCurrent ? 'border-l-4 border-l-action bg-action-light' : 'border-l-4 border-l-transparent'}`}
                >
                  <span
                    aria-hidden
                    title={isMarked ? 'marked: click to unmark' : 'click to mark'}
                    className="select-none text-base leading-5"
                    onClick={(e) => (e.stopPropagation(), toggle(it.id))}
                  >
                    {isMarked ? '☑' : '☐'}
                  </span>
                  <span className="min-w-0">
                    <span className="line-clamp-2 font-medium">{it.title}</span>
                    <span className="block text-xs text-ink-soft">
                      <span className="tabular-nums">{it.year ?? 'n.d.'}</span>
                      {it.container ? ` · ${it.container}` : ''}
                    </span>
                    <span className="block text-xs text-ink-faint">
                      {whyHere(it)}
                      {isMarked ? ' · ☑ marked' : ''}
                    </span>
                  </span>
                </li>
              );
            })}
          </ul>
          <RecordReader item={current} terms={terms}>
            {isConflict(current) && !chooserFor ? (
              <div className="rounded border border-dashed border-caution p-3 text-sm" role="note">
                ⚑ Both screeners have decided this record and disagree. It waits for a curator:{' '}
                <Link to={`/screening/disagreements${stage === 'full_text' ? '?stage=full_text' : ''}`}>settle it in the disagreement queue</Link>.
              </div>
            ) : chooserFor ? (
              <DecisionChooser stage={stage} count={chooserFor.ids.length} marked={chooserFor.marked} pending={decide.isPending} error={decide.error} onSave={save} onClose={closeChooser} />
            ) : (
              <div className="rounded border border-dashed border-paper-edge p-3 text-sm">
                <Button variant="primary" onClick={openChooser}>
                  {markedItems.length ? `Decide ${markedItems.length} marked…` : 'Decide…'}
                </Button>
                <p className="mt-2 text-xs text-ink-faint">
                  Enter opens this chooser{markedItems.length ? ` for the marked ${markedItems.length === 1 ? 'record' : 'records'}, not the one being read` : ''}.
                </p>
              </div>
            )}
          </RecordReader>
        </div>
      )}
    </div>
  );
}
