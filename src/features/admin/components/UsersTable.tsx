import { useEffect, useState } from 'react';
import { ROLES, ROLE_LABELS, type Role } from '../../../../shared/roles';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { useUsers, type AdminUser } from '../api/get-users';
import { useSetRole } from '../api/set-role';

type SortField = 'login' | 'name' | 'created_at' | 'last_seen_at';

function RoleCell({ user, role }: { user: AdminUser; role: Role }) {
  const mutation = useSetRole();
  const [saved, setSaved] = useState(false);
  const held = user.roles.includes(role);
  const [checked, setChecked] = useState(held);
  useEffect(() => setChecked(held), [held]);
  return (
    <td className="text-center">
      <label className="inline-flex items-center gap-1">
        <input
          type="checkbox"
          aria-label={ROLE_LABELS[role]}
          checked={checked}
          disabled={mutation.isPending}
          onChange={(e) => {
            const granted = e.target.checked;
            setSaved(false);
            setChecked(granted);
            mutation.mutate({ userId: user.id, role, granted }, { onSuccess: () => setSaved(true), onError: () => setChecked(held) });
          }}
        />
        {saved && <span className="text-xs text-ink-soft">Saved</span>}
      </label>
      {mutation.error && <ErrorNote error={mutation.error} />}
    </td>
  );
}

export function UsersTable() {
  const [q, setQ] = useState('');
  const [page, setPage] = useState(1);
  const [sort, setSort] = useState<SortField>('login');
  const [order, setOrder] = useState<'asc' | 'desc'>('asc');
  const pageSize = 25;
  const { data, error, isLoading } = useUsers({ q: q || undefined, page, pageSize, sort, order });
  return (
    <div>
      <label className="mb-2 block text-sm">
        Find a person{' '}
        <input
          className="ml-1 rounded border border-paper-edge bg-white px-2 py-1"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            setPage(1);
          }}
          placeholder="login or name"
        />
      </label>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading people" />}
      {data && (
        <>
          <table>
            <thead>
              <tr>
                <SortHeader field="login" label="Login" sort={sort} order={order} onSort={(f, o) => (setSort(f), setOrder(o))} />
                <SortHeader field="name" label="Name" sort={sort} order={order} onSort={(f, o) => (setSort(f), setOrder(o))} />
                {ROLES.map((r) => (
                  <th key={r} className="text-center">
                    {ROLE_LABELS[r]}
                  </th>
                ))}
                <SortHeader field="last_seen_at" label="Last signed in" sort={sort} order={order} onSort={(f, o) => (setSort(f), setOrder(o))} />
              </tr>
            </thead>
            <tbody>
              {data.items.map((u) => (
                <tr key={u.id}>
                  <td>@{u.login}</td>
                  <td>{u.name}</td>
                  {ROLES.map((r) => (
                    <RoleCell key={r} user={u} role={r} />
                  ))}
                  <td className="num">{u.lastSeenAt ? new Date(u.lastSeenAt).toISOString().slice(0, 16).replace('T', ' ') : '—'}</td>
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
