import type { AppContext } from '../context.js';
import { registerReferenceWorkers } from '../services/reference-workers.js';

/** Each feature that has background work adds its worker registration here. */
export async function registerWorkers(ctx: AppContext): Promise<void> {
  await registerReferenceWorkers(ctx);
  // (features add: await registerXWorkers(ctx);)
}
