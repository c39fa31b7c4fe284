import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { signInThroughPage, signOut } from './browser.js';
import { startStandIn, stopStandIn } from './stand-ins.js';

// The resolver stand-in answers any 10.5555/gen.<n> with a generated record, so this DOI is new on every run.
const n = Date.now();
const DOI = `10.5555/gen.${n}`;

export const specs: Spec[] = [
  {
    name: 'a DOI import while the resolver is unreachable says so in words, retries by itself and completes once the resolver is back',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      await stopStandIn('doi');
      let back = false;
      try {
        await page.getByRole('banner').getByRole('link', { name: 'Import' }).click();
        await page.getByRole('radio', { name: 'DOI list' }).check();
        await page.getByLabel('DOIs').fill(DOI);
        await page.getByRole('button', { name: 'Import', exact: true }).click();
        await page.getByRole('heading', { name: 'Import report' }).waitFor();
        const note = page.getByRole('note').filter({ hasText: 'DOI resolver unreachable' });
        await note.getByText(/1 DOI waits: the resolver could not be reached, so the look-up will retry by itself/).waitFor();
        await page.getByText(/… Looking up DOIs: 0 of 1 done/).waitFor();
        const row = page.getByRole('row', { name: new RegExp(DOI.replace(/\./g, '\\.')) });
        await row.getByText(`${DOI}: resolver unreachable, will retry`, { exact: false }).waitFor();
        await row.getByText('Waiting').waitFor();

        await startStandIn('doi');
        back = true;
        // pg-boss retries with backoff (2 s, 4 s, 8 s, …): the page updates by itself
        await page.getByText('✓ Finished: 1 entries read.').waitFor({ timeout: 60_000 });
        assert.equal(await page.locator('[data-count="imported"]').innerText(), '1');
        assert.equal(await note.count(), 0);
        await row.getByText('Imported').waitFor();
        await row.getByRole('link').click();
        await page.getByRole('heading', { level: 1, name: new RegExp(`Generated timing record ${n}`) }).waitFor();
      } finally {
        if (!back) await startStandIn('doi');
      }
      await signOut(page);
    },
  },
];
