import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';
import { SIGN_CONVENTIONS } from '../../shared/vocabulary/parameters.js';
import { labelOf } from '../../shared/vocabulary/labels.js';
import { NOT_CLINICAL } from '../../shared/synthesis/cautions.js';

const forestSvg = 'figure[aria-label="Forest plot"] svg.main-svg';

export const specs: Spec[] = [
  {
    name: 'a synthesis over several metrics is not pooled: the refusal says why in words and offers each metric as a button that pools',
    async run(page) {
      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      const refusal = page.getByRole('alert').filter({ hasText: 'Not pooled' });
      await refusal.waitFor({ timeout: 40_000 });
      const text = (await refusal.textContent()) ?? '';
      assert.match(text, /metrics \(Hedges' g_s \(independent groups\): \d+/);
      assert.doesNotMatch(text, /["{}]|filters|smdFamily/, 'no request syntax on the screen');
      const choices = page.getByRole('group', { name: 'Pool one quantity instead' });
      assert.ok((await choices.getByRole('button').count()) >= 2);
      await choices.getByRole('button', { name: /raw-score standardized/ }).click();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      assert.equal(await page.getByRole('alert').filter({ hasText: 'Not pooled' }).count(), 0);
      assert.match(page.url(), /raw_score/, 'the address keeps the choice');
    },
  },
  {
    name: 'a reviewer filters by one manipulation, sees the forest plot, saves a snapshot that opens signed out',
    async run(page) {
      await signInThroughPage(page, 'reviewer');
      await page.getByRole('banner').getByRole('link', { name: 'Synthesis' }).click();
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      // one square per study in the drawn SVG
      const rows = await page.getByRole('table', { name: /one row per study/i }).locator('tbody tr').count();
      assert.ok(rows >= 3, `expected at least 3 studies, saw ${rows}`);
      const estimate = (await page.getByTestId('pooled-estimate').textContent())!;
      assert.match(estimate, /\d\.\d{3}/);
      assert.ok(page.url().includes('manipulation=luminance'));

      await page.getByLabel('Snapshot title (optional)').fill('Luminance and duration, browser check');
      await page.getByRole('button', { name: 'Save snapshot' }).click();
      const saved = page.getByRole('status').filter({ hasText: 'Saved' });
      await saved.waitFor();
      const href = (await saved.getByRole('link').getAttribute('href'))!;
      assert.match(href, /^\/snapshots\/[a-z0-9]+$/);

      await signOut(page);
      await page.goto(appUrl(href));
      await page.getByRole('heading', { name: 'Luminance and duration, browser check' }).waitFor();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      assert.equal(await page.getByTestId('pooled-estimate').textContent(), estimate);
      assert.equal(await page.getByRole('link', { name: /BibTeX/ }).count(), 1);
      assert.equal(await page.getByRole('button', { name: 'Save snapshot' }).count(), 0);
      const csv = await page.request.get(appUrl(`/api${href}/export.csv`));
      assert.equal(csv.status(), 200);
      assert.match((await csv.text()).split('\n')[0], /effect,variance/);
    },
  },
  {
    name: 'the Analyses section: several moderators with Knapp–Hartung, one shared τ² in subgroups, I² by estimator, Begg with its p, all in words',
    async run(page) {
      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByLabel('Estimator').selectOption('REML');
      await page.getByLabel('Hartung–Knapp–Sidik–Jonkman').check();
      await page.getByLabel('Subgroups by').selectOption('design');
      await page.getByLabel('Between-study variance in subgroups').selectOption('pooled');
      await page.getByRole('group', { name: 'Meta-regression on several moderators' }).getByLabel(labelOf('moderator', 'year')).check();
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      const section = page.locator('section[aria-labelledby="analyses-heading"]');
      await section.getByRole('heading', { name: 'Analyses', level: 2 }).waitFor({ timeout: 40_000 });
      assert.ok(page.url().includes('subgroupTau2=pooled') && page.url().includes('moderators=year'), page.url());

      // the pooled row and every refit row use the estimator's own I² definition
      await page.getByRole('rowheader', { name: `I² (${labelOf('i2Definition', 'tau')})` }).waitFor();
      // τ² and I² by every estimator, the one used marked
      const estimators = section.getByRole('table', { name: /pooled by each estimator/ });
      assert.equal(await estimators.locator('tbody tr').count(), 4);
      assert.match((await estimators.locator('tbody tr').nth(2).textContent()) ?? '', /^◆ REML/);
      // subgroups with one shared τ², tested by the factor's F
      const subgroupTest = (await section.getByTestId('subgroup-test').textContent()) ?? '';
      assert.ok(subgroupTest.includes(labelOf('subgroupTau2', 'pooled')), subgroupTest);
      // the several-moderator fit: its terms in words, QM as F on (1, k − 2)
      const summary = (await section.getByTestId('regression-summary').textContent()) ?? '';
      assert.match(summary, /Test of the moderators: F\(1, \d+\) = \d+\.\d{2}/);
      const terms = section.getByRole('table').filter({ has: page.getByTestId('regression-summary') }).locator('tbody tr td:first-child');
      assert.deepEqual(await terms.allTextContents(), ['Intercept', labelOf('moderator', 'year')]);
      // Begg's p says which distribution it comes from
      const begg = (await section.getByTestId('begg-p').textContent()) ?? '';
      assert.ok([labelOf('pMethod', 'exact'), labelOf('pMethod', 'normal')].some((w) => begg.includes(w)), begg);
      // no stored code on the section
      const text = (await section.textContent()) ?? '';
      assert.doesNotMatch(text, /standardMs|chisq|subgroupTau2|p_method|I2_tau|_/);

      await page.reload();
      await section.getByTestId('regression-summary').waitFor({ timeout: 40_000 });
      assert.equal(await page.getByLabel('Between-study variance in subgroups').inputValue(), 'pooled');
    },
  },
  {
    name: 'signed out, the atlas shows a manipulation with its forest plot and opens it as a synthesis without a save button',
    async run(page) {
      await page.goto(appUrl('/atlas'));
      // the overview: each manipulation's current estimate with k and the sign convention in words, one clinical caution
      const row = page.getByRole('row').filter({ has: page.getByRole('link', { name: 'Numerosity', exact: true }) });
      const estimate = row.getByTestId('atlas-estimate').first();
      await estimate.waitFor();
      assert.match((await estimate.getByTestId('atlas-k').textContent()) ?? '', /^k = \d+ stud(y|ies) \(\d+ effects?\)$/);
      assert.equal(await estimate.getByTestId('atlas-sign').textContent(), `Sign: ${SIGN_CONVENTIONS.duration_distortion}`);
      assert.ok(((await estimate.textContent()) ?? '').includes(labelOf('outcome', 'duration_distortion')));
      assert.equal(await page.getByText(NOT_CLINICAL).count(), 1);
      assert.equal(await page.getByRole('note').filter({ hasText: 'Not clinical guidance' }).count(), 1);
      await page.getByRole('link', { name: 'Numerosity' }).click();
      await page.getByRole('heading', { name: 'Numerosity', level: 1 }).waitFor();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      await page.getByRole('link', { name: 'Open as a synthesis →' }).first().click();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      await page.getByText(/Sign in.*as a reviewer to freeze/).waitFor();
      assert.equal(await page.getByRole('button', { name: 'Save snapshot' }).count(), 0);
      // the funnel plot's trim-and-fill points appear on request
      const box = page.getByLabel(/Show the studies trim-and-fill imputes/);
      if (await box.isEnabled()) await box.check();
      await page.locator('figure[aria-label="Funnel plot"] svg.main-svg').first().waitFor({ timeout: 40_000 });
    },
  },
];
