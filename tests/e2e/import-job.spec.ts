import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { signInThroughPage, signOut } from './browser.js';

const stamp = Date.now().toString(36);
const COUNT = 3000;
const BAD = 1234;
const entry = (i: number) =>
  i === BAD
    ? `@article{nameless${stamp}, author = {Bulk, Bea}, year = {2023}}`
    : `@article{bulk${stamp}n${i}, title = {Bulk ${stamp} study ${i} of interval timing}, author = {Bulk, Bea and Load, Lars}, year = {2023}, doi = {10.5555/bulk.${stamp}.${i}}}`;

export const specs: Spec[] = [
  {
    name: 'a curator uploads 3,000 BibTeX entries, sees the import queued and its progress, then the report with the bad entry named',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await page.getByRole('banner').getByRole('link', { name: 'Import' }).click();
      const text = Array.from({ length: COUNT }, (_, i) => entry(i + 1)).join('\n');
      await page.getByLabel(/upload a file/).setInputFiles({ name: `bulk-${stamp}.bib`, mimeType: 'application/x-bibtex', buffer: Buffer.from(text) });
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByRole('heading', { name: 'Import report' }).waitFor();

      // while the job works: its state in words and a progress bar
      await page.getByRole('status').filter({ hasText: /^… (Queued: 3000 entries wait|Importing: \d+ of 3000 entries read)/ }).waitFor();
      await page.getByRole('progressbar', { name: 'Import progress' }).waitFor();

      await page.getByText(`✓ Finished: ${COUNT} entries read.`).waitFor({ timeout: 180_000 });
      assert.equal(await page.locator('[data-count="imported"]').innerText(), String(COUNT - 1));
      assert.equal(await page.locator('[data-count="rejected"]').innerText(), '1');
      assert.equal(await page.getByRole('progressbar').count(), 0);
      await page.getByRole('row', { name: new RegExp(`bulk${stamp}n1\\b`) }).waitFor();

      await page.getByRole('combobox').selectOption('rejected');
      await page.getByText(new RegExp(`^Entry ${BAD} \\(key "nameless${stamp}"\\), line \\d+: field title is missing$`)).waitFor();
      await page.getByRole('link', { name: `screen the ${COUNT - 1} new references` }).waitFor();

      // the history lists the batch as done
      await page.getByRole('link', { name: '← Import more' }).click();
      await page.getByRole('row', { name: new RegExp(`bulk-${stamp}\\.bib.*✓ done`) }).waitFor();
      await signOut(page);
    },
  },
];
