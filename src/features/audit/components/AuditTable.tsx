import { auditRecordText } from '../../../../shared/vocabulary/audit';
import { labelOf } from '../../../../shared/vocabulary/labels';
import { useState } from 'react';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { useAudit } from '../api/get-audit';

export function AuditTable() {
  const [page, setPage] = useState(1);
  const [entityType, setEntityType] = useState('');
  const pageSize = 50;
  const { data, error, isLoading } = useAudit({ page, pageSize, entityType: entityType || undefined });
  return (
    <div>
      <label className="mb-2 block text-sm">
        Only entries about{' '}
        <input
          className="ml-1 rounded border border-paper-edge bg-white px-2 py-1"
          value={entityType}
          placeholder="e.g. user, reference, extraction"
          onChange={(e) => {
            setEntityType(e.target.value.trim());
            setPage(1);
          }}
        />
      </label>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading the audit log" />}
      {data && data.total === 0 && <EmptyState>No audit entries match.</EmptyState>}
      {data && data.total > 0 && (
        <>
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
                  <td className="font-mono text-xs">{JSON.stringify(a.details)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={page} pageSize={pageSize} total={data.total} onPage={setPage} />
        </>
      )}
    </div>
  );
}
