import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import { computeEffect } from '../../shared/stats/compute-effect.js';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';

async function choose(page: Page, scope: ReturnType<Page['getByRole']>, label: string, value: string) {
  await scope.getByLabel(label, { exact: true }).first().selectOption(value);
}

export const specs: Spec[] = [
  {
    name: 'a contributor codes one effect from means and SDs and sees the computed g and its formula',
    async run(page) {
      await signInThroughPage(page, 'coder2');
      await page.goto(appUrl('/extractions?'));
      await page.getByRole('heading', { name: 'My coding' }).waitFor();
      await page.getByRole('combobox', { name: 'State' }).selectOption('draft');
      await page.locator('[data-state="draft"]').first().waitFor();
      await page.getByRole('table').getByRole('link').first().click();
      await page.getByRole('heading', { name: /Extraction sheet/ }).waitFor();
      // A fresh sheet may be empty: add the first study.
      if ((await page.getByRole('region', { name: 'Study 1' }).count()) === 0) await page.getByRole('button', { name: '+ Add a study' }).click();
      const study = page.getByRole('region', { name: 'Study 1' });
      await choose(page, study as any, 'Design', 'between');
      await study.getByLabel('n, group 1', { exact: true }).fill('20');
      await study.getByLabel('n, group 2', { exact: true }).fill('20');
      await choose(page, study as any, 'Population', 'healthy_adults');
      await choose(page, study as any, 'Modality', 'visual');
      await choose(page, study as any, 'Task', 'reproduction');
      const effect = study.getByRole('group', { name: 'Study 1, effect 1' });
      await effect.getByLabel('Outcome kind').selectOption('duration_distortion');
      await effect.getByLabel('Manipulation').selectOption('luminance');
      await effect.getByLabel('Reported as').selectOption('smd');
      for (const [label, value] of [
        ['Mean 1 (condition/group 1)', '650'],
        ['SD 1', '80'],
        ['n 1', '20'],
        ['Mean 2 (condition/group 2)', '610'],
        ['SD 2', '75'],
        ['n 2', '20'],
      ]) {
        await effect.getByLabel(label, { exact: true }).fill(value);
      }
      const expected = computeEffect({ measure: 'smd', mean1: 650, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 });
      const shown = effect.getByTestId('computed-effect');
      await shown.waitFor();
      assert.equal(await shown.textContent(), expected.effect.toFixed(3));
      const formula = await effect.getByTestId('formula').textContent();
      assert.match(formula ?? '', /Hedges' g \(g_s\), independent groups, from means and SDs/);
      assert.match(formula ?? '', /Borenstein/);
      // The draft saves by itself, and the server's numbers match after a reload.
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });
      await page.reload();
      const again = page.getByRole('group', { name: 'Study 1, effect 1' }).getByTestId('computed-effect');
      await again.waitFor();
      assert.equal(await again.textContent(), expected.effect.toFixed(3));
      const sd = page.getByRole('group', { name: 'Study 1, effect 1' }).getByLabel('SD 2', { exact: true });
      await sd.fill('-4');
      // An impossible SD is flagged next to its field, said in the sheet's own label, never the engine's key.
      const group = page.getByRole('group', { name: 'Study 1, effect 1' });
      await group.getByText('“SD 2” must be a positive finite number').first().waitFor();
      assert.doesNotMatch(await group.innerText(), /\bsd2\b/);
      // a CI-based form without its interval says which values it needs, by their labels
      await group.getByLabel('Reported as').selectOption('ratio_ci');
      await group.getByText(/needs “Ratio \(e\.g\. perceived\/physical duration\)”, “CI lower”, “CI upper”/).first().waitFor();
      assert.doesNotMatch(await group.innerText(), /\bci_lower\b/);
    },
  },
  {
    name: 'a curator settles a discrepancy from the reconciliation queue',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await page.getByRole('link', { name: 'Reconcile' }).click();
      await page.getByRole('heading', { name: 'Reconciliation queue' }).waitFor();
      await page.getByRole('table').first().getByRole('link').first().click();
      await page.getByRole('heading', { name: /Reconcile:/ }).waitFor();
      await page.getByText(/Tolerance:/).waitFor();
      const rows = page.locator('[data-testid^="discrepancy-"]');
      await rows.first().waitFor();
      const n = await rows.count();
      assert.ok(n >= 1);
      for (let i = 0; i < n; i++) await rows.nth(i).getByRole('radio', { name: /Take @coder2/ }).check();
      await page.getByLabel('Rationale for the reconciled entry').fill('The value in the paper’s table agrees with coder B.');
      await page.getByRole('button', { name: 'Save the reconciled entry' }).click();
      await page.getByRole('status').filter({ hasText: 'Settled.' }).waitFor();
      await page.getByRole('link', { name: 'Open the settled record' }).click();
      await page.getByRole('heading', { name: /Settled record of/ }).waitFor();
      await page.getByText('reconciled', { exact: true }).first().waitFor();
      // The coders' "settled" mails went out as background jobs; the admin mailbox shows them.
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();
      await signInThroughPage(page, 'admin');
      await page.goto(appUrl('/admin/mail'));
      await page.getByRole('article', { name: /your coding of .* is settled/ }).first().waitFor({ timeout: 20_000 });
      await page.getByRole('row').filter({ hasText: 'settled' }).filter({ hasText: 'sent' }).first().waitFor({ timeout: 20_000 });
    },
  },
];
