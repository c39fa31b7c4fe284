import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

async function decide(page: Page, decision: 'Include' | 'Exclude', reason?: string, note?: string) {
  await page.getByRole('radio', { name: new RegExp(decision) }).check();
  if (reason) await page.getByRole('combobox', { name: 'Reason' }).selectOption({ label: reason });
  if (note) await page.getByRole('textbox', { name: /^Note/ }).fill(note);
  await page.getByRole('button', { name: 'Record decision' }).click();
}

export const specs: Spec[] = [
  {
    name: 'two tabs screen one reference: the stale tab is told what changed, sees it, and can then decide',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      const stamp = Date.now();
      const title = `Two screeners and one tone interval ${stamp}`;
      const res = await page.request.post(appUrl('/api/imports'), {
        headers: { Origin: new URL(process.env.APP_ORIGIN!).origin },
        data: { format: 'bibtex', text: `@article{tabs${stamp}, title={${title}}, author={Tabbing, Ines}, year={2019}, doi={10.5555/tabs.${stamp}}}` },
      });
      assert.equal(res.status(), 201);
      const refId = ((await res.json()) as { entries: { referenceId: number }[] }).entries[0].referenceId;

      const stale = await page.context().newPage();
      for (const p of [page, stale]) {
        await p.goto(appUrl(`/references/${refId}`));
        await p.getByRole('button', { name: 'Record decision' }).waitFor();
      }
      await decide(page, 'Exclude', 'Wrong population', 'children only');
      await page.getByText('✓ Recorded.').waitFor();
      // Opened again, the form starts from the current decision.
      await page.reload();
      await page.getByRole('button', { name: 'Record decision' }).waitFor();
      assert.ok(await page.getByRole('radio', { name: /Exclude/ }).isChecked(), 'the form starts from the exclusion');
      assert.equal(await page.getByRole('combobox', { name: 'Reason' }).inputValue(), 'wrong_population');
      assert.equal(await page.getByRole('textbox', { name: /^Note/ }).inputValue(), 'children only');

      await decide(stale, 'Include');
      await stale.getByRole('alert').getByText(/changed since you opened it .*now excluded at title and abstract by coder1/).waitFor();
      // The stale tab now shows the decision that won, and a second try goes through.
      await stale.getByRole('cell', { name: 'children only' }).waitFor();
      await decide(stale, 'Include', undefined, 'adults after all');
      await stale.getByText('✓ Recorded.').waitFor();
      const detail = await apiJson<{ reference: { screeningStatus: string; version: number }; screening: unknown[] }>(page, `/api/references/${refId}`);
      assert.equal(detail.reference.screeningStatus, 'awaiting_full_text');
      assert.equal(detail.screening.length, 2);
      await page.reload();
      await page.getByRole('button', { name: 'Record decision' }).waitFor();
      assert.ok(await page.getByRole('radio', { name: /Include/ }).isChecked(), 'the form starts from the inclusion');
      assert.equal(await page.getByRole('textbox', { name: /^Note/ }).inputValue(), 'adults after all');
    },
  },
  {
    name: 'a contributor cannot exclude a reference with settled effects; a curator can, and its effects leave the atlas',
    async run(page) {
      await signInThroughPage(page, 'coder1');
      const effects = await apiJson<{ items: { referenceId: number; title: string }[] }>(page, '/api/effects?manipulation=numerosity&pageSize=100');
      const target = effects.items[0];
      assert.ok(target, 'the demo data has settled numerosity effects');
      const n = effects.items.filter((e) => e.referenceId === target.referenceId).length;
      const path = `/references/${target.referenceId}`;

      await page.goto(appUrl(path));
      await page.getByRole('radio', { name: /Exclude/ }).check();
      await page.getByRole('note').getByText(/only a curator may exclude it/).waitFor();
      await decide(page, 'Exclude', 'Review article');
      await page.getByRole('alert').getByText(/has settled effects; only a curator may exclude it/).waitFor();
      await signOut(page);

      await signInThroughPage(page, 'curator');
      await page.goto(appUrl(path));
      await page.getByRole('radio', { name: /Exclude/ }).check();
      await page.getByRole('note').getByText(new RegExp(`withdraws its ${n} settled effects? from every analysis`)).waitFor();
      await decide(page, 'Exclude', 'Review article', 'a narrative review');
      await page.getByText(/✓ Recorded; settled record #\d+ withdrawn\./).waitFor();

      await page.goto(appUrl('/atlas/manipulations/numerosity'));
      await page.getByRole('heading', { name: 'References' }).waitFor();
      await page.getByRole('table').last().getByRole('row').nth(1).waitFor();
      assert.equal(await page.getByRole('table').last().getByRole('row').filter({ has: page.getByRole('cell', { name: target.title, exact: true }) }).count(), 0, 'the excluded reference left the atlas');
      const after = await apiJson<{ total: number }>(page, `/api/effects?referenceId=${target.referenceId}`);
      assert.equal(after.total, 0);
    },
  },
];
