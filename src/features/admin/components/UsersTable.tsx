import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { roleChangeParamsSchema } from '../../../../shared/schemas/users';
import { ROLES, ROLE_LABELS, effectiveRoles, type Role } from '../../../../shared/roles';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { taking } from '../../../lib/forms/fields';
import { formResolver } from '../../../lib/forms/resolver';
import { useUsers, type AdminUser } from '../api/get-users';
import { useSetRole } from '../api/set-role';

type SortField = 'login' | 'name' | 'created_at' | 'last_seen_at';

/** A role change as the server's route takes it: who, which role, granted or not. */
const roleChangeSchema = (userId: number, role: Role) =>
  z
    .object({ granted: z.boolean() })
    .transform((v) => ({ id: userId, role, granted: v.granted }))
    .pipe(taking<{ id: number; role: Role; granted: boolean }>()(roleChangeParamsSchema.extend({ granted: z.boolean() })));

/** One role of one person: ticking saves at once; a refused change puts the box back. */
function RoleCell({ user, role }: { user: AdminUser; role: Role }) {
  const mutation = useSetRole();
  const held = user.roles.includes(role);
  // a role held through another (an admin is also a curator, reviewer and contributor)
  const via = held ? [] : user.roles.filter((r) => r !== role && effectiveRoles([r]).includes(role));
  const schema = useMemo(() => roleChangeSchema(user.id, role), [user.id, role]);
  const form = useForm({ resolver: formResolver(schema), values: { granted: held } });
  const save = form.handleSubmit(({ id, granted }) =>
    mutation.mutate({ userId: id, role, granted }, { onError: () => form.reset({ granted: held }) }),
  );
  return (
    <td className="text-center">
      <form className="inline-flex items-center gap-1" noValidate onChange={() => void save()} onSubmit={save}>
        <input type="checkbox" aria-label={ROLE_LABELS[role]} {...form.register('granted')} disabled={mutation.isPending} />
        {mutation.isSuccess && <span className="text-xs text-ink-soft">Saved</span>}
      </form>
      {via.length > 0 && <div className="text-xs text-ink-soft">✓ through {via.map((r) => ROLE_LABELS[r]).join(', ')}</div>}
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
