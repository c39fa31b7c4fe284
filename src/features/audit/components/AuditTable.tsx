import { auditDetailsText, auditRecordText } from '../../../../shared/vocabulary/audit';
import { LABELS, labelOf } from '../../../../shared/vocabulary/labels';
import { useState } from 'react';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { useAudit, type AuditFilters } from '../api/get-audit';

const inputClass = 'ml-1 rounded border border-paper-edge bg-white px-2 py-1';
const byLabel = (table: Record<string, string>) => Object.entries(table).sort((a, b) => a[1].localeCompare(b[1]));

/** A filter picked from one of the label tables, 'any' first. */
function LabelChoice({ label, table, value, onChange }: { label: string; table: Record<string, string>; value: string | undefined; onChange: (value: string) => void }) {
  return (
    <label>
      {label}
      <select className={inputClass} aria-label={label} value={value ?? ''} onChange={(e) => onChange(e.target.value)}>
        <option value="">any</option>
        {byLabel(table).map(([code, text]) => (
          <option key={code} value={code}>
            {text}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The audit log with filters by person, action, record and a range of days; details said in words. */
export function AuditTable() {
  const [page, setPage] = useState(1);
  const [filters, setFilters] = useState<AuditFilters>({});
  const pageSize = 50;
  const { data, error, isLoading } = useAudit({ page, pageSize, ...filters });
  const set = (key: keyof AuditFilters) => (value: string) => {
    setFilters((f) => ({ ...f, [key]: value.trim() || undefined }));
    setPage(1);
  };
  return (
    <div>
      <form className="mb-3 flex flex-wrap gap-3 text-sm" aria-label="Filter the audit log" onSubmit={(e) => e.preventDefault()}>
        <label>
          Person
          <input className={inputClass} aria-label="Person" value={filters.actor ?? ''} placeholder="login, or system" onChange={(e) => set('actor')(e.target.value)} />
        </label>
        <LabelChoice label="Action" table={LABELS.auditAction} value={filters.action} onChange={set('action')} />
        <LabelChoice label="Record" table={LABELS.record} value={filters.entityType} onChange={set('entityType')} />
        <label>
          Number
          <input className={`${inputClass} w-24`} inputMode="numeric" aria-label="Number" value={filters.entityId ?? ''} onChange={(e) => set('entityId')(e.target.value)} />
        </label>
        <label>
          From
          <input className={inputClass} type="date" aria-label="From" value={filters.from ?? ''} onChange={(e) => set('from')(e.target.value)} />
        </label>
        <label>
          To
          <input className={inputClass} type="date" aria-label="To" value={filters.to ?? ''} onChange={(e) => set('to')(e.target.value)} />
        </label>
      </form>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading the audit log" />}
      {data && data.total === 0 && <EmptyState>No audit entries match.</EmptyState>}
      {data && data.total > 0 && (
        <>
          <div className="overflow-x-auto">
            <table>
              <thead>
                <tr>
                  <th className="num">#</th>
                  <th>When (UTC)</th>
                  <th>Who</th>
                  <th>Action</th>
                  <th>About</th>
                  <th>Details</th>
                </tr>
              </thead>
              <tbody>
                {data.items.map((a) => (
                  <tr key={a.id}>
                    <td className="num">{a.id}</td>
                    <td className="num">{a.at.slice(0, 19).replace('T', ' ')}</td>
                    <td>{a.actorLogin ? `@${a.actorLogin}` : 'system'}</td>
                    <td>{labelOf('auditAction', a.action)}</td>
                    <td>{auditRecordText(a.entityType, a.entityId)}</td>
                    <td className="text-sm">{auditDetailsText(a.details) || '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <Pager page={page} pageSize={pageSize} total={data.total} onPage={setPage} />
        </>
      )}
    </div>
  );
}
