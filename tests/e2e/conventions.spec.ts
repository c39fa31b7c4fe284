import assert from 'node:assert/strict';
import type { Locator, Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { fillStudy, openOwnSheet } from './own-sheet.js';


type SavedEffect = { label: string; parameter?: string; unit?: string; reported: Record<string, number>; computed: { effect: number; signReversed?: boolean } | null };
type SavedStudy = { label: string; task?: string; effects: SavedEffect[] };

async function savedStudies(page: Page, id: number): Promise<SavedStudy[]> {
  const res = await page.request.get(appUrl(`/api/extractions/${id}`));
  assert.equal(res.status(), 200);
  return ((await res.json()) as { studies: SavedStudy[] }).studies;
}

/** The saved sheet once it holds what the predicate waits for (autosave runs two seconds after the last change). */
async function untilSaved(page: Page, id: number, what: string, ready: (studies: SavedStudy[]) => boolean): Promise<SavedStudy[]> {
  const until = Date.now() + 30_000;
  for (;;) {
    const studies = await savedStudies(page, id);
    if (ready(studies)) return studies;
    assert.ok(Date.now() < until, `the sheet was not saved with ${what}: ${JSON.stringify(studies)}`);
    await page.waitForTimeout(500);
  }
}

/** The words of a select's chosen option. */
const chosen = async (select: Locator) => ((await select.locator('option:checked').textContent()) ?? '').trim();

const saved = (page: Page) => page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });

