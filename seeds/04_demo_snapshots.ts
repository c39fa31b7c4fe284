import type { Knex } from 'knex';
import { createSnapshot } from '../server/services/snapshots.js';
import { synthesisRequestSchema } from '../shared/schemas/synthesis.js';

// One demo snapshot over the invented demo registry (seeds 02 and 03), saved by the demo reviewer.
export const DEMO_SNAPSHOT_TITLE = 'Demo: luminance and perceived duration (raw-score g, DerSimonian–Laird)';

export async function seed(knex: Knex): Promise<void> {
  if (await knex('snapshots').where({ title: DEMO_SNAPSHOT_TITLE }).first('id')) return;
  const reviewer = await knex('users').where({ login: 'reviewer' }).first('id');
  if (!reviewer) return;
  const request = synthesisRequestSchema.parse({ filters: { manipulation: 'luminance', outcome: 'duration_distortion' }, smdFamily: 'raw_score' });
  try {
    await createSnapshot(knex, reviewer.id, request, DEMO_SNAPSHOT_TITLE, process.env.APP_ORIGIN ?? 'http://127.0.0.1:3000');
  } catch (err) {
    // no settled luminance effects in this database: nothing to freeze
    if ((err as { status?: number }).status !== 422) throw err;
  }
}
