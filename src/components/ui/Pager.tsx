export function Pager({ page, pageSize, total, onPage }: { page: number; pageSize: number; total: number; onPage: (p: number) => void }) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  return (
    <nav aria-label="Pages" className="mt-2 flex items-center gap-3 text-sm text-ink-soft">
      <button type="button" className="underline disabled:no-underline disabled:opacity-40" disabled={page <= 1} onClick={() => onPage(page - 1)}>
        ← Previous
      </button>
      <span className="tabular-nums">
        Page {page} of {pages} · {total} in all
      </span>
      <button type="button" className="underline disabled:no-underline disabled:opacity-40" disabled={page >= pages} onClick={() => onPage(page + 1)}>
        Next →
      </button>
    </nav>
  );
}
