import type { AppContext } from '../context.js';
import { registerReferenceWorkers } from '../services/reference-workers.js';
import { registerMailWorkers } from '../mail/worker.js';

/** Each feature that has background work adds its worker registration here. */
export async function registerWorkers(ctx: AppContext): Promise<void> {
  await registerReferenceWorkers(ctx);
  await registerMailWorkers(ctx);
  // (features add: await registerXWorkers(ctx);)
}
