import type { TestApp } from './test-app.js';
import { REFERENCES_INDEX } from '../../server/adapters/search.js';

/** Empties the references index (the fake keeps it in memory across test files). */
export async function clearSearch(t: TestApp): Promise<void> {
  await t.ctx.search?.deleteAll(REFERENCES_INDEX);
}

export const bib = (key: string, fields: Record<string, string>) =>
  `@article{${key},\n${Object.entries(fields)
    .map(([k, v]) => `  ${k} = {${v}}`)
    .join(',\n')}\n}\n`;

/** Three good entries and one that never closes its title brace. */
export const THREE_GOOD_ONE_BAD = [
  bib('varga2017', { title: 'Looming discs feel longer', author: 'Varga, Ilse and Noor, Tamsin', year: '2017', journal: 'Journal of Invented Psychophysics', doi: '10.5555/test.bib.1' }),
  bib('okafor2018', { title: 'Filled intervals in auditory bisection', author: 'Okafor, Ada', year: '2018', journal: 'Imaginary Review of Timing' }),
  '@article{broken2019,\n  title = {An entry whose title never closes,\n  author = {Nobody, N.},\n  year = {2019}\n',
  bib('haddad2019', { title: 'Audiovisual simultaneity in older adults', author: 'Haddad, Rami', year: '2019', journal: 'Fictional Journal of Ageing', doi: 'https://doi.org/10.5555/TEST.BIB.3' }),
].join('\n');

/** Waits until `check` returns a value (not undefined), polling. */
export async function eventually<T>(check: () => Promise<T | undefined>, timeoutMs = 15_000, everyMs = 150): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
