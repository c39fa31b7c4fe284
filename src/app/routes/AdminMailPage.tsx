import { useState } from 'react';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { StateBadge } from '../../components/ui/StateBadge';
import { useMailLog } from '../../features/mailbox/api/get-mail-log';
import { useMailbox } from '../../features/mailbox/api/get-mailbox';
import { useResendMail } from '../../features/mailbox/api/resend-mail';
import { Button } from '../../components/ui/Button';
import { RequireRole } from './RequireRole';
import { labelOf } from '../../../shared/vocabulary/labels';

const when = (s: string | null) => (s ? new Date(s).toISOString().slice(0, 19).replace('T', ' ') : '—');

export function AdminMailPage() {
  const [status, setStatus] = useState('');
  const [logPage, setLogPage] = useState(1);
  const [boxPage, setBoxPage] = useState(1);
  const [to, setTo] = useState('');
  const log = useMailLog({ status: status || undefined, page: logPage, pageSize: 20, order: 'desc' });
  const box = useMailbox({ to: to || undefined, page: boxPage, pageSize: 10 });
  const resend = useResendMail();
  return (
    <RequireRole role="admin">
      <h1>Mail</h1>
      <h2>Delivery log</h2>
      <p className="text-sm text-ink-soft">
        Every mail the registry sends runs as a background job and is retried with growing pauses for over an hour; a mail that still could not be sent stays here as failed, with its
        error, until you send it again.
      </p>
      <label className="text-sm">
        Status{' '}
        <select className="rounded border border-paper-edge bg-white px-2 py-1" value={status} onChange={(e) => (setStatus(e.target.value), setLogPage(1))}>
          <option value="">all</option>
          {['queued', 'sent', 'retrying', 'failed'].map((s) => (
            <option key={s} value={s}>
              {labelOf('state', s)}
            </option>
          ))}
        </select>
      </label>
      <ErrorNote error={log.error} />
      {log.isLoading && <Loading what="Loading the log" />}
      {log.data && log.data.total === 0 && <EmptyState>No mail yet. Assigning a reference to coders sends the first ones.</EmptyState>}
      <ErrorNote error={resend.error} title="Not resent" />
      {resend.isSuccess && (
        <p role="status" className="text-sm">
          Queued again: “{resend.data.subject}” to {resend.data.to}.
        </p>
      )}
      {log.data && log.data.total > 0 && (
        <>
          <div className="relative overflow-x-auto">
            <table className="mt-2">
              <thead>
                <tr>
                  <th>Queued (UTC)</th>
                  <th>Kind</th>
                  <th>To</th>
                  <th>Subject</th>
                  <th>Status</th>
                  <th className="num">Attempts</th>
                  <th>Last error</th>
                  <th>
                    <span className="sr-only">Action</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {log.data.items.map((m) => (
                  <tr key={m.id}>
                    <td className="num">{when(m.createdAt)}</td>
                    <td>{m.kind}</td>
                    <td>{m.to}</td>
                    <td>{m.subject}</td>
                    <td>
                      <StateBadge state={m.status} />
                    </td>
                    <td className="num">{m.attempts}</td>
                    <td className="text-xs text-refusal">{m.lastError ?? ''}</td>
                    <td>
                      {m.resendable && (
                        <Button onClick={() => resend.mutate(m.id)} disabled={resend.isPending && resend.variables === m.id} aria-label={`Resend “${m.subject}” to ${m.to}`}>
                          Resend
                        </Button>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <Pager page={logPage} pageSize={20} total={log.data.total} onPage={setLogPage} />
        </>
      )}
      <h2>Mailbox</h2>
      <p className="text-sm text-ink-soft">What the configured mail catcher received (the local stand-in in development and tests).</p>
      <label className="text-sm">
        Recipient{' '}
        <input className="rounded border border-paper-edge bg-white px-2 py-1" value={to} onChange={(e) => (setTo(e.target.value), setBoxPage(1))} placeholder="address" />
      </label>
      <ErrorNote error={box.error} />
      {box.data && box.data.total === 0 && <EmptyState>The mailbox is empty.</EmptyState>}
      {box.data?.items.map((m) => (
        <article key={m.id} className="my-2 rounded border border-paper-edge bg-white/70 p-3 text-sm" aria-label={m.subject}>
          <p>
            <strong>{m.subject}</strong>
          </p>
          <p className="text-xs text-ink-soft">
            to {m.to.join(', ')} · from {m.from} · {when(m.receivedAt)} UTC
          </p>
          <pre className="mt-1 whitespace-pre-wrap break-words font-ui text-sm [overflow-wrap:anywhere]">{m.text}</pre>
        </article>
      ))}
      {box.data && box.data.total > 0 && <Pager page={boxPage} pageSize={10} total={box.data.total} onPage={setBoxPage} />}
    </RequireRole>
  );
}
