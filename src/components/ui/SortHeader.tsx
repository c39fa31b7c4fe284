/** A column header that asks the server to sort; shows the direction in words for screen readers. */
export function SortHeader<F extends string>({
  field,
  label,
  sort,
  order,
  onSort,
  numeric,
}: {
  field: F;
  label: string;
  sort: F;
  order: 'asc' | 'desc';
  onSort: (field: F, order: 'asc' | 'desc') => void;
  numeric?: boolean;
}) {
  const active = sort === field;
  return (
    <th className={numeric ? 'num' : undefined} aria-sort={active ? (order === 'asc' ? 'ascending' : 'descending') : 'none'}>
      <button type="button" className="font-semibold" onClick={() => onSort(field, active && order === 'asc' ? 'desc' : 'asc')}>
        {label} {active ? (order === 'asc' ? '▲' : '▼') : ''}
      </button>
    </th>
  );
}
