import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, openBrowser, signInThroughPage, signOut } from './browser.js';

/** A second person in their own browser (own cookies), closed by the caller. */
async function secondBrowser(login: string) {
  const b = await openBrowser();
  const page = await b.context.newPage();
  page.setDefaultTimeout(15_000);
  await signInThroughPage(page, login);
  return { page, close: b.close };
}

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

export const specs: Spec[] = [
  {
    name: 'a curator edits a reference’s year and the atlas shows it at once; a stale tab of the reference gets a conflict',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await page.goto(appUrl('/atlas/manipulations/luminance'));
      await page.getByRole('heading', { name: 'References' }).waitFor();
      const row = page.getByRole('table').last().getByRole('row').nth(1);
      await row.waitFor();
      const title = (await row.getByRole('cell').nth(1).textContent())!.trim();
      const year = Number((await row.getByRole('cell').nth(2).textContent())!.trim());
      const newYear = year > 1990 ? year - 7 : year + 7;
      const refHref = (await row.getByRole('link').first().getAttribute('href'))!;
      // a second tab of the same reference, opened before the edit
      const stale = await page.context().newPage();
      await stale.goto(appUrl(refHref));
      await stale.getByRole('button', { name: /Edit title, authors, year/ }).click();

      await row.getByRole('link').first().click();
      await page.getByRole('button', { name: /Edit title, authors, year/ }).click();
      await page.getByLabel('Year', { exact: true }).fill(String(newYear));
      await page.getByRole('button', { name: 'Save changes' }).click();
      await page.getByRole('button', { name: /Edit title, authors, year/ }).waitFor();
      // back in the same tab, without a reload: the atlas asked the server again
      await page.goBack();
      await page.getByRole('heading', { name: 'References' }).waitFor();
      await page.getByRole('row').filter({ hasText: title }).getByRole('cell', { name: String(newYear), exact: true }).waitFor();

      // the stale tab still holds the old version: its save is refused and says why
      await stale.getByLabel('Year', { exact: true }).fill(String(newYear + 1));
      await stale.getByRole('button', { name: 'Save changes' }).click();
      await stale.getByText(/changed by someone else/).waitFor();
      // put the year back for the specs that follow
      await page.getByRole('row').filter({ hasText: title }).getByRole('link').first().click();
      await page.getByRole('button', { name: /Edit title, authors, year/ }).click();
      await page.getByLabel('Year', { exact: true }).fill(String(year));
      await page.getByRole('button', { name: 'Save changes' }).click();
      await page.getByRole('button', { name: /Edit title, authors, year/ }).waitFor();
    },
  },
  {
    name: 'claim, then pair: two claims of one reference join the curator’s pair with their work (a stale claim list included)',
    async run(page) {
      // coder2 opens the claim list first: this tab goes stale
      await signInThroughPage(page, 'coder2');
      await page.goto(appUrl('/extractions'));
      await page.getByRole('heading', { name: 'Claim a reference to code' }).waitFor();
      const first = (await apiJson<{ items: { id: number; referenceLabel: string; title: string }[] }>(page, '/api/extractions/claimable?pageSize=1&sort=reference&order=asc')).items[0];
      assert.ok(first, 'the demo data offers a reference to claim');
      await page.getByRole('button', { name: `Claim ${first.referenceLabel}` }).first().waitFor();

      // coder1, in another browser, claims it and starts a study
      const other = await secondBrowser('coder1');
      try {
        const p1 = other.page;
        await p1.goto(appUrl('/extractions'));
        await p1.getByRole('heading', { name: 'Claim a reference to code' }).waitFor();
        await p1.getByRole('button', { name: `Claim ${first.referenceLabel}` }).first().click();
        await p1.getByRole('heading', { name: /Extraction sheet/ }).waitFor();
        const sheetUrl = p1.url();
        if ((await p1.getByRole('region', { name: 'Study 1' }).count()) === 0) await p1.getByRole('button', { name: '+ Add a study' }).click();
        await p1.getByRole('region', { name: 'Study 1' }).getByLabel('Design', { exact: true }).first().selectOption('within');
        await p1.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });

        // a fresh list no longer offers the claimed reference to coder2 ...
        const fresh = await page.context().newPage();
        await fresh.goto(appUrl('/extractions'));
        await fresh.getByRole('heading', { name: 'Claim a reference to code' }).waitFor();
        await fresh.getByRole('table').first().waitFor();
        assert.equal(await fresh.getByRole('button', { name: `Claim ${first.referenceLabel}` }).count(), 0, 'a claimed reference is not offered');
        await fresh.close();
        // ... but the stale tab still shows it; claiming there makes a sheet, and the curator pairs both claims
        await page.getByRole('button', { name: `Claim ${first.referenceLabel}` }).first().click();
        await page.getByRole('heading', { name: /Extraction sheet/ }).waitFor();

        // the curator sees both claims and their state, with the claimants already chosen
        await signOut(p1);
        await signInThroughPage(p1, 'curator');
        await p1.goto(appUrl('/assignments'));
        await p1.getByRole('heading', { name: 'Double coding' }).waitFor();
        await p1.getByPlaceholder('title or first author').fill(first.title.slice(0, 40));
        const claims = p1.getByTestId(`claims-${first.id}`);
        await claims.getByText('@coder1').waitFor();
        await claims.getByText('@coder2').waitFor();
        assert.equal(await claims.locator('[data-state="draft"]').count(), 2);
        const row = p1.getByRole('row').filter({ has: claims });
        await row.getByRole('button', { name: 'Assign' }).click();
        await p1.getByRole('status').getByText(/took over @coder1’s draft sheet and @coder2’s draft sheet/).waitFor();

        // coder1's draft kept its study
        await signOut(p1);
        await signInThroughPage(p1, 'coder1');
        await p1.goto(sheetUrl);
        await p1.getByRole('heading', { name: /Extraction sheet/ }).waitFor();
        assert.equal(await p1.getByRole('region', { name: 'Study 1' }).getByLabel('Design', { exact: true }).first().inputValue(), 'within');
      } finally {
        await other.close();
      }
    },
  },
  {
    name: 'a curator is told who could reconcile a pair they code themselves (an admin counts as a curator), and may then choose their own name',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await page.goto(appUrl('/assignments'));
      await page.getByTestId('self-assign-note').getByText(/You may code a pair yourself: .*@admin.* can then reconcile it/).waitFor();
      const select = page.getByRole('combobox', { name: /^First coder for / }).first();
      await select.waitFor();
      const own = select.locator('option', { hasText: '@curator' });
      assert.equal(await own.isDisabled(), false);
      assert.match((await own.textContent()) ?? '', /\(you\)/);
      // the queue opens a pair's page only for curators outside the pair; the server refuses the rest with 403
      const res = await page.request.get(appUrl('/api/reconciliation'));
      assert.equal(res.status(), 200);
      const body = (await res.json()) as { items: { youCoded: boolean }[] };
      assert.ok(body.items.every((i) => i.youCoded === false));
    },
  },
  {
    name: 'two tabs assign the same reference: the first wins, the stale tab is told it is already being coded',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const cands = await apiJson<{ items: { id: number; title: string; claims: unknown[]; assignmentState: string | null }[] }>(page, '/api/assignments/candidates?pageSize=100');
      const target = cands.items.find((c) => c.claims.length === 0 && c.assignmentState === null);
      assert.ok(target, 'the demo data has an unassigned reference');
      const coders = await apiJson<{ items: { id: number; login: string }[] }>(page, '/api/assignments/coders');
      const id = (login: string) => String(coders.items.find((c) => c.login === login)!.id);
      const open = async (p: Page) => {
        await p.goto(appUrl('/assignments'));
        await p.getByPlaceholder('title or first author').fill(target.title.slice(0, 40));
        const row = p.getByRole('row').filter({ has: p.getByTestId(`claims-${target.id}`) });
        await row.getByRole('combobox', { name: /^First coder/ }).selectOption(id('coder1'));
        await row.getByRole('combobox', { name: /^Second coder/ }).selectOption(id('coder2'));
        return row;
      };
      const stale = await page.context().newPage();
      const staleRow = await open(stale);
      const row = await open(page);
      await row.getByRole('button', { name: 'Assign' }).click();
      await page.getByRole('status').getByText(/Assigned; both coders are e-mailed/).waitFor();
      await staleRow.getByRole('button', { name: 'Assign' }).click();
      await stale.getByText(/already being double coded/).first().waitFor();
    },
  },
];
