import { useMemo, useState, type ReactNode } from 'react';
import { Pager } from '../../../components/ui/Pager';

export interface Column<T> {
  key: string;
  label: string;
  numeric?: boolean;
  value: (row: T) => string | number | null;
  render?: (row: T) => ReactNode;
}

/**
 * A table over rows the synthesis already computed (they live in the answer, not in a database table),
 * so it pages and sorts in the page; 25 rows at a time keeps a 1,000-study answer readable.
 */
export function ResultTable<T>({ caption, columns, rows, pageSize = 25, rowKey }: { caption: string; columns: Column<T>[]; rows: T[]; pageSize?: number; rowKey: (row: T, i: number) => string | number }) {
  const [sort, setSort] = useState<{ key: string; dir: 1 | -1 } | null>(null);
  const [page, setPage] = useState(1);
  const sorted = useMemo(() => {
    if (!sort) return rows;
    const col = columns.find((c) => c.key === sort.key)!;
    return [...rows].sort((a, b) => {
      const x = col.value(a);
      const y = col.value(b);
      if (x == null) return 1;
      if (y == null) return -1;
      return (typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y))) * sort.dir;
    });
  }, [rows, sort, columns]);
  const shown = sorted.slice((page - 1) * pageSize, page * pageSize);
  return (
    <div className="overflow-x-auto">
      <table>
        <caption className="caption-top pb-1 text-left text-sm text-ink-soft">{caption}</caption>
        <thead>
          <tr>
            {columns.map((c) => {
              const active = sort?.key === c.key;
              return (
                <th key={c.key} className={c.numeric ? 'num' : undefined} aria-sort={active ? (sort!.dir === 1 ? 'ascending' : 'descending') : 'none'}>
                  <button
                    type="button"
                    className="font-semibold"
                    onClick={() => {
                      setSort({ key: c.key, dir: active && sort!.dir === 1 ? -1 : 1 });
                      setPage(1);
                    }}
                  >
                    {c.label} {active ? (sort!.dir === 1 ? '▲' : '▼') : ''}
                  </button>
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {shown.map((r, i) => (
            <tr key={rowKey(r, i)}>
              {columns.map((c) => (
                <td key={c.key} className={c.numeric ? 'num' : undefined}>
                  {c.render ? c.render(r) : (c.value(r) ?? '—')}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {rows.length > pageSize && <Pager page={page} pageSize={pageSize} total={rows.length} onPage={setPage} />}
    </div>
  );
}
