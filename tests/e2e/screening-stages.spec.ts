import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { decideByKeys } from './screening-keys.js';

const origin = () => ({ Origin: new URL(process.env.APP_ORIGIN!).origin });

async function importRecords(page: Page, n: number, tag: string): Promise<number> {
  const text = Array.from(
    { length: n },
    (_, i) => `@article{${tag}${i}, title={Two-stage record ${i + 1} on filled intervals ${tag}}, author={Stager, Ona}, year={${2010 + i}}, journal={Invented Timing Reports}, doi={10.5555/${tag}.${i}}}`,
  ).join('\n');
  const res = await page.request.post(appUrl('/api/imports'), { headers: origin(), data: { format: 'bibtex', text } });
  assert.equal(res.status(), 201);
  return ((await res.json()) as { batch: { id: number } }).batch.id;
}

export const specs: Spec[] = [
  {
    name: 'two stages: included on title and abstract, a record goes to the full-text list; only a full-text inclusion is offered for coding',
    async run(page) {
      await signInThroughPage(page, 'coder2');
      const tag = `ts${Date.now().toString(36)}`;
      const batch = await importRecords(page, 3, tag);
      const reader = page.getByRole('article', { name: 'Record being read' });
      await page.goto(appUrl(`/screening?batch=${batch}`));
      await page.getByText(`3 records waiting from batch ${batch}`).waitFor();
      await page.getByRole('progressbar', { name: 'Title and abstract screening progress' }).waitFor();
      await decideByKeys(page, 'inc');
      await page.getByText(`Last: ✓ Included on title and abstract: Two-stage record 1 on filled intervals ${tag}`).waitFor();
      await decideByKeys(page, 'inc');
      await page.getByText(`1 record waiting from batch ${batch}`).waitFor();
      // At title and abstract an exclusion may go without a reason.
      await decideByKeys(page, 'wi');
      await page.getByText(`Last: ✕ Excluded: Two-stage record 3 on filled intervals ${tag}`).waitFor();
      await page.getByText('Nothing is waiting from this batch.').waitFor();

      await page.getByRole('navigation', { name: 'Screening stage' }).getByRole('link', { name: /^2\. Full text/ }).click();
      await page.getByText(`2 records waiting for full text from batch ${batch}`).waitFor();
      await page.getByRole('progressbar', { name: 'Full text screening progress' }).waitFor();
      await page.getByRole('listbox', { name: 'Records to screen' }).getByRole('option').first().getByText('included on title and abstract').waitFor();
      // The full-text chooser has its own reasons, and no exclusion without one.
      await page.keyboard.press('Enter');
      const chooser = page.getByRole('region', { name: 'Decision' });
      await chooser.getByRole('combobox').waitFor();
      await page.keyboard.type('wi');
      await chooser.getByText('✕ Nothing starts with “wi”.').waitFor();
      await page.keyboard.press('Escape');
      await chooser.waitFor({ state: 'detached' });
      await reader.getByRole('heading', { name: `Two-stage record 1 on filled intervals ${tag}` }).waitFor();
      await decideByKeys(page, 'fu');
      await page.getByText(`Last: ✕ Excluded (Full text not available): Two-stage record 1 on filled intervals ${tag}`).waitFor();
      await decideByKeys(page, 'inc');
      await page.getByText(`Last: ✓ Included: Two-stage record 2 on filled intervals ${tag}`).waitFor();
      await page.getByText('Nothing is waiting for full text from this batch.').waitFor();

      // Coding is offered only for the full-text inclusion.
      const claimable = (await (await page.request.get(appUrl(`/api/extractions/claimable?q=${tag}&pageSize=50`))).json()) as { items: { title: string }[] };
      assert.deepEqual(claimable.items.map((i) => i.title), [`Two-stage record 2 on filled intervals ${tag}`]);

      await page.getByRole('link', { name: 'PRISMA 2020 flow' }).first().click();
      const table = page.getByRole('table', { name: 'PRISMA 2020 flow counts' });
      await table.getByRole('row', { name: /Reports excluded at full text, with reasons/ }).waitFor();
      await table.getByRole('row', { name: /Full text not available/ }).waitFor();
      await table.getByRole('row', { name: /Excluded on title and abstract \(no reason given\)/ }).waitFor();
    },
  },
];
