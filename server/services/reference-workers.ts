import type { AppContext } from '../context.js';
import { DOI_QUEUE, resolveDoiEntries } from './imports.js';
import { ensureReferenceIndex } from './search.js';

/** Background work of the references feature: DOI resolution (two workers) and filling the index at start. */
export async function registerReferenceWorkers(ctx: AppContext): Promise<void> {
  const handler = (data: { batchId: number; entries: number[] }) => resolveDoiEntries(ctx, data);
  await ctx.jobs.work(DOI_QUEUE, handler);
  await ctx.jobs.work(DOI_QUEUE, handler);
  // A fresh or restarted search server knows nothing: fill it without holding up the start.
  void ensureReferenceIndex(ctx);
}
