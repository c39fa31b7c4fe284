import assert from 'node:assert/strict';
import type { Locator, Page } from 'playwright-core';
import type { AgreementSummary, OverallAgreement, ReferenceAgreementPage } from '../../shared/schemas/reconciliation.js';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

const cellTexts = async (row: Locator) => (await row.getByRole('cell').allTextContents()).map((t) => t.trim());
const rowOf = (table: Locator, first: string) => table.getByRole('row').filter({ has: table.page().getByRole('cell', { name: first, exact: true }) });
const twoDp = /^[−-]?\d+\.\d\d$/;

/** One summary's two tables as a curator reads them; answers how many κ = 1 and withheld ICCs it showed. */
async function checkSummary(page: Page, s: AgreementSummary, nth: number): Promise<{ perfect: number; withheld: number }> {
  const categorical = page.getByRole('table', { name: "Categorical fields (Cohen's kappa)" }).nth(nth);
  let perfect = 0;
  for (const c of s.categorical) {
    const [, , , kappa, se] = await cellTexts(rowOf(categorical, c.field));
    if (c.kappa !== null && Math.abs(c.kappa - 1) < 1e-12) {
      perfect++;
      assert.deepEqual([kappa, se], ['perfect agreement', '—'], `${c.field}: κ = 1 is said in words, without its SE of 0`);
    } else if (c.kappa !== null && c.kappaSe !== null) {
      assert.match(kappa, twoDp, `${c.field}: κ to 2 dp`);
      assert.match(se, twoDp, `${c.field}: SE to 2 dp`);
    }
  }
  const pooled = categorical.getByRole('row').filter({ hasText: 'Summary over all fields' });
  await pooled.getByText("one kappa over field-and-value categories pooled together: a summary, not Cohen's κ of any one field").waitFor();
  assert.equal((await cellTexts(pooled))[4], '—', 'the pooled summary has no SE');

  const effects = page.getByRole('table', { name: 'Effect sizes (ICC(2,1), absolute agreement)' }).nth(nth);
  let withheld = 0;
  for (const e of s.effectSizes) {
    const [, items, icc] = await cellTexts(rowOf(effects, e.metric));
    assert.equal(items, String(e.items));
    if (e.items < 5) {
      withheld++;
      assert.equal(e.icc, null, `${e.metric}: no ICC from ${e.items} pairs`);
      assert.match(icc, new RegExp(`^Not computed: ${e.items} pairs? of values; an ICC needs at least 5`), `${e.metric}: the reason in words`);
    } else assert.match(icc, twoDp, `${e.metric}: ICC to 2 dp`);
  }
  return { perfect, withheld };
}

export const specs: Spec[] = [
  {
    name: 'curators and reviewers reach the agreement page from the header; a contributor sees no link',
    async run(page) {
      for (const login of ['curator', 'reviewer']) {
        await signInThroughPage(page, login);
        await page.getByRole('banner').getByRole('link', { name: 'Agreement' }).click();
        await page.getByRole('heading', { name: 'Inter-coder agreement' }).waitFor();
        await signOut(page);
      }
      await signInThroughPage(page, 'coder1');
      await page.goto(appUrl('/'));
      await page.getByRole('banner').getByRole('link', { name: 'My coding' }).waitFor();
      assert.equal(await page.getByRole('banner').getByRole('link', { name: 'Agreement' }).count(), 0);
    },
  },
  {
    name: 'a curator reads agreement: κ = 1 as perfect agreement without an SE, no ICC from fewer than 5 pairs and why, the pooled κ a summary',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const overall = await apiJson<OverallAgreement>(page, '/api/agreement');
      const refs = await apiJson<ReferenceAgreementPage>(page, '/api/agreement/references?page=1&pageSize=25&sort=agreement&order=asc');
      assert.ok(overall.overall.pairs > 0 && overall.coderPairs.length > 0, 'the demo data has compared pairs');

      await page.getByRole('banner').getByRole('link', { name: 'Agreement' }).click();
      await page.getByRole('heading', { name: `Overall (${overall.overall.pairs} pairs)` }).waitFor();
      await page.getByText(/not computed from fewer than 5 pairs of values/).waitFor();
      assert.equal(await page.getByText('all categorical fields').count(), 0, 'the old label is gone');

      let perfect = 0;
      let withheld = 0;
      for (const [i, s] of [overall.overall, ...overall.coderPairs].entries()) {
        const seen = await checkSummary(page, s, i);
        perfect += seen.perfect;
        withheld += seen.withheld;
      }
      assert.ok(perfect > 0, 'the demo data has a field both coders always agree on');

      // By reference: the pooled κ is headed a summary; one reference's few effects give no ICC, said so.
      const byRef = page.getByRole('table').last();
      await byRef.getByRole('columnheader', { name: 'Summary κ (2 dp)' }).waitFor();
      for (const [i, r] of refs.items.entries()) {
        const [, , , , kappa, icc] = await cellTexts(byRef.getByRole('row').nth(i + 1));
        if (r.kappa !== null) assert.ok(Math.abs(r.kappa - 1) < 1e-12 ? kappa === 'perfect agreement' : twoDp.test(kappa), `row ${i + 1}: κ ${kappa}`);
        for (const e of r.effectSizes) {
          if (e.items >= 5) continue;
          withheld++;
          assert.ok(icc.includes(`${e.metric} not computed, fewer than 5 pairs (${e.items})`), `row ${i + 1}: ${icc}`);
        }
      }
      assert.ok(withheld > 0, 'the demo data has an ICC withheld for too few pairs');
    },
  },
];
