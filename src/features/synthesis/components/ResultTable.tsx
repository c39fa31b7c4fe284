import { useMemo, useState, type ReactNode } from 'react';
import { Pager } from '../../../components/ui/Pager';

export interface Column<T> {
  key: string;
  label: string;
  numeric?: boolean;
  value: (row: T) => string | number | null;
  render?: (row: T) => ReactNode;
}

export type TableSort = { key: string; dir: 1 | -1 } | null;

/** Paging and sorting done by the server: `rows` is the current page, the parent holds page and sort. */
export interface ServerPaging {
  total: number;
  page: number;
  sort: TableSort;
  onPage: (page: number) => void;
  onSort: (sort: TableSort) => void;
}

/**
 * A table over rows the synthesis already computed (they live in the answer, not in a database table),
 * so it pages and sorts in the page; 25 rows at a time keeps a 1,000-study answer readable. With `server`,
 * the rows are one page the server sorted (a long synthesis answers only its first page).
 */
export function ResultTable<T>({ caption, columns, rows, pageSize = 25, rowKey, server }: { caption: string; columns: Column<T>[]; rows: T[]; pageSize?: number; rowKey: (row: T, i: number) => string | number; server?: ServerPaging }) {
  const [localSort, setLocalSort] = useState<TableSort>(null);
  const [localPage, setLocalPage] = useState(1);
  const sort = server ? server.sort : localSort;
  const page = server ? server.page : localPage;
  const setSort = server ? server.onSort : setLocalSort;
  const setPage = server ? server.onPage : setLocalPage;
  const total = server ? server.total : rows.length;
  const sorted = useMemo(() => {
    if (!sort || server) return rows;
    const col = columns.find((c) => c.key === sort.key)!;
    return [...rows].sort((a, b) => {
      const x = col.value(a);
      const y = col.value(b);
      if (x == null) return 1;
      if (y == null) return -1;
      return (typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y))) * sort.dir;
    });
  }, [rows, sort, columns, server]);
  const shown = server ? rows : sorted.slice((page - 1) * pageSize, page * pageSize);
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
      {total > pageSize && <Pager page={page} pageSize={pageSize} total={total} onPage={setPage} />}
    </div>
  );
}
