import assert from 'node:assert/strict';
import type { Locator, Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';

type Queue = { items: { assignmentId: number; referenceLabel: string; youCoded: boolean }[] };
type Pair = { discrepancies: { field: string; impliedA: { effect: number | null }[]; impliedB: { effect: number | null }[] }[] };

async function json<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

/** The disputed pairs this curator may reconcile, each with its differing fields. */
async function pairs(page: Page) {
  const queue = await json<Queue>(page, '/api/reconciliation?pageSize=50');
  const out = [];
  for (const q of queue.items.filter((i) => !i.youCoded)) out.push({ ...q, pair: await json<Pair>(page, `/api/reconciliation/${q.assignmentId}`) });
  return out;
}

/** Nothing on the page is wider than the window (no sideways scrolling of the page itself). */
async function pageFits(page: Page, width: number) {
  const scroll = await page.evaluate(() => document.documentElement.scrollWidth);
  const wide = await page.evaluate(
    (w) => [...document.querySelectorAll('main *')].filter((el) => el.getBoundingClientRect().right > w + 1 && !el.closest('.overflow-x-auto')).slice(0, 3).map((el) => `${el.tagName.toLowerCase()}.${el.className}`),
    width,
  );
  assert.ok(scroll <= width, `the page is ${scroll} px wide in a ${width} px window: ${wide.join(' | ')}`);
}

async function openPair(page: Page, id: number, label: string) {
  await page.getByRole('banner').waitFor();
  // at phone width the navigation is folded into a menu
  const menu = page.getByRole('button', { name: /Menu/ });
  if (await menu.isVisible()) await menu.click();
  await page.getByRole('banner').getByRole('link', { name: 'Reconcile' }).click();
  await page.getByRole('heading', { name: 'Reconciliation queue' }).waitFor();
  await page.locator(`a[href="/reconciliation/${id}"]`).click();
  await page.getByRole('heading', { name: `Reconcile: ${label}` }).waitFor();
  await page.locator('[data-testid^="discrepancy-"]').first().waitFor();
}

const choice = (page: Page): Locator => page.locator('[data-testid^="discrepancy-"]');

export const specs: Spec[] = [
  {
    name: 'at 1,280 px a curator sees each differing field with both values and their effects, nothing chosen, the sheets side by side; enters a value and saves once',
    async run(page) {
      await page.setViewportSize({ width: 1280, height: 900 });
      await signInThroughPage(page, 'curator');
      const target = (await pairs(page)).find((p) => p.pair.discrepancies.every((d) => d.field === 'task' || d.field === 'n1'));
      assert.ok(target, 'the demo queue holds a pair differing on the task or a sample size');
      await openPair(page, target.assignmentId, target.referenceLabel);

      const rows = choice(page);
      const n = await rows.count();
      assert.equal(n, target.pair.discrepancies.length);
      // nothing is chosen for the curator
      assert.equal(await page.locator('[data-testid^="discrepancy-"] input[type="radio"]:checked').count(), 0);
      for (let i = 0; i < n; i++) {
        const r = rows.nth(i);
        await r.getByText('the coders differ').waitFor();
        assert.notEqual(await r.getByTestId('value-a').textContent(), await r.getByTestId('value-b').textContent());
        const d = target.pair.discrepancies[i];
        // the effect either coding gives, to three places, as the API computes it
        await r.getByRole('list', { name: 'Effect this coding by @coder1 gives' }).getByText(d.impliedA[0].effect!.toFixed(3)).waitFor();
        await r.getByRole('list', { name: 'Effect this coding by @coder2 gives' }).getByText(d.impliedB[0].effect!.toFixed(3)).waitFor();
      }
      // the differing field is marked on both sheets, which stand side by side and fit
      const sheetA = page.getByRole('region', { name: 'Sheet of @coder1' });
      const sheetB = page.getByRole('region', { name: 'Sheet of @coder2' });
      assert.ok((await sheetA.locator('[data-differs]').count()) >= n);
      assert.ok((await sheetB.locator('[data-differs]').count()) >= n);
      const [boxA, boxB] = [await sheetA.boundingBox(), await sheetB.boundingBox()];
      assert.ok(boxA && boxB && Math.abs(boxA.y - boxB.y) < 2 && boxB.x > boxA.x + boxA.width - 1, 'the two sheets stand side by side');
      await pageFits(page, 1280);
      const overflowing = await page.evaluate(() =>
        [...document.querySelectorAll('section[aria-label^="Sheet of"] .overflow-x-auto')].filter((el) => el.scrollWidth > el.clientWidth + 1).length,
      );
      assert.equal(overflowing, 0, 'each sheet’s table fits its column without scrolling');

      // saving with nothing chosen names every field
      await page.getByRole('button', { name: 'Save the reconciled entry' }).click();
      await page.getByText(`${n} field${n === 1 ? ' needs' : 's need'} a decision or a value.`).waitFor();
      assert.equal(await page.getByText('choose coder A, coder B or your own value').count(), n);
      await page.getByText('say why (at least 3 characters)').waitFor();

      // the curator types a value for each field
      let ownTask = '';
      for (let i = 0; i < n; i++) {
        const r = rows.nth(i);
        await r.getByRole('radio', { name: 'Enter a value' }).check();
        const own = r.getByLabel('Own value');
        if (target.pair.discrepancies[i].field === 'task') {
          const taken = [await r.getByTestId('value-a').textContent(), await r.getByTestId('value-b').textContent()];
          ownTask = (await own.locator('option').allTextContents()).find((o) => o !== '— choose —' && !taken.includes(o))!;
          await own.selectOption(ownTask);
        } else await own.fill('31');
      }
      await page.getByLabel('Rationale for the reconciled entry').fill('Checked each field against the method section.');
      await page.getByRole('button', { name: 'Save the reconciled entry' }).click();
      await page.getByRole('status').filter({ hasText: 'Settled.' }).waitFor();
      await page.getByRole('link', { name: 'Open the settled record' }).click();
      await page.getByRole('heading', { name: /Settled record of/ }).waitFor();
      if (ownTask) await page.getByText(ownTask, { exact: false }).first().waitFor();
      else await page.getByText('n 31').first().waitFor();
      // the queue no longer holds it
      const after = await json<Queue>(page, '/api/reconciliation?pageSize=50');
      assert.ok(!after.items.some((i) => i.assignmentId === target.assignmentId));
    },
  },
  {
    name: 'at phone width (390 px) the choices stack, stay usable and the entry saves',
    async run(page) {
      await page.setViewportSize({ width: 390, height: 844 });
      await signInThroughPage(page, 'curator');
      const target = (await pairs(page))[0];
      assert.ok(target, 'the demo queue still holds a disputed pair');
      await page.goto(appUrl('/'));
      await openPair(page, target.assignmentId, target.referenceLabel);
      const first = choice(page).first();
      const [a, b] = [await first.getByTestId('value-a').boundingBox(), await first.getByTestId('value-b').boundingBox()];
      assert.ok(a && b && b.y > a.y + a.height - 1, 'coder B’s value stands under coder A’s');
      await pageFits(page, 390);
      for (let i = 0; i < (await choice(page).count()); i++) await choice(page).nth(i).getByRole('radio', { name: /Take @coder2/ }).check();
      await page.getByLabel('Rationale for the reconciled entry').fill('Coder B’s reading matches the figure.');
      const save = page.getByRole('button', { name: 'Save the reconciled entry' });
      const box = await save.boundingBox();
      assert.ok(box && box.x >= 0 && box.x + box.width <= 390, 'the save button is within the screen');
      await save.click();
      await page.getByRole('status').filter({ hasText: 'Settled.' }).waitFor();
    },
  },
];
