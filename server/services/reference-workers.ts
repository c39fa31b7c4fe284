import type { JobQueue } from '../adapters/jobs.js';
import type { Deps } from './deps.js';
import { DOI_QUEUE, IMPORT_JOB_QUEUE, resolveDoiJob, runImportJob } from './imports.js';
import { ensureReferenceIndex } from './search.js';

/** Background work of the references feature: DOI resolution (two workers), large imports (one) and filling the index at start. */
export async function registerReferenceWorkers(deps: Pick<Deps, 'db' | 'search' | 'doi'> & { jobs: JobQueue }): Promise<void> {
  const handler = (data: { batchId: number; entries: number[] }, job: { retryCount: number }) => resolveDoiJob(deps, data, job.retryCount);
  await deps.jobs.work(DOI_QUEUE, handler);
  await deps.jobs.work(DOI_QUEUE, handler);
  await deps.jobs.work<{ batchId: number }>(IMPORT_JOB_QUEUE, (data) => runImportJob(deps, data.batchId));
  // A fresh or restarted search server knows nothing: fill it without holding up the start.
  void ensureReferenceIndex(deps);
}
