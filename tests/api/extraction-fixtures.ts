import type { Knex } from 'knex';
import type { SheetInput } from '../../shared/schemas/extraction.js';
import { ensureVocabulary } from '../../server/services/manipulations.js';

let counter = 0;

/** An included reference inserted directly (tests of extraction need one, not the import pipeline). */
export async function insertReference(db: Knex, opts: { firstAuthor?: string; year?: number; title?: string } = {}): Promise<number> {
  counter += 1;
  const title = opts.title ?? `Invented study of subjective duration ${counter}`;
  const [row] = await db('refs')
    .insert({
      csl: JSON.stringify({ type: 'article-journal', title, author: [{ family: opts.firstAuthor ?? 'Vantongeren', given: 'A.' }], issued: { 'date-parts': [[opts.year ?? 2020]] } }),
      doi: `10.5555/chrono.test.${Date.now()}.${counter}`,
      title,
      year: opts.year ?? 2020,
      first_author: opts.firstAuthor ?? 'Vantongeren',
      title_key: title.toLowerCase().replace(/[^a-z0-9]+/g, ' ').trim(),
      source: 'manual',
      screening_status: 'included',
    })
    .returning('id');
  await ensureVocabulary(db);
  return row.id;
}

/** A within-subject study with one luminance effect from means and SDs. */
export function luminanceSheet(overrides: { mean1?: number; n?: number; design?: 'within' | 'between' } = {}): SheetInput {
  return {
    notes: '',
    studies: [
      {
        label: 'Experiment 1',
        design: overrides.design ?? 'between',
        n1: overrides.n ?? 20,
        n2: 20,
        population: 'healthy_adults',
        modality: 'visual',
        task: 'reproduction',
        standardMs: 600,
        effects: [
          {
            label: 'bright vs dim',
            outcome: 'duration_distortion',
            manipulation: 'luminance',
            form: 'smd',
            reported: { mean1: overrides.mean1 ?? 650, sd1: 80, n1: overrides.n ?? 20, mean2: 610, sd2: 75, n2: 20 },
            page: '412',
            locator: 'Table 2',
            quote: 'Bright discs were reproduced as longer.',
          },
        ],
      },
    ],
  };
}
