import type { AppContext } from './context.js';
import { registerFollowWorkers } from './services/following.js';
import { registerMailWorkers } from './services/mail-delivery.js';
import { registerReferenceWorkers } from './services/reference-workers.js';
import { registerTrialWorkers } from './services/trials.js';

/** Starts this process's background work: the job queue and each feature's workers (add a feature's here). */
export async function startWorkers(ctx: AppContext): Promise<void> {
  if (!ctx.jobs) return;
  await ctx.jobs.start();
  const deps = { ...ctx, jobs: ctx.jobs };
  await registerReferenceWorkers(deps);
  await registerMailWorkers(deps);
  await registerTrialWorkers(deps);
  await registerFollowWorkers(deps);
}
