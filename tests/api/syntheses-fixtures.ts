import type { Knex } from 'knex';
import { createSettledRecord } from '../../server/services/settlement.js';
import { ensureVocabulary } from '../../server/services/manipulations.js';

export interface InventedStudy {
  /** Hedges' g inputs: two groups */
  mean1: number;
  mean2: number;
  sd: number;
  n: number;
  standardMs?: number;
  modality?: 'visual' | 'auditory';
  /** a second effect in the same study (dependence handling) */
  second?: { mean1: number; mean2: number };
  form?: 'smd' | 'log_ratio' | 'smd_paired';
  /** what was reported, instead of the two groups' means and SDs (e.g. a paired t) */
  reported?: Record<string, number>;
  /** what was measured and its unit (blank: the outcome kind's usual ones) */
  parameter?: string;
  unit?: string;
  /** the study's task (default reproduction) */
  task?: string;
}

let counter = 0;

/** An invented reference (DOI under the test prefix 10.5555) with one settled record of the given studies. */
export async function settleInventedReference(db: Knex, manipulation: string, year: number, studies: InventedStudy[], outcome = 'duration_distortion') {
  await ensureVocabulary(db);
  counter += 1;
  const author = `Quillfeather${counter}`;
  const title = `Invented study ${counter} of ${manipulation} and subjective duration`;
  const doi = `10.5555/chronometa.synth.${counter}.${Date.now()}`;
  const csl = { id: `inv${counter}`, type: 'article-journal', title, author: [{ family: author, given: 'Ada' }], issued: { 'date-parts': [[year]] }, DOI: doi, 'container-title': 'Journal of Invented Timing' };
  const [ref] = await db('refs')
    .insert({ csl: JSON.stringify(csl), doi, title, year, first_author: author, title_key: title.toLowerCase(), screening_status: 'included' })
    .returning('id');
  const effect = (m1: number, m2: number, s: InventedStudy) => ({
    outcome,
    manipulation,
    form: s.form ?? 'smd',
    reported: s.reported ?? { mean1: m1, sd1: s.sd, n1: s.n, mean2: m2, sd2: s.sd, n2: s.n },
    ...(s.parameter ? { parameter: s.parameter } : {}),
    ...(s.unit ? { unit: s.unit } : {}),
  });
  const sheet = {
    studies: studies.map((s, i) => ({
      label: `Experiment ${i + 1}`,
      design: 'between',
      n1: s.n,
      n2: s.n,
      population: 'healthy_adults',
      modality: s.modality ?? 'visual',
      task: s.task ?? 'reproduction',
      standardMs: s.standardMs ?? 600,
      effects: [effect(s.mean1, s.mean2, s), ...(s.second ? [effect(s.second.mean1, s.second.mean2, s)] : [])],
    })),
  };
  const settled = await db.transaction((trx) => createSettledRecord(trx, { referenceId: ref.id, sheet: sheet as never }));
  return { referenceId: ref.id as number, ...settled, sheet };
}

/** Twelve invented references of one manipulation, one with two effects in one study. */
export async function settleInventedSet(db: Knex, manipulation = 'luminance') {
  const out = [];
  for (let i = 0; i < 12; i++) {
    out.push(
      await settleInventedReference(db, manipulation, 2005 + i, [
        { mean1: 640 + ((i * 37) % 90), mean2: 600, sd: 80 + (i % 4) * 10, n: 12 + (i % 5) * 4, standardMs: 400 + i * 50, modality: i % 3 ? 'visual' : 'auditory', second: i === 4 ? { mean1: 660, mean2: 610 } : undefined },
      ]),
    );
  }
  return out;
}
