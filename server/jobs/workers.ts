import type { AppContext } from '../context.js';

/** Each feature that has background work adds its worker registration here. */
export async function registerWorkers(_ctx: AppContext): Promise<void> {
  // (features add: await registerXWorkers(ctx);)
}
