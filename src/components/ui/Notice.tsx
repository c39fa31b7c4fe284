import type { ReactNode } from 'react';

/** Cautions in amber, refusals in muted red; each also carries a word and a symbol, never colour alone. */
export function Caution({ title = 'Caution', children }: { title?: string; children: ReactNode }) {
  return (
    <div role="note" className="my-2 rounded border-l-4 border-caution bg-caution-light px-3 py-2 text-sm text-caution-dark">
      <strong>⚠ {title}:</strong> {children}
    </div>
  );
}

export function ErrorNote({ error, title = 'Refused' }: { error: unknown; title?: string }) {
  if (!error) return null;
  const message = error instanceof Error ? error.message : String(error);
  return (
    <div role="alert" className="my-2 rounded border-l-4 border-refusal bg-refusal-light px-3 py-2 text-sm text-refusal">
      <strong>✕ {title}:</strong> {message}
    </div>
  );
}

export function EmptyState({ children }: { children: ReactNode }) {
  return <div className="my-4 rounded border border-dashed border-paper-edge px-4 py-6 text-center text-ink-soft">{children}</div>;
}

export function Loading({ what = 'Loading' }: { what?: string }) {
  return (
    <p role="status" className="text-ink-faint">
      {what}…
    </p>
  );
}
