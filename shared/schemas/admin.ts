import { z } from 'zod';
import { pageRequestSchema, pageSchema, timestamp } from './common.js';

const day = z.iso.date({ message: 'enter a date as year-month-day, e.g. 2026-12-04' });

/** Filters of the audit log: who (login), what (action code), about which record, between two days (UTC, inclusive). */
export const auditQuerySchema = pageRequestSchema(50)
  .extend({
    entityType: z.string().trim().max(50).optional(),
    entityId: z.string().trim().max(50).optional(),
    action: z.string().trim().max(80).optional(),
    actor: z.string().trim().max(100).transform((s) => s.replace(/^@/, '')).optional(),
    from: day.optional(),
    to: day.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: 'the first day must not be after the last day', path: ['to'] });
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: timestamp,
  actorId: z.number().int().nullable(),
  actorLogin: z.string().nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;
export const auditPageSchema = pageSchema(auditEntrySchema);
export type AuditPage = z.infer<typeof auditPageSchema>;

export const MAIL_STATUSES = ['queued', 'sent', 'retrying', 'failed'] as const;

export const mailLogQuerySchema = pageRequestSchema().extend({
  status: z.enum(MAIL_STATUSES).optional(),
  order: z.enum(['asc', 'desc']).default('desc'),
});
export const mailboxQuerySchema = pageRequestSchema().extend({ to: z.string().trim().max(200).optional() });

export const mailLogEntrySchema = z.object({
  id: z.number().int(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  status: z.enum(MAIL_STATUSES),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: timestamp,
  sentAt: timestamp.nullable(),
  /** Whether an admin may send it again (failed, or never handed to the job queue). */
  resendable: z.boolean(),
});
export type MailLogEntry = z.infer<typeof mailLogEntrySchema>;
export const mailLogPageSchema = pageSchema(mailLogEntrySchema);
export type MailLogPage = z.infer<typeof mailLogPageSchema>;

/** A message as the configured mail catcher (MAILBOX_URL) lists it. */
export const mailboxMessageSchema = z.object({
  id: z.number().int(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  receivedAt: timestamp,
});
export type MailboxMessage = z.infer<typeof mailboxMessageSchema>;
export const mailboxPageSchema = pageSchema(mailboxMessageSchema);
export type MailboxPage = z.infer<typeof mailboxPageSchema>;

const partSchema = z.object({ state: z.enum(['up', 'down', 'not configured']), ms: z.number().optional(), message: z.string().optional() });
export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded', 'unavailable']),
  parts: z.object({ database: partSchema, search: partSchema, mail: partSchema, oauth: partSchema, doi: partSchema }),
});
export type Health = z.infer<typeof healthSchema>;
