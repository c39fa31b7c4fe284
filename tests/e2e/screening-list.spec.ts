import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { batchByKeys, decideByKeys } from './screening-keys.js';

/** Imports `n` invented records as the signed-in person and answers the batch id. */
async function importRecords(page: Page, n: number, tag: string): Promise<number> {
  const text = Array.from(
    { length: n },
    (_, i) =>
      `@article{${tag}${i}, title={Reading list record ${i + 1} on tone durations ${tag}}, author={Lister, Lena}, year={${2000 + i}}, journal={Invented Journal of Timing},` +
      ` doi={10.5555/${tag}.${i}}, keywords={numerosity; bisection}, abstract={Participants compared intervals while numerosity and luminance varied; the duration distortion was small.}}`,
  ).join('\n');
  const res = await page.request.post(appUrl('/api/imports'), { headers: { Origin: new URL(process.env.APP_ORIGIN!).origin }, data: { format: 'bibtex', text } });
  assert.equal(res.status(), 201);
  return ((await res.json()) as { batch: { id: number } }).batch.id;
}

const waiting = (page: Page, n: number, batch: number) => page.getByText(`${n} ${n === 1 ? 'record' : 'records'} waiting from batch ${batch}`).waitFor();

async function batchStatuses(page: Page, batch: number): Promise<Record<string, number>> {
  const res = await page.request.get(appUrl(`/api/references?batch=${batch}&pageSize=100`));
  const out: Record<string, number> = {};
  for (const r of ((await res.json()) as { items: { screeningStatus: string }[] }).items) out[r.screeningStatus] = (out[r.screeningStatus] ?? 0) + 1;
  return out;
}

export const specs: Spec[] = [
  {
    name: 'screens 20 records of a reading list by keyboard only, decides 5 together, takes the 5 back; the PRISMA flow has its own screen',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      const tag = `rl${Date.now().toString(36)}`;
      const batch = await importRecords(page, 25, tag);
      await page.goto(appUrl(`/screening?batch=${batch}`));
      await waiting(page, 25, batch);
      const list = page.getByRole('listbox', { name: 'Records to screen' });
      const reader = page.getByRole('article', { name: 'Record being read' });
      assert.equal(await list.getByRole('option').count(), 25);
      await list.getByRole('option').first().getByText(`new in batch ${batch}`).waitFor();
      // Terms of the vocabulary and the outcome kinds are marked in the abstract and keywords.
      for (const t of ['numerosity', 'luminance', 'duration distortion']) await reader.locator('mark').filter({ hasText: new RegExp(`^${t}$`) }).first().waitFor();
      await reader.getByRole('list', { name: 'Keywords' }).getByText('bisection').waitFor();
      await page.getByRole('progressbar', { name: 'Screening progress' }).waitFor();

      // ↓ moves the cursor: the second record is read, and decided first.
      await page.keyboard.press('ArrowDown');
      await reader.getByRole('heading', { name: `Reading list record 2 on tone durations ${tag}` }).waitFor();
      await decideByKeys(page, 'wr');
      await page.getByText(`Last: ✕ Excluded (Wrong population): Reading list record 2 on tone durations ${tag}`).waitFor();
      await waiting(page, 24, batch);
      // The cursor went on to record 3; ↑ goes back to record 1.
      await reader.getByRole('heading', { name: `Reading list record 3 on tone durations ${tag}` }).waitFor();
      await page.keyboard.press('ArrowUp');
      await reader.getByRole('heading', { name: `Reading list record 1 on tone durations ${tag}` }).waitFor();
      const plan = ['inc', 'not ab', 'inc', 'rev', 'inc', 'dp', 'not ab', 'inc', 'i', 'natp', 'inc', 'wp', 'inc', 'inc', 'rev', 'inc', 'no', 'inc'];
      for (const [i, letters] of plan.entries()) {
        await decideByKeys(page, letters);
        await waiting(page, 23 - i, batch);
      }
      // The twentieth: "Other" needs a note, typed in the chooser.
      await decideByKeys(page, 'oth', 'animal sample');
      await waiting(page, 5, batch);
      assert.deepEqual(await batchStatuses(page, batch), { awaiting_full_text: 10, excluded: 10, unscreened: 5 });

      // The last 5 marked with Space and decided together.
      await page.keyboard.press('Home');
      await batchByKeys(page, 5, 'rev', 'narrative reviews');
      await page.getByText('Last: ✕ Excluded (Review article): 5 records').waitFor();
      await page.getByText('Nothing is waiting from this batch.').waitFor();
      assert.deepEqual(await batchStatuses(page, batch), { awaiting_full_text: 10, excluded: 15 });

      // U takes the whole batch back.
      await page.keyboard.press('u');
      await page.getByText('↶ Taken back: 5 records are waiting again').waitFor();
      await waiting(page, 5, batch);
      assert.deepEqual(await batchStatuses(page, batch), { awaiting_full_text: 10, excluded: 10, unscreened: 5 });

      await page.getByRole('link', { name: 'PRISMA 2020 flow' }).first().click();
      await page.getByRole('heading', { level: 1, name: 'PRISMA 2020 flow' }).waitFor();
      await page.getByRole('table', { name: 'PRISMA 2020 flow counts' }).getByRole('row', { name: /Review article/ }).waitFor();
    },
  },
  {
    name: 'the reading list works at phone width: keys, a batch of 2 and an undo, nothing wider than the screen',
    async run(page) {
      await page.setViewportSize({ width: 390, height: 844 });
      await signInThroughPage(page, 'coder2');
      const tag = `ph${Date.now().toString(36)}`;
      const batch = await importRecords(page, 4, tag);
      await page.goto(appUrl(`/screening?batch=${batch}`));
      await waiting(page, 4, batch);
      const listBox = await page.getByRole('listbox', { name: 'Records to screen' }).boundingBox();
      assert.ok(listBox && listBox.x >= 0 && listBox.x + listBox.width <= 390, `the list fits (${JSON.stringify(listBox)})`);
      await decideByKeys(page, 'inc');
      await waiting(page, 3, batch);
      await page.keyboard.press('Enter');
      const chooser = page.getByRole('region', { name: 'Decision' });
      const box = await chooser.boundingBox();
      assert.ok(box && box.x >= 0 && box.x + box.width <= 390, `the chooser fits (${JSON.stringify(box)})`);
      await page.keyboard.press('Escape');
      await chooser.waitFor({ state: 'detached' });
      await batchByKeys(page, 2, 'ex');
      await waiting(page, 1, batch);
      await page.keyboard.press('u');
      await page.getByText('↶ Taken back: 2 records are waiting again').waitFor();
      await waiting(page, 3, batch);
      assert.ok(await page.evaluate(() => document.documentElement.scrollWidth <= 390), 'no sideways scrolling');
    },
  },
];
