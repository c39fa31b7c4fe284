import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { Button } from '../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { useMyExtractions, type MyExtractionsQuery } from '../../features/extraction/api/get-my-extractions';
import { StateBadge } from '../../components/ui/StateBadge';
import { useClaimReference } from '../../features/extraction/api/claim-reference';
import { useClaimable, type ClaimableQuery } from '../../features/extraction/api/get-claimable';
import { RequireRole } from './RequireRole';
import { labelOf } from '../../../shared/vocabulary/labels';

function ClaimList() {
  const [q, setQ] = useState<ClaimableQuery>({ page: 1, pageSize: 10, sort: 'reference', order: 'asc' });
  const { data, error } = useClaimable(q);
  const claim = useClaimReference();
  const navigate = useNavigate();
  return (
    <section className="mt-6">
      <h2>Claim a reference to code</h2>
      <p className="text-sm text-ink-soft">Included references nobody is coding yet. A claimed sheet is compared once a curator pairs it with a second coder.</p>
      <label className="text-sm">
        Find{' '}
        <input className="rounded border border-paper-edge bg-white px-2 py-1" value={q.q ?? ''} onChange={(e) => setQ({ ...q, q: e.target.value || undefined, page: 1 })} placeholder="title or first author" />
      </label>
      <ErrorNote error={error ?? claim.error} />
      {data && data.total === 0 && <EmptyState>No included reference is waiting to be claimed.</EmptyState>}
      {data && data.total > 0 && (
        <>
          <table className="mt-2">
            <thead>
              <tr>
                <SortHeader field="reference" label="Reference" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} />
                <th>Title</th>
                <th>Code it</th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((r) => (
                <tr key={r.id}>
                  <td>{r.referenceLabel}</td>
                  <td className="reading text-xs">{r.title}</td>
                  <td>
                    <Button disabled={claim.isPending} onClick={() => claim.mutate(r.id, { onSuccess: (x) => navigate(`/extractions/${x.id}`) })}>
                      Claim {r.referenceLabel}
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
        </>
      )}
    </section>
  );
}

export function MyExtractionsPage() {
  const [q, setQ] = useState<MyExtractionsQuery>({ page: 1, pageSize: 25, sort: 'updated', order: 'desc' });
  const { data, error, isLoading } = useMyExtractions(q);
  const onSort = (sort: MyExtractionsQuery['sort'], order: 'asc' | 'desc') => setQ({ ...q, sort, order, page: 1 });
  return (
    <RequireRole role="contributor">
      <h1>My coding</h1>
      <p className="mb-3 text-sm text-ink-soft">
        References a curator asked you to code. You code blind: the other coder’s sheet opens once the pair is settled.
      </p>
      <label className="text-sm">
        State{' '}
        <select className="rounded border border-paper-edge bg-white px-2 py-1" value={q.state ?? ''} onChange={(e) => setQ({ ...q, state: (e.target.value || undefined) as MyExtractionsQuery['state'], page: 1 })}>
          <option value="">all</option>
          {['draft', 'submitted', 'disputed', 'settled'].map((s) => (
            <option key={s} value={s}>
              {labelOf('state', s)}
            </option>
          ))}
        </select>
      </label>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading your sheets" />}
      {data && data.total === 0 && <EmptyState>Nothing to code yet. A curator assigns references to you (you get an e-mail), or claim one below.</EmptyState>}
      {data && data.total > 0 && (
        <>
          <table className="mt-2">
            <thead>
              <tr>
                <SortHeader field="reference" label="Reference" sort={q.sort} order={q.order} onSort={onSort} />
                <th>Title</th>
                <SortHeader field="state" label="State" sort={q.sort} order={q.order} onSort={onSort} />
                <th className="num">Effects</th>
                <SortHeader field="updated" label="Last change (UTC)" sort={q.sort} order={q.order} onSort={onSort} numeric />
              </tr>
            </thead>
            <tbody>
              {data.items.map((x) => (
                <tr key={x.id}>
                  <td>
                    <Link to={`/extractions/${x.id}`}>{x.referenceLabel}</Link>
                  </td>
                  <td className="reading text-xs">{x.title}</td>
                  <td>
                    <StateBadge state={x.state} />
                  </td>
                  <td className="num">{x.effects}</td>
                  <td className="num">{new Date(x.updatedAt).toISOString().slice(0, 16).replace('T', ' ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
        </>
      )}
      <ClaimList />
    </RequireRole>
  );
}
