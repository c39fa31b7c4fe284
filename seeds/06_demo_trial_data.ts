import type { Knex } from 'knex';
import type { Sheet } from '../shared/schemas/extraction.js';
import { claimReference, saveDraft } from '../server/services/coding.js';
import { createReference } from '../server/services/references.js';
import { includeThroughFullText } from '../server/services/screening.js';
import { runFitJob, startFits, uploadTrialSet } from '../server/services/trials.js';
import { countsCsv, inventTrials, ORDER_SOAS, SJ_SOAS, trialsCsv } from '../tests/support/trials.js';

// An invented lab's shared trial data (audiovisual order and simultaneity judgements before and after exposure
// to a fixed audiovisual lag), on coder1's draft sheet with its fits done and one effect coded from them.

const DOI = '10.5555/chrono.demo.trials.001';
const RESAMPLES = 300;

export async function seed(knex: Knex): Promise<void> {
  const curator = (await knex('users').where({ login: 'curator' }).first('id'))?.id as number | undefined;
  const coder = (await knex('users').where({ login: 'coder1' }).first('id'))?.id as number | undefined;
  if (!curator || !coder) return;
  const ref = await createReference(
    knex,
    {
      type: 'article-journal', title: 'Audiovisual order and simultaneity judgements before and after exposure to a fixed lag', DOI,
      'container-title': 'Invented Perception Letters', issued: { 'date-parts': [[2024]] }, volume: '12', page: '201-219',
      author: [{ family: 'Brightwater', given: 'Ilse' }, { family: 'Okonkwo-Lind', given: 'Tamsin' }, { family: 'Varga', given: 'Dénes' }],
    } as any,
    { source: 'seed', createdBy: curator },
  );
  if (!ref.created) return;
  await includeThroughFullText(knex, ref.id, { id: curator, roles: ['curator'] });
  const actor = { id: coder, roles: ['contributor' as const] };
  const sheet = await claimReference(knex, coder, ref.id);
  const order = inventTrials({ task: 'order', participants: 12, conditions: { baseline: 0, after_lag: 35 }, levels: ORDER_SOAS, trialsPerLevel: 20, seed: 61001 });
  const window = inventTrials({ task: 'simultaneity', participants: 12, conditions: { baseline: 0, after_lag: 30 }, levels: SJ_SOAS, trialsPerLevel: 16, seed: 61002 });
  const sets = [
    await uploadTrialSet(knex, actor, sheet.id, { name: 'brightwater-order-trials.csv', text: trialsCsv(order) }, { label: 'Experiment 1, order task', task: 'order', model: 'cumulative_gaussian', modality: 'audiovisual' }),
    await uploadTrialSet(knex, actor, sheet.id, { name: 'brightwater-simultaneity-counts.csv', text: countsCsv(window) }, { label: 'Experiment 2, simultaneity task', task: 'simultaneity', model: 'cumulative_gaussian', modality: 'audiovisual' }),
  ];
  for (const s of sets) {
    await startFits({ db: knex, jobs: null }, actor, s.id, { resamples: RESAMPLES });
    await runFitJob(knex, { setId: s.id, resamples: RESAMPLES });
  }
  const coded: Sheet = {
    notes: '',
    studies: [
      {
        label: 'Experiment 1, order task', design: 'within', n1: 12, population: 'healthy_adults', modality: 'audiovisual', task: 'temporal_order_judgement',
        effects: [
          {
            label: 'after lag vs baseline: PSS', outcome: 'temporal_order', manipulation: 'delay_adaptation', form: 'mean_diff', reported: { mean_diff: 0, sd_diff: 1, n: 12 },
            locator: 'trial data: Experiment 1, order task',
            derivation: { source: 'trial_data', trialSetId: sets[0].id, parameter: 'pse', conditionA: 'after_lag', conditionB: 'baseline', measure: 'mean_diff' },
          },
        ],
      },
    ],
  } as Sheet;
  const x = await knex('extractions').where({ id: sheet.id }).first('version');
  await saveDraft(knex, actor, sheet.id, { version: x.version, sheet: coded });
}
