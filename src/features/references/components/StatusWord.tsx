const LOOK: Record<string, { symbol: string; word: string; className: string }> = {
  unscreened: { symbol: '○', word: 'Unscreened', className: 'text-ink-soft' },
  awaiting_full_text: { symbol: '◐', word: 'Awaiting full text', className: 'text-ink-soft' },
  included: { symbol: '✓', word: 'Included', className: 'text-ink' },
  excluded: { symbol: '✕', word: 'Excluded', className: 'text-ink-soft' },
};

/** A screening state as a symbol and a word (never colour alone). */
export function ScreeningStatusWord({ status }: { status: string }) {
  const look = LOOK[status] ?? { symbol: '?', word: status, className: '' };
  return (
    <span className={`whitespace-nowrap ${look.className}`}>
      <span aria-hidden="true">{look.symbol}</span> {look.word}
    </span>
  );
}
