import type { Knex } from 'knex';

// Effects coded before parameters were recorded take their outcome kind's usual parameter in its usual unit —
// the same rule the server applies to an effect saved without one (shared/vocabulary/parameters.ts, effectQuantity).
// Only these two columns change: values, versions and timestamps stay.
const USUAL: Record<string, [string, string]> = {
  duration_distortion: ['duration_ratio', 'ratio'],
  simultaneity_window: ['window_width', 'ms'],
  temporal_order: ['pss', 'ms'],
  recalibration_shift: ['recalibration_shift', 'ms'],
  postdiction_window: ['window_width', 'ms'],
  positional_lag: ['lag', 'ms'],
};

export async function up(knex: Knex): Promise<void> {
  // knex runs each migration in its own transaction
  for (const [outcome, [parameter, unit]] of Object.entries(USUAL)) await knex('effects').where({ outcome }).whereNull('parameter').update({ parameter, unit });
}

export async function down(knex: Knex): Promise<void> {
  await knex('effects').update({ parameter: null, unit: null });
}
