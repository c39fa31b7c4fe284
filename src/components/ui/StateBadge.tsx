import { labelOf } from '../../../shared/vocabulary/labels';

const SYMBOLS: Record<string, string> = {
  draft: '✎',
  submitted: '⇪',
  coding: '✎',
  matched: '＝',
  disputed: '≠',
  settled: '✓',
  withdrawn: '⊘',
  queued: '…',
  sent: '✓',
  retrying: '↻',
  failed: '✕',
};

/** A state as a word (its label) and a symbol (never colour alone); the code stays in data-state. */
export function StateBadge({ state }: { state: string }) {
  const tone = state === 'failed' || state === 'withdrawn' ? 'border-refusal text-refusal' : state === 'disputed' || state === 'retrying' ? 'border-caution text-caution-dark' : 'border-paper-edge text-ink-soft';
  return (
    <span className={`inline-flex items-center gap-1 rounded border px-1.5 text-xs ${tone}`} data-state={state}>
      <span aria-hidden>{SYMBOLS[state] ?? '•'}</span>
      {labelOf('state', state)}
    </span>
  );
}
