import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, openBrowser, signInThroughPage } from './browser.js';

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

/** The curator edits a reference's year on its page (a bibliographic edit the registry version counts). */
async function setYear(page: Page, referenceId: number, year: number) {
  await page.goto(appUrl(`/references/${referenceId}`));
  await page.getByRole('button', { name: /Edit title, authors, year/ }).click();
  await page.getByLabel('Year', { exact: true }).fill(String(year));
  await page.getByRole('button', { name: 'Save changes' }).click();
  await page.getByRole('button', { name: /Edit title, authors, year/ }).waitFor();
}

type Effect = { referenceId: number; referenceLabel: string; year: number | null; metric: string };

export const specs: Spec[] = [
  {
    name: 'follow a synthesis, a curator’s edit moves it, the re-check brings news; the reader sees what changed (both forest plots) and stops following',
    async run(page) {
      await signInThroughPage(page, 'reader');
      const all = await apiJson<{ items: Effect[] }>(page, '/api/effects?manipulation=luminance&outcome=duration_distortion&sort=year&order=asc&pageSize=500');
      const pooled = all.items.filter((e) => ['g_s', 'g_av', 'g_rm'].includes(e.metric) && e.year != null);
      const first = pooled[0];
      assert.ok(first && pooled.some((e) => e.referenceId !== first.referenceId), 'the demo data has raw-score luminance effects from two references');
      const year = first.year!;

      // the reader follows the synthesis of these years from its page, with a small SE threshold
      await page.goto(appUrl(`/synthesis?manipulation=luminance&outcome=duration_distortion&smdFamily=raw_score&yearFrom=${year}`));
      // the plots draw after the numbers and move the page: follow once they are in place
      await page.locator('figure[aria-label="Forest plot"] svg.main-svg').first().waitFor({ timeout: 40_000 });
      const followForm = page.getByRole('form', { name: 'Follow this synthesis' });
      await followForm.getByLabel(/estimate moves by more than/).fill('0.01');
      await followForm.getByLabel(/new study carries more than/).fill('150');
      await followForm.getByRole('button', { name: 'Follow this synthesis' }).click();
      await page.getByRole('alert').filter({ hasText: 'a percentage above 0 and below 100' }).waitFor();
      await followForm.getByLabel(/new study carries more than/).fill('20');
      await followForm.getByRole('button', { name: 'Follow this synthesis' }).click();
      await page.getByRole('status').filter({ hasText: /✓ Following: the estimate moving by 0\.01 SE/ }).waitFor();

      // a curator, in another browser, moves the earliest reference out of those years
      const curator = await openBrowser();
      const cp = await curator.context.newPage();
      cp.setDefaultTimeout(15_000);
      try {
        await signInThroughPage(cp, 'curator');
        await setYear(cp, first.referenceId, year - 7);

        await page.goto(appUrl('/follows'));
        const row = page.getByRole('row').filter({ hasText: `years ${year}–…` }).filter({ hasText: 'Outcome kind: Duration distortion' });
        await row.getByRole('link', { name: /^What changed/ }).click();
        await page.getByRole('heading', { name: 'What changed since' }).waitFor();
        // the comparison with today's registry shows at once; the news waits for the re-check job
        await page.getByRole('region', { name: 'Withdrawn' }).getByText(first.referenceLabel).first().waitFor();
        const news = page.getByRole('list', { name: 'News of this follow' });
        for (let waited = 0; (await news.count()) === 0; waited += 3) {
          assert.ok(waited < 75, 'the re-check brought no news within 75 s');
          await page.waitForTimeout(3000);
          await page.reload();
          await page.getByRole('heading', { name: 'What changed since' }).waitFor();
        }
        await news.getByText(/The estimate moved by/).waitFor();
        await page.getByText(/^Since the change of/).waitFor();
        await page.getByRole('region', { name: 'Withdrawn' }).getByText(first.referenceLabel).first().waitFor();
        await page.getByRole('columnheader', { name: 'Before the last news' }).waitFor();
        await page.getByRole('figure', { name: 'Forest plot, before the last news' }).locator('svg.main-svg').first().waitFor({ timeout: 40_000 });
        await page.getByRole('figure', { name: 'Forest plot, today’s registry' }).locator('svg.main-svg').first().waitFor({ timeout: 40_000 });

        await page.getByRole('button', { name: 'Stop following' }).click();
        await page.getByRole('status').getByText(/You no longer follow this/).waitFor();
        await page.getByRole('link', { name: 'My follows' }).last().click();
        await page.getByRole('heading', { name: 'My follows' }).waitFor();
        await page.getByRole('table').or(page.getByText('You follow no synthesis.')).first().waitFor();
        assert.equal(await page.getByRole('row').filter({ hasText: `years ${year}–…` }).filter({ hasText: 'Outcome kind: Duration distortion' }).count(), 0);
      } finally {
        // the year back, for the specs that follow
        await setYear(cp, first.referenceId, year).catch(() => undefined);
        await curator.close();
      }
    },
  },
  {
    name: 'a snapshot page says how today’s registry differs, follows the snapshot, and re-runs it in one click',
    async run(page) {
      await signInThroughPage(page, 'reader');
      const list = await apiJson<{ items: { id: string; title: string }[] }>(page, '/api/snapshots?pageSize=100');
      const demo = list.items.find((s) => s.title.startsWith('Demo: luminance'));
      assert.ok(demo, 'the demo data has a luminance snapshot');
      await page.goto(appUrl(`/snapshots/${demo.id}`));
      // the plots draw after the numbers and move the page: act once they are in place
      await page.locator('figure[aria-label="Forest plot"] svg.main-svg').first().waitFor({ timeout: 40_000 });
      await page.waitForLoadState('networkidle');
      const today = page.getByRole('region', { name: 'Today’s registry against this snapshot' });
      await today.getByRole('columnheader', { name: 'In this snapshot' }).waitFor();
      await today.getByRole('row', { name: /Studies pooled \(k\)/ }).waitFor();
      await page.getByRole('link', { name: 'Atom feed' }).first().waitFor();

      const followForm = page.getByRole('form', { name: 'Follow this snapshot' });
      await followForm.getByRole('button', { name: 'Follow this snapshot' }).click();
      await page.getByRole('status').filter({ hasText: /✓ Following/ }).waitFor();
      const mine = await apiJson<{ items: { id: number; snapshotId: string | null }[] }>(page, '/api/follows');
      const followed = mine.items.find((f) => f.snapshotId === demo.id);
      assert.ok(followed, 'the snapshot is among my follows');

      await today.getByRole('link', { name: 'Re-run on today’s registry' }).click();
      await page.waitForURL(/\/synthesis\?/);
      await page.getByRole('region', { name: 'Follow this synthesis' }).waitFor({ timeout: 30_000 });

      await page.goto(appUrl('/follows'));
      const row = page.getByRole('row').filter({ hasText: `Snapshot ${demo.id}` });
      await row.getByRole('button', { name: /Stop following/ }).click();
      await row.waitFor({ state: 'detached' });
    },
  },
];