export const specs: Spec[] = [
  {
    name: 'a lower PSE in bisection: the sheet says it reversed the sign, and the saved effect is positive with the values kept as entered',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const id = await openOwnSheet(page, 'sign', 'Dim discs and the bisection PSE');
      await page.getByRole('button', { name: '+ Add a study' }).click();
      const study = page.getByRole('region', { name: 'Study 1' });
      await fillStudy(study, { design: 'within', n: '20', population: 'healthy_adults', modality: 'visual', task: 'bisection' });
      const effect = study.getByRole('group', { name: 'Study 1, effect 1' });
      await effect.getByLabel('Label (what was contrasted)').fill('bright vs dim');
      await effect.getByLabel('Outcome kind').selectOption('duration_distortion');
      await effect.getByText(/Sign: positive = the manipulation lengthens perceived duration \(for a PSE or bisection point a lower value means longer\)/).waitFor();
      await effect.getByLabel('Parameter (what was measured)').selectOption('pse');
      await effect.getByLabel('Unit', { exact: true }).selectOption('ms');
      await effect.getByLabel('Manipulation').selectOption('luminance');
      await effect.getByLabel('Reported as').selectOption('mean_diff');
      // the paper: the PSE was 30 ms lower under the brighter discs
      await effect.getByLabel('Mean difference', { exact: true }).fill('-30');
      await effect.getByLabel('SD of the differences', { exact: true }).fill('60');
      await effect.getByLabel('n (participants)', { exact: true }).fill('20');

      const note = effect.getByTestId('sign-reversed');
      const words =
        '⇄ The sheet reversed the sign: for a PSE in bisection a lower value means the manipulation lengthened perceived duration (positive = the manipulation lengthens perceived duration). The reported values are kept as entered.';
      await note.waitFor();
      assert.equal((await note.textContent())?.trim(), words);
      assert.equal((await effect.getByTestId('computed-effect').textContent())?.trim(), '30.000');
      await saved(page);

      // the server stored the reversed effect, flagged, and kept the reported −30
      const [s] = await untilSaved(page, id, 'the n of the effect', (st) => st[0]?.effects[0]?.reported.n === 20);
      assert.equal(s.effects.length, 1);
      assert.equal(s.effects[0].reported.mean_diff, -30);
      assert.deepEqual([s.effects[0].computed?.effect, s.effects[0].computed?.signReversed], [30, true]);

      // after a reload the sheet says the same, and the entered value is still −30
      await page.reload();
      const again = page.getByRole('region', { name: 'Study 1' }).getByRole('group', { name: 'Study 1, effect 1' });
      await again.getByTestId('sign-reversed').waitFor();
      assert.equal((await again.getByTestId('sign-reversed').textContent())?.trim(), words);
      assert.equal((await again.getByTestId('computed-effect').textContent())?.trim(), '30.000');
      assert.equal(await again.getByLabel('Mean difference', { exact: true }).inputValue(), '-30');

      // a PSE in reproduction keeps its sign: the note goes, and so does the reversal on save
      await page.getByRole('region', { name: 'Study 1' }).getByLabel('Task', { exact: true }).selectOption('reproduction');
      await again.getByTestId('computed-effect').getByText('-30.000').waitFor();
      assert.equal(await again.getByTestId('sign-reversed').count(), 0);
      const [r] = await untilSaved(page, id, 'the reproduction task', (st) => st[0]?.task === 'reproduction');
      assert.equal(r.task, 'reproduction');
      assert.deepEqual([r.effects[0].computed?.effect, r.effects[0].computed?.signReversed], [-30, false]);
    },
  },
  {
    name: 'a synthesis over two outcome kinds is refused in words, its choices are buttons only, and one of them pools',
    async run(page) {
      await signInThroughPage(page, 'reviewer');
      await page.getByRole('banner').getByRole('link', { name: 'Synthesis' }).click();
      // speed and motion was coded as duration distortion and as positional lag; the outcome kind stays on Any
      await page.getByLabel('Manipulation').selectOption(['speed_motion']);
      assert.equal(await page.getByLabel('Outcome kind').inputValue(), '');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      const refusal = page.getByRole('alert').filter({ hasText: 'Not pooled' });
      await refusal.waitFor({ timeout: 40_000 });
      const text = ((await refusal.textContent()) ?? '').trim();
      assert.match(
        text,
        /^✕ Not pooled: These effects are of 2 outcome kinds \((Duration distortion: \d+, Positional lag: \d+|Positional lag: \d+, Duration distortion: \d+)\); a synthesis pools one outcome kind, parameter, unit and metric at a time\. Choose one to pool\.$/,
      );
      assert.doesNotMatch(text, /["{}_]|filters|outcome"/, 'no request syntax or stored code in the refusal');
      assert.equal(await page.getByTestId('pooled-estimate').count(), 0);

      // the choices: buttons only, each in words
      const choices = page.getByRole('group', { name: 'Pool one quantity instead' });
      const buttons = choices.getByRole('button');
      assert.ok((await buttons.count()) >= 2, 'a choice per outcome kind at least');
      assert.equal(await choices.locator('a, input, select, textarea, code').count(), 0, 'nothing but buttons to take');
      for (const label of await buttons.allTextContents()) {
        assert.match(label, /^Only (Duration distortion|Positional lag) · .+ \(\d+ effects?\)$/);
        // metric labels may say g_z; no stored term or request syntax
        assert.doesNotMatch(label, /duration_distortion|positional_lag|mean_diff|["{}]/, label);
      }
      const lag = choices.getByRole('button', { name: /^Only Positional lag · Lag \(ms\) · / });
      assert.equal(await lag.count(), 1);
      await lag.click();

      await page.getByTestId('pooled-estimate').waitFor({ timeout: 40_000 });
      // a lag in ms, with its interval
      const estimate = (await page.getByTestId('pooled-estimate').textContent())?.trim() ?? '';
      assert.match(estimate, /^-?\d+\.\d 95% CI \[-?\d+\.\d, -?\d+\.\d\]$/);
      assert.equal(await page.getByRole('alert').filter({ hasText: 'Not pooled' }).count(), 0);
      const search = new URL(page.url()).searchParams;
      assert.equal(search.get('outcome'), 'positional_lag', page.url());
      // the form shows the choice it ran
      assert.equal(await page.getByLabel('Outcome kind').inputValue(), 'positional_lag');
      // the address keeps it: a reload pools the same
      await page.reload();
      await page.getByTestId('pooled-estimate').waitFor({ timeout: 40_000 });
      assert.equal((await page.getByTestId('pooled-estimate').textContent())?.trim(), estimate);
      assert.equal(await page.getByRole('alert').filter({ hasText: 'Not pooled' }).count(), 0);
    },
  },
  {
    name: 'CSV bulk entry with parameter and unit columns: a good file joins the sheet with its labels; a parameter its outcome kind does not allow is refused naming the allowed terms, and nothing of it is written',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const id = await openOwnSheet(page, 'csv', 'Bulk-entered PSEs and percentages');
      await page.getByText('No studies yet.', { exact: false }).waitFor();
      await page.getByRole('form', { name: 'Extraction sheet' }).getByText('Add effects from a CSV (bulk entry)').click();

      const head = 'study,design,n1_study,population,modality,task,label,outcome,parameter,unit,manipulation,form,mean_diff,sd_diff,n,percent,se';
      const good = [
        head,
        'Experiment 1,within,20,healthy_adults,visual,two_interval_comparison,bright vs dim PSE,duration_distortion,pse,ms,luminance,mean_diff,-25,50,20,,',
        'Experiment 1,within,20,healthy_adults,visual,two_interval_comparison,bright vs dim ratio,duration_distortion,duration_ratio,percent,luminance,percent_change,,,20,8,2.5',
      ].join('\n');
      const sheet = page.getByRole('form', { name: 'Extraction sheet' });
      await sheet.getByLabel('CSV file').setInputFiles({ name: 'effects.csv', mimeType: 'text/csv', buffer: Buffer.from(good) });
      const report = page.getByRole('status').filter({ hasText: 'added to the sheet' });
      await report.getByText('✓ 2 rows added to the sheet.').waitFor();
      assert.equal(await report.getByRole('list', { name: 'Rows not added' }).count(), 0);

      const study = page.getByRole('region', { name: 'Study 1' });
      const effect = (j: number) => study.getByRole('group', { name: `Study 1, effect ${j}` });
      const quantityOf = async (j: number) => [await chosen(effect(j).getByLabel('Parameter (what was measured)')), await chosen(effect(j).getByLabel('Unit', { exact: true }))];
      await effect(2).waitFor();
      assert.deepEqual(await quantityOf(1), ['PSE', 'ms']);
      assert.deepEqual(await quantityOf(2), ['Perceived-duration ratio', '%']);
      // the PSE in two-interval comparison is reversed as if typed in
      await effect(1).getByTestId('sign-reversed').waitFor();
      assert.equal((await effect(1).getByTestId('computed-effect').textContent())?.trim(), '25.000');
      assert.equal((await effect(2).getByTestId('computed-effect').textContent())?.trim(), Math.log(1.08).toFixed(3));
      await untilSaved(page, id, 'both rows', (st) => st[0]?.effects.length === 2);

      // a parameter duration distortion does not allow, in a study of its own: refused with the allowed terms
      const bad = [head, 'Experiment 2,within,16,healthy_adults,visual,bisection,order shift,duration_distortion,pss,ms,luminance,mean_diff,-12,30,16,,'].join('\n');
      await sheet.getByLabel('or paste rows').fill(bad);
      await sheet.getByRole('button', { name: 'Add the rows' }).click();
      await report.getByText('✓ 0 rows added to the sheet.').waitFor();
      const refused = report.getByRole('list', { name: 'Rows not added' }).getByRole('listitem');
      assert.equal(await refused.count(), 1);
      assert.equal(
        (await refused.textContent())?.trim(),
        '✕ Line 2: parameter: Duration distortion records Perceived-duration ratio, PSE, Bisection point, Weber fraction, Odds of a response, not PSS ' +
          '(allowed: parameter duration_ratio with unit ratio; parameter pse with unit ms; parameter bisection_point with unit ms; parameter weber_fraction with unit none; parameter response_odds with unit none; outcome temporal_order; outcome recalibration_shift)',
      );
      // nothing of the refused row on the sheet: no second study, no third effect
      assert.equal(await page.getByRole('region', { name: 'Study 2' }).count(), 0);
      assert.equal(await study.getByRole('group', { name: /^Study 1, effect \d+$/ }).count(), 2);

      // the saved sheet holds the good rows only, with their parameters and units, after a reload too
      await page.getByRole('button', { name: 'Save now' }).click();
      await saved(page);
      const studies = await savedStudies(page, id);
      assert.deepEqual(
        studies.map((s) => [s.label, s.effects.map((e) => [e.label, e.parameter, e.unit, e.computed?.signReversed])]),
        [['Experiment 1', [['bright vs dim PSE', 'pse', 'ms', true], ['bright vs dim ratio', 'duration_ratio', 'percent', false]]]],
      );
      await page.reload();
      await effect(2).waitFor();
      assert.deepEqual(await quantityOf(1), ['PSE', 'ms']);
      assert.deepEqual(await quantityOf(2), ['Perceived-duration ratio', '%']);
      assert.equal(await page.getByRole('region', { name: 'Study 2' }).count(), 0);
    },
  },
];
