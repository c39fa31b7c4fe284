import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';

const forestSvg = 'figure[aria-label="Forest plot"] svg.main-svg';

export const specs: Spec[] = [
  {
    name: 'a reviewer is offered the three-level model when papers report several effects, chooses it, reads it by paper and freezes it',
    async run(page) {
      await signInThroughPage(page, 'reviewer');
      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });

      // aggregation: the sensitivity table over r, and the recommendation
      const sens = page.getByRole('table', { name: /combined at each r/ });
      assert.equal(await sens.locator('tbody tr').count(), 6);
      const note = page.getByRole('note', { name: 'Recommended model' });
      await note.getByText(/more than one effect/).waitFor();
      await note.getByRole('button', { name: 'Use the three-level model' }).click();

      await page.waitForURL(/dependence=multilevel/);
      await page.getByText(/Three-level model \(REML, CR2 robust variance\)/).waitFor({ timeout: 40_000 });
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      assert.equal(await page.getByRole('note', { name: 'Recommended model' }).count(), 0);
      await page.getByRole('rowheader', { name: 'σ² between papers' }).waitFor();
      await page.getByRole('heading', { name: 'Effects pooled' }).waitFor();
      await page.getByRole('heading', { name: 'Leave-one-paper-out' }).waitFor();
      const effects = await page.getByRole('table', { name: /one row per effect/i }).locator('tbody tr').count();
      assert.ok(effects >= 3, `expected effect rows, saw ${effects}`);
      // the forest plot draws a paper line per paper
      const paperLines = await page.evaluate(() => {
        const el = document.querySelector('figure[aria-label="Forest plot"] .js-plotly-plot') as unknown as { data?: Array<{ meta?: string }> } | null;
        return el?.data?.filter((t) => t.meta === 'paper').length ?? 0;
      });
      assert.ok(paperLines >= 2, `expected paper lines in the forest plot, saw ${paperLines}`);
      assert.equal(await page.getByLabel('Several effects in one study').inputValue(), 'multilevel');

      // model-based variance, chosen on the form
      await page.getByLabel('Robust variance (CR2, Satterthwaite df)').uncheck();
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.waitForURL(/robust=0/);
      await page.getByText(/Three-level model \(REML\) ·/).waitFor({ timeout: 40_000 });

      await page.getByLabel('Snapshot title (optional)').fill('Luminance, three-level model, browser check');
      await page.getByRole('button', { name: 'Save snapshot' }).click();
      const saved = page.getByRole('status').filter({ hasText: 'Saved' });
      await saved.waitFor();
      await page.goto(appUrl((await saved.getByRole('link').getAttribute('href'))!));
      await page.getByRole('heading', { name: 'Luminance, three-level model, browser check' }).waitFor();
      await page.getByText(/three-level model \(effects within papers, REML\), model-based variance/).waitFor();
    },
  },
];
