import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';
import { decideByKeys } from './screening-keys.js';

const stamp = Date.now().toString(36);
const SCRIPT_TITLE = `<script>window.__injected = 1</script> Looming ${stamp} and the stretching of seconds`;
const BIBTEX = [
  `@article{xss${stamp}, title = {${SCRIPT_TITLE}}, author = {Probe, Ida}, year = {2021}, journal = {Journal of Invented Psychophysics}, doi = {10.5555/e2e.${stamp}.1}}`,
  `@article{cut${stamp}, title = {A cut-off entry, author = {Cut, Off}`,
  `@article{ok${stamp}, title = {Chronostasis ${stamp} after saccades}, author = {Probe, Ida and Other, Ola}, year = {2020}, doi = {10.5555/e2e.${stamp}.2}}`,
].join('\n\n');

const entry = (key: string, title: string, doi: string) => `@article{${key}${stamp}, title = {${title} ${stamp}}, author = {Words, Wim}, year = {2022}, doi = {${doi}}}`;

export const specs: Spec[] = [
  {
    name: 'says what is wrong with an import in words: no entries, an unclosed entry; a DOI already here is a duplicate and stays out of the batch queue',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      await page.getByRole('banner').getByRole('link', { name: 'Import' }).click();
      await page.getByLabel('Entries').fill('just some words, not a bibliography');
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByText(/no entries found: the text holds no BibTeX entry/).waitFor();

      await page.getByLabel('Entries').fill(entry('first', 'Filled intervals', `10.5555/e2e.${stamp}.w1`));
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByText(/✓ Finished: 1 entr/).waitFor();

      await page.getByRole('banner').getByRole('link', { name: 'Import' }).click();
      const second = [
        entry('again', 'Filled intervals', `10.5555/E2E.${stamp}.W1`),
        entry('fresh', 'Empty intervals', `10.5555/e2e.${stamp}.w2`),
        `@article{open${stamp}, title = {Never closed, author = {Open, Ola}, year = {2022}`,
      ].join('\n');
      await page.getByLabel('Entries').fill(second);
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByText('✓ Finished: 3 entries read.').waitFor();
      assert.equal(await page.locator('[data-count="imported"]').innerText(), '1');
      assert.equal(await page.locator('[data-count="duplicate"]').innerText(), '1');
      assert.equal(await page.locator('[data-count="rejected"]').innerText(), '1');
      await page.getByText(`Entry 3 is not closed: a \`}\` is missing (key "open${stamp}", the entry starts on line 3)`).waitFor();
      await page.getByText(/duplicate of reference #\d+ \(same DOI/).waitFor();

      // the batch's screening queue holds only the reference it created
      const batchId = new URL(page.url()).pathname.split('/').pop();
      await page.goto(appUrl(`/screening?batch=${batchId}`));
      await page.getByText('1 record waiting from batch').waitFor();
      await page.getByRole('article', { name: 'Record being read' }).getByRole('heading', { name: `Empty intervals ${stamp}` }).waitFor();
      await signOut(page);
    },
  },
  {
    name: 'imports a BibTeX paste, reports the broken entry, shows a <script> title as text, screens from the keyboard and finds it by search',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      await page.getByRole('banner').getByRole('link', { name: 'Import' }).click();
      await page.getByLabel('Entries').fill(BIBTEX);
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByRole('heading', { name: 'Import report' }).waitFor();
      await page.getByText('✓ Finished: 3 entries read.').waitFor();
      assert.equal(await page.locator('[data-count="imported"]').innerText(), '2');
      assert.equal(await page.locator('[data-count="rejected"]').innerText(), '1');
      await page.getByText(`Entry 2 is not closed: a \`}\` is missing (key "cut${stamp}", the entry starts on line 3)`).waitFor();

      // The title is text in the report's reference page, never markup.
      const row = page.getByRole('row', { name: new RegExp(`xss${stamp}`) });
      await row.getByRole('link').click();
      await page.getByRole('heading', { level: 1, name: SCRIPT_TITLE }).waitFor();
      assert.equal(await page.evaluate(() => (window as unknown as { __injected?: number }).__injected), undefined);
      assert.equal(await page.locator('main script').count(), 0);

      // Screening from the keyboard: the queue shows the oldest first, so narrow it to this batch.
      const batchLink = page.getByRole('link', { name: /^batch \d+$/ });
      const batchId = (await batchLink.innerText()).replace('batch ', '');
      await page.goto(appUrl(`/screening?batch=${batchId}`));
      await page.getByText('2 records waiting from batch').waitFor();
      const reader = page.getByRole('article', { name: 'Record being read' });
      const first = await reader.getByRole('heading', { level: 2 }).innerText();
      await decideByKeys(page, 'inc');
      await page.getByText(`Last: ✓ Included on title and abstract: ${first}`).waitFor();
      await page.getByText('1 record waiting from batch').waitFor();
      await decideByKeys(page, 'not ab');
      await page.getByText(/Last: ✕ Excluded \(Not about time perception\)/).waitFor();
      await page.getByText('0 records waiting from batch').waitFor();
      // Taking the exclusion back returns the reference to the queue; deciding again empties it.
      await page.getByRole('button', { name: '↶ Take back (U)' }).click();
      await page.getByText(/↶ Taken back: #\d+ is waiting again/).waitFor();
      await page.getByText('1 record waiting from batch').waitFor();
      await decideByKeys(page, 'natp');
      await page.getByText(/Last: ✕ Excluded \(Not about time perception\)/).waitFor();
      await page.getByText('0 records waiting from batch').waitFor();
      await page.getByText('Nothing is waiting from this batch.').waitFor();

      // Search: by a title word, and by author with a status filter.
      await page.getByRole('banner').getByRole('link', { name: 'Search' }).click();
      await page.getByLabel('Words in title, authors, journal or DOI').fill(`chronostasis ${stamp}`);
      await page.getByText(/^1 reference for/).waitFor();
      await page.getByRole('link', { name: `Chronostasis ${stamp} after saccades` }).waitFor();
      await page.getByLabel('Words in title, authors, journal or DOI').fill('probe');
      await page.getByText(/^2 references for “probe”/).waitFor();
      await page.getByRole('radio', { name: /awaiting full text/ }).check();
      await page.getByText(/^1 reference for “probe”/).waitFor();
      await signOut(page);
    },
  },
  {
    name: 'a curator merges the seeded likely duplicate and the merged record points to the one kept',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await page.getByRole('banner').getByRole('link', { name: 'Duplicates' }).click();
      const pair = page.getByRole('region', { name: /Candidate pair/ }).filter({ hasText: 'Brightness and perceived duration of brief flashes' }).first();
      await pair.waitFor();
      const keep = pair.getByRole('button', { name: /^Keep #\d+, merge #\d+ into it$/ }).first();
      const label = await keep.innerText();
      const [, kept, merged] = label.match(/Keep #(\d+), merge #(\d+)/)!;
      await keep.click();
      await page.getByText(`✓ Merged #${merged} into #${kept}`).waitFor();
      await page.goto(appUrl(`/references/${merged}`));
      await page.getByText('This record was merged into').waitFor();
      await page.getByRole('link', { name: `reference #${kept}` }).click();
      await page.waitForURL(new RegExp(`/references/${kept}$`));
      // A contributor cannot reach the duplicates screen.
      await signOut(page);
      await signInThroughPage(page, 'coder2');
      assert.equal(await page.getByRole('banner').getByRole('link', { name: 'Duplicates' }).count(), 0);
      await page.goto(appUrl('/duplicates'));
      await page.getByText('This page needs the Curator role.').waitFor();
    },
  },
  {
    name: 'a DOI list resolves in the background and the report shows what happened to each DOI; a signed-out reader can open a reference',
    async run(page) {
      await signInThroughPage(page, 'coder2');
      await page.goto(appUrl('/import'));
      await page.getByRole('radio', { name: 'DOI list' }).check();
      await page.getByLabel('DOIs').fill(`10.5555/chrono.2019.007\nhttps://doi.org/10.5555/chrono.2020.021\n10.5555/unknown.{${stamp}}\nnot-a-doi`);
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      await page.getByRole('heading', { name: 'Import report' }).waitFor();
      await page.getByText('✓ Finished: 4 entries read.').waitFor({ timeout: 30_000 });
      assert.equal(await page.locator('[data-count="rejected"]').innerText(), '2');
      await page.getByText(`10.5555/unknown.{${stamp}}: no such DOI at the resolver (404)`).waitFor();
      await page.getByText('"not-a-doi" is not a DOI').waitFor();
      const link = page.getByRole('row', { name: /chrono\.2019\.007/ }).getByRole('link');
      const href = await link.getAttribute('href');
      // Editing: a wrong year is named beside its field; a good edit shows at once.
      await page.goto(appUrl(href!));
      await page.getByRole('button', { name: /^Edit title, authors/ }).click();
      await page.getByLabel('Year').fill('19');
      await page.getByRole('button', { name: 'Save changes' }).click();
      await page.getByText('✕ a year has four digits').waitFor();
      await page.getByLabel('Year').fill('2019');
      await page.getByLabel('Title').fill('Audiovisual simultaneity windows in older adults (corrected)');
      await page.getByRole('button', { name: 'Save changes' }).click();
      await page.getByRole('heading', { level: 1, name: 'Audiovisual simultaneity windows in older adults (corrected)' }).waitFor();
      await signOut(page);
      await page.goto(appUrl(href!));
      await page.getByRole('heading', { level: 1, name: 'Audiovisual simultaneity windows in older adults (corrected)' }).waitFor();
      await page.getByText('No decision yet.').waitFor();
      assert.equal(await page.getByRole('button', { name: 'Record decision' }).count(), 0);
    },
  },
  {
    name: 'search answers from the database, and says so, while a stale index is rebuilt',
    async run(page) {
      // The index is made to hold another build than the database expects, as after a restore from an old copy.
      const marker = await fetch(`${process.env.MEILI_HOST}/indexes/chronometa_meta/documents?primaryKey=id`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${process.env.MEILI_API_KEY}` },
        body: JSON.stringify([{ id: 'references', build: `restored-${stamp}` }]),
      });
      assert.equal(marker.status, 202);
      await page.goto(appUrl('/search?q=looming'));
      await page.getByRole('note').getByText(/Simpler search for now:.*being rebuilt/).waitFor();
      await page.getByText(/^\d+ references? for “looming”/).waitFor();
      assert.ok((await page.getByRole('listitem').filter({ has: page.getByRole('link') }).count()) > 0);
      // Once rebuilt, the index answers again and the note is gone.
      for (let i = 0; ; i++) {
        await page.reload();
        await page.getByText(/^\d+ references? for “looming”/).waitFor();
        if ((await page.getByText('Simpler search for now').count()) === 0) break;
        assert.ok(i < 20, 'the index was not rebuilt');
        await page.waitForTimeout(500);
      }
    },
  },
];
