import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { countsCsv, inventTrials, ORDER_SOAS } from '../support/trials.js';

async function openTrialSheet(page: Page) {
  await signInThroughPage(page, 'coder1');
  await page.goto(appUrl('/extractions?state=draft'));
  await page.getByRole('heading', { name: 'My coding' }).waitFor();
  await page.getByRole('link', { name: /Brightwater/ }).first().click();
  await page.getByRole('heading', { name: /Extraction sheet/ }).waitFor();
  await page.getByRole('heading', { name: 'Trial data' }).waitFor();
}

export const specs: Spec[] = [
  {
    name: 'a contributor uploads trial data, reads a refused row in words, sees the fits and codes the effect two conditions give',
    async run(page) {
      await openTrialSheet(page);
      // The demo's fitted sets are there with their table and plot.
      const demo = page.getByRole('article', { name: 'Trial data: Experiment 1, order task' });
      await demo.getByTestId('fit-summary').waitFor();
      await demo.locator('[data-plot] .main-svg').first().waitFor({ timeout: 40_000 });
      const lines = inventTrials({ task: 'order', participants: 4, conditions: { near: 0, far: 50 }, levels: ORDER_SOAS, trialsPerLevel: 12, seed: 9301 });
      const good = countsCsv(lines);
      const bad = good.split('\n');
      bad[3] = 'P01,near,-120,12,15';
      const form = page.getByRole('form', { name: 'Upload trial data' });
      await form.getByLabel('Name of the data set').fill('Pilot, order task');
      await form.getByLabel('Bootstrap resamples per fit').fill('200');
      await form.getByLabel('CSV file').setInputFiles({ name: 'pilot.csv', mimeType: 'text/csv', buffer: Buffer.from(bad.join('\n')) });
      await form.getByRole('button', { name: 'Upload and fit' }).click();
      const refusal = form.getByRole('alert');
      await refusal.getByText(/nothing was stored/).waitFor();
      assert.match((await refusal.getByRole('list', { name: 'Rows with problems' }).textContent()) ?? '', /Line 4:/);
      await form.getByLabel('CSV file').setInputFiles({ name: 'pilot.csv', mimeType: 'text/csv', buffer: Buffer.from(good) });
      await form.getByRole('button', { name: 'Upload and fit' }).click();
      await form.getByRole('status').getByText(/4 participants, 2 conditions/).waitFor();
      const pilot = page.getByRole('article', { name: 'Trial data: Pilot, order task' });
      await pilot.getByTestId('fit-summary').waitFor({ timeout: 60_000 });
      assert.match((await pilot.getByTestId('fit-summary').textContent()) ?? '', /8 fits \(200 resamples each\)/);
      await pilot.locator('[data-plot] .main-svg').first().waitFor({ timeout: 40_000 });
      const chooser = pilot.getByRole('region', { name: 'Effect from Pilot, order task' });
      await chooser.getByLabel('Condition A').selectOption('far');
      await chooser.getByLabel('Condition B (reference)').selectOption('near');
      const result = chooser.getByTestId('contrast-result');
      await result.getByText(/from 4 participants/).waitFor();
      assert.match((await result.textContent()) ?? '', /observed r = -?\d\.\d\d/);
      await chooser.getByRole('button', { name: 'Code this effect on the sheet' }).click();
      await chooser.getByRole('status').getByText(/Coded "far vs near/).waitFor();
      const studies = page.getByRole('region', { name: /^Study \d+$/ });
      const last = studies.last();
      assert.equal(await last.getByLabel('Label (what was contrasted)').inputValue(), 'far vs near: PSS (point of subjective simultaneity)');
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });
      await page.reload();
      await page.getByRole('region', { name: /^Study \d+$/ }).last().getByTestId('computed-effect').waitFor();
    },
  },
  {
    name: 'trial data fit a phone-width screen: the fit table scrolls in its box',
    async run(page) {
      await page.setViewportSize({ width: 390, height: 844 });
      await openTrialSheet(page);
      await page.getByRole('article', { name: 'Trial data: Experiment 2, simultaneity task' }).getByTestId('fit-summary').waitFor();
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      assert.ok(overflow <= 1, `the page is ${overflow}px wider than the screen`);
    },
  },
];
