import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { decideByKeys } from './screening-keys.js';

const origin = () => ({ Origin: new URL(process.env.APP_ORIGIN!).origin });

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

const versionOf = async (page: Page, refId: number) => (await apiJson<{ reference: { version: number } }>(page, `/api/references/${refId}`)).reference.version;

/** The atlas's references table, reloaded, and the row of one title in it. */
async function atlasRow(atlas: Page, title: string) {
  await atlas.goto(appUrl('/atlas/manipulations/numerosity'));
  await atlas.getByRole('heading', { name: 'References' }).waitFor();
  const table = atlas.getByRole('table').last();
  await table.getByRole('row').nth(1).waitFor();
  return table.getByRole('row').filter({ hasText: title });
}

export const specs: Spec[] = [
  {
    name: 'a curator excludes a reference with settled effects at screening, takes it back, and its records are settled again and back in the atlas',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const effects = await apiJson<{ items: { referenceId: number; title: string }[] }>(page, '/api/effects?manipulation=numerosity&pageSize=100');
      // Not the first numerosity reference: screening-versions excludes that one for good after this spec.
      const others = effects.items.filter((e) => e.referenceId !== effects.items[0]?.referenceId);
      const target = others[others.length - 1];
      assert.ok(target, 'the demo data has settled effects from two numerosity references');
      const n = effects.items.filter((e) => e.referenceId === target.referenceId).length;
      const refId = target.referenceId;

      // The seed included it at full text; taking that back (API) puts it in the full-text queue with its effects still settled.
      const back = await page.request.post(appUrl(`/api/references/${refId}/screening/undo`), { headers: origin(), data: { version: await versionOf(page, refId) } });
      assert.equal(back.status(), 200);
      assert.equal(((await back.json()) as { screeningStatus: string }).screeningStatus, 'awaiting_full_text');
      assert.equal((await apiJson<{ total: number }>(page, `/api/effects?referenceId=${refId}`)).total, n);

      const atlas = await page.context().newPage();
      assert.equal(await (await atlasRow(atlas, target.title)).count(), 1, 'in the atlas before the exclusion');

      await page.goto(appUrl('/screening?stage=full_text'));
      const list = page.getByRole('listbox', { name: 'Records to screen' });
      await list.getByRole('option').filter({ hasText: target.title }).click();
      await page.getByRole('article', { name: 'Record being read' }).getByRole('heading', { name: target.title }).waitFor();
      await decideByKeys(page, 'rev', 'a narrative review');
      await page.getByText(new RegExp(`^Last: ✕ Excluded \\(Review article\\): .*; settled records? #\\d+(, #\\d+)* withdrawn`)).waitFor();
      assert.equal((await apiJson<{ total: number }>(page, `/api/effects?referenceId=${refId}`)).total, 0);
      assert.equal(await (await atlasRow(atlas, target.title)).count(), 0, 'the excluded reference left the atlas');

      // U takes the exclusion back: the screen says which records are settled again.
      await page.keyboard.press('u');
      await page.getByText(new RegExp(`↶ Taken back: #${refId} is waiting again; records? #\\d+(, #\\d+)* settled again`)).waitFor();
      await list.getByRole('option').filter({ hasText: target.title }).waitFor();
      assert.equal((await apiJson<{ total: number }>(page, `/api/effects?referenceId=${refId}`)).total, n);
      const row = await atlasRow(atlas, target.title);
      await row.waitFor();
      assert.equal((await row.getByRole('cell').nth(4).textContent())?.trim(), String(n), 'all its effects are back in the atlas');

      // Leave the demo data as found: included again, effects settled.
      const again = await page.request.post(appUrl(`/api/references/${refId}/screening`), { headers: origin(), data: { decision: 'included', version: await versionOf(page, refId) } });
      assert.equal(again.status(), 201);
      const detail = await apiJson<{ reference: { screeningStatus: string } }>(page, `/api/references/${refId}`);
      assert.equal(detail.reference.screeningStatus, 'included');
      assert.equal((await apiJson<{ total: number }>(page, `/api/effects?referenceId=${refId}`)).total, n);
    },
  },
];
