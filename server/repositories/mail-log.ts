import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { MailLogRow, MailStatus } from './rows.js';

export async function insertMail(db: Db, m: { kind: string; to: string; subject: string; body: string }): Promise<number> {
  const [row] = await db<MailLogRow>('mail_log').insert({ kind: m.kind, to_address: m.to, subject: m.subject, body: m.body }).returning('id');
  return Number(row.id);
}

export async function findMail(db: Db, id: number): Promise<MailLogRow | undefined> {
  return db<MailLogRow>('mail_log').where({ id }).first();
}

/** The row, locked until the transaction ends (one resend at a time). */
export async function lockMail(db: Db, id: number): Promise<MailLogRow | undefined> {
  return db<MailLogRow>('mail_log').where({ id }).forUpdate().first();
}

export async function updateMail(db: Db, id: number, patch: Partial<Pick<MailLogRow, 'status' | 'attempts' | 'last_error' | 'job_id' | 'message_id'>> & { sent?: boolean }): Promise<void> {
  const { sent, ...rest } = patch;
  await db<MailLogRow>('mail_log').where({ id }).update({ ...rest, ...(sent ? { sent_at: db.fn.now() } : {}) });
}

export async function listMailLog(db: Db, opts: PageRequest & { status?: MailStatus; order: 'asc' | 'desc' }) {
  const base = db<MailLogRow>('mail_log').modify((q) => {
    if (opts.status) q.where('status', opts.status);
  });
  const total = await countRows(base);
  const rows: MailLogRow[] = await pageOf(base.clone().orderBy('id', opts.order), opts);
  return { total, rows };
}
