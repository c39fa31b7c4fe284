import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { signInThroughPage } from './browser.js';
import { openOwnSheet } from './own-sheet.js';

export const specs: Spec[] = [
  {
    name: 'the sheet computes effects from a ratio CI, a percent-change CI and 2×2 counts, and refuses an interval not centred on its ratio in words',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await openOwnSheet(page, 'forms', 'Ratios and judgement counts');
      await page.getByRole('button', { name: '+ Add a study' }).click();
      const study = page.getByRole('region', { name: 'Study 1' });
      const effect = (j: number) => study.getByRole('group', { name: `Study 1, effect ${j}` });
      const start = async (j: number, form: string) => {
        if (j > 1) await study.getByRole('button', { name: '+ Add an effect to study 1' }).click();
        await effect(j).getByLabel('Outcome kind').selectOption('duration_distortion');
        await effect(j).getByLabel('Manipulation').selectOption('luminance');
        await effect(j).getByLabel('Reported as').selectOption(form);
      };
      const fill = async (j: number, values: Record<string, string>) => {
        for (const [label, v] of Object.entries(values)) await effect(j).getByLabel(label, { exact: true }).fill(v);
      };
      const computed = async (j: number) => (await effect(j).getByTestId('computed-effect').textContent())?.trim();

      // a ratio with its CI: ln 1.2, SE from the interval on the log scale
      await start(1, 'ratio_ci');
      await fill(1, { 'Ratio (e.g. perceived/physical duration)': '1.2', 'CI lower': '1.0', 'CI upper': '1.44' });
      await effect(1).getByTestId('effect-result').getByText(/log ratio of means/).waitFor();
      assert.equal(await computed(1), Math.log(1.2).toFixed(3));
      assert.match((await effect(1).getByTestId('formula').textContent()) ?? '', /Source:/);

      // a percent change with its CI: ln 1.12
      await start(2, 'percent_change');
      await fill(2, { 'Percent change (e.g. 12 for +12%)': '12', 'CI lower': '5', 'CI upper': '19' });
      await effect(2).getByTestId('computed-effect').waitFor();
      assert.equal(await computed(2), Math.log(1.12).toFixed(3));

      // 2×2 counts of “longer”/“shorter” judgements: a log odds ratio, recorded as the odds of a response
      await start(3, 'counts_2x2');
      await fill(3, {
        'Group 1: count of one response (e.g. “longer”)': '31',
        'Group 1: count of the other response (e.g. “shorter”)': '9',
        'Group 2: count of the one response': '18',
        'Group 2: count of the other response': '22',
      });
      await effect(3).getByTestId('effect-result').getByText(/log odds ratio/).waitFor();
      assert.equal(await computed(3), Math.log((31 * 22) / (9 * 18)).toFixed(3));
      await effect(3).getByTestId('effect-result').getByText(/n = 80/).waitFor();
      assert.match((await effect(3).getByLabel('Parameter (what was measured)').locator('option').first().textContent()) ?? '', /usual: Odds of a response/);
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });

      // an interval not centred on the ratio on either scale is refused beside its field, in words that name the field by its label
      await effect(1).getByLabel('CI upper', { exact: true }).fill('1.6');
      await effect(1).getByLabel('CI lower', { exact: true }).fill('1.1');
      await effect(1).getByText(/the interval 1.1 to 1.6 is not centred on “Ratio \(e.g. perceived\/physical duration\)” 1.2 on either scale \(halves 0.087 and 0.288 on the log scale, 0.1 and 0.4 in “Ratio \(e.g. perceived\/physical duration\)” units\)/).first().waitFor();
      assert.equal(await effect(1).getByTestId('computed-effect').count(), 0);

      // the two good effects were saved with their forms: after a reload they compute again
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });
      await page.reload();
      await effect(3).getByTestId('computed-effect').waitFor();
      assert.equal(await computed(3), Math.log((31 * 22) / (9 * 18)).toFixed(3));
      assert.equal(await effect(2).getByLabel('Reported as').inputValue(), 'percent_change');
    },
  },
];
