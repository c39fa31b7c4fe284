import type { Knex } from 'knex';
import { importText } from '../server/services/imports.js';

export const DEMO_IMPORT_LABEL = 'demo-lab-export.bib (seed)';

const entry = (key: string, fields: Record<string, string>) =>
  `@article{${key},\n${Object.entries(fields)
    .map(([k, v]) => `  ${k} = {${v}}`)
    .join(',\n')}\n}`;

// Invented papers (authors, journals and DOIs under the test prefix 10.5555 are made up).
export const DEMO_BIBTEX = [
  entry('lindqvist2023', { title: 'Brightness and perceived duration of brief flashes', author: 'Lindqvist, Bo and Mbeki, Lerato', year: '2023', journal: 'Journal of Invented Psychophysics', doi: '10.5555/demo.2023.101', abstract: 'Brighter flashes were judged longer in a two-interval comparison.' }),
  entry('serrano2022', { title: 'Vibrotactile intervals and the filled-duration illusion', author: 'Serrano, Marta', year: '2022', journal: 'Invented Haptics Letters', doi: '10.5555/demo.2022.102' }),
  entry('adeyemi2024', { title: 'Temporal order judgements in children aged 8 to 11', author: 'Adeyemi, Kemi and Ferreira, Nuno', year: '2024', journal: 'Fictional Journal of Development and Timing', doi: '10.5555/demo.2024.103' }),
  entry('castellanos2021', { title: 'Motion speed and positional lag of a moving bar', author: 'Castellanos, Iker', year: '2021', journal: 'Imaginary Review of Timing', doi: '10.5555/demo.2021.104' }),
  entry('whitcombe2020', { title: 'A review of audiovisual simultaneity windows', author: 'Whitcombe, Jo', year: '2020', journal: 'Invented Annual Reviews', doi: '10.5555/demo.2020.105' }),
  entry('takahara2019', { title: 'Postdictive shifts in the flash-lag display', author: 'Takahara, Emi and Haddad, Rami', year: '2019', journal: 'Journal of Invented Psychophysics', doi: '10.5555/demo.2019.106' }),
  // The same paper as lindqvist2023 as another lab exported it (no DOI): a likely duplicate for curators.
  entry('lindqvist2023b', { title: 'Brightness and Perceived Duration of Brief Flashes', author: 'Lindqvist, B.', year: '2023' }),
  // Left unclosed on purpose: the batch report shows a rejected entry.
  '@article{broken2018,\n  title = {An export cut off in the middle,\n  author = {Unknown, A.}',
  entry('okafor2024', { title: 'Repetition suppression and the oddball duration effect', author: 'Okafor, Ada', year: '2024', journal: 'Fictional Journal of Cognitive Timing', doi: '10.5555/demo.2024.107' }),
].join('\n\n');

/** One demo import batch with unscreened references; skipped when it already exists (seeds re-run on every start). */
export async function seed(knex: Knex): Promise<void> {
  const exists = await knex('import_batches').where({ label: DEMO_IMPORT_LABEL }).first('id');
  if (exists) return;
  const coder = await knex('users').where({ login: 'coder1' }).first('id');
  await importText({ db: knex, search: null }, { format: 'bibtex', text: DEMO_BIBTEX, label: DEMO_IMPORT_LABEL, userId: coder?.id ?? null });
}
