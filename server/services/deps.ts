// What services may be handed: each service function names the few it needs (Pick<Deps, ...>), never the whole
// app context. The composition root (server/context.ts) builds one object that has them all.
import type { Knex } from 'knex';
import type { DoiResolver } from '../adapters/citations.js';
import type { JobQueue } from '../adapters/jobs.js';
import type { Mailer } from '../adapters/mail.js';
import type { SearchIndex } from '../adapters/search.js';

export interface Deps {
  db: Knex;
  /** the search index; null when MEILI_HOST is not configured */
  search: SearchIndex | null;
  /** the job queue; null when this process runs no background work (JOBS_ENABLED=false) */
  jobs: JobQueue | null;
  /** outgoing mail; null when SMTP is not configured */
  mailer: Mailer | null;
  doi: DoiResolver;
  /** where this app is reached, for links in mails and snapshot URLs */
  appOrigin: string;
}

export type DbDeps = Pick<Deps, 'db'>;
export type SearchDeps = Pick<Deps, 'db' | 'search'>;
/** Sending the workflow's mails: the log, the queue, and the origin the links point to. */
export type MailingDeps = Pick<Deps, 'db' | 'jobs' | 'appOrigin'>;
