import PgBoss from 'pg-boss';

export type JobHandler<T> = (data: T, job: { id: string; retryCount: number }) => Promise<void>;

/** Background work in PostgreSQL (pg-boss): DOI resolution, mail, re-indexing. One per process, when JOBS_ENABLED. */
export class JobQueue {
  private readonly boss: PgBoss;
  private readonly queues = new Set<string>();
  private started = false;

  constructor(connectionString: string) {
    this.boss = new PgBoss({ connectionString, schema: 'pgboss', max: 4 });
    this.boss.on('error', (err) => console.error('[jobs]', err.message));
  }

  async start(): Promise<void> {
    if (this.started) return;
    await this.boss.start();
    this.started = true;
  }

  private async ensureQueue(name: string) {
    if (this.queues.has(name)) return;
    await this.boss.createQueue(name);
    this.queues.add(name);
  }

  async send<T extends object>(name: string, data: T, options: PgBoss.SendOptions = {}): Promise<string | null> {
    await this.ensureQueue(name);
    return this.boss.send(name, data, { retryLimit: 3, retryDelay: 2, retryBackoff: true, ...options });
  }

  async work<T>(name: string, handler: JobHandler<T>, options: PgBoss.WorkOptions = {}): Promise<void> {
    await this.ensureQueue(name);
    // With metadata, each job says how many times it has been retried (handlers use it to tell the last attempt).
    await this.boss.work<T>(name, { pollingIntervalSeconds: 0.5, batchSize: 1, ...options, includeMetadata: true }, async (jobs) => {
      for (const job of jobs) await handler(job.data, { id: job.id, retryCount: job.retryCount });
    });
  }

  async getJob(name: string, id: string) {
    return this.boss.getJobById(name, id, { includeArchive: true });
  }

  async stop(): Promise<void> {
    if (!this.started) return;
    this.started = false;
    await this.boss.stop({ graceful: true, wait: true, timeout: 5000 });
  }
}
