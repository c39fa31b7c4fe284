import { useForm } from 'react-hook-form';
import { tokenCreateSchema } from '../../../../shared/schemas/users';
import { Button } from '../../../components/ui/Button';
import { FieldError } from '../../../components/ui/Field';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useCreateToken, useRevokeToken, useTokens } from '../api/tokens';

export function TokensPanel() {
  const { data, error, isLoading } = useTokens();
  const create = useCreateToken();
  const revoke = useRevokeToken();
  const form = useForm({ resolver: formResolver(tokenCreateSchema), defaultValues: { name: '' } });
  const nameError = form.formState.errors.name?.message;
  return (
    <div>
      <form
        className="mb-3 flex flex-wrap items-end gap-2"
        noValidate
        onSubmit={form.handleSubmit((v) => create.mutate(v, { onSuccess: () => form.reset(), onError: (err) => showServerErrors(err, form.setError, ['name']) }))}
      >
        <label className="text-sm">
          Token name
          <input className="ml-2 rounded border border-paper-edge bg-white px-2 py-1" {...form.register('name')} maxLength={80} aria-invalid={!!nameError} aria-describedby="token-name-error" />
        </label>
        <Button type="submit" variant="primary" disabled={create.isPending}>
          Create token
        </Button>
        <FieldError id="token-name-error" message={nameError} className="self-center text-sm text-refusal" />
      </form>
      {!nameError && <ErrorNote error={create.error} />}
      {create.data && (
        <div role="status" className="mb-3 rounded border border-action bg-action-light px-3 py-2 text-sm">
          Copy this token now; it is shown only once:
          <code className="ml-2 select-all break-all font-mono">{create.data.token}</code>
        </div>
      )}
      <ErrorNote error={error ?? revoke.error} />
      {isLoading && <Loading />}
      {data && data.items.length === 0 && <EmptyState>No tokens yet. Create one to call the API from a script.</EmptyState>}
      {data && data.items.length > 0 && (
        <table>
          <thead>
            <tr>
              <th>Name</th>
              <th>Begins</th>
              <th>Created</th>
              <th>Last used</th>
              <th>State</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {data.items.map((t) => (
              <tr key={t.id}>
                <td>{t.name}</td>
                <td className="font-mono">{t.prefix}…</td>
                <td className="num">{t.createdAt.slice(0, 10)}</td>
                <td className="num">{t.lastUsedAt?.slice(0, 10) ?? '—'}</td>
                <td>{t.revokedAt ? '✕ revoked' : '✓ active'}</td>
                <td>
                  {!t.revokedAt && (
                    <Button variant="danger" onClick={() => revoke.mutate(t.id)}>
                      Revoke
                    </Button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
