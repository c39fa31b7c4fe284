import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';
import { fillStudy, openOwnSheet } from './own-sheet.js';

export const specs: Spec[] = [
  {
    name: 'the coding sheet says how to get a raw-score g from a g_z, and offers the allowed parameters as buttons when a save is refused',
    async run(page) {
      await signInThroughPage(page, 'curator');
      const headers = { Origin: new URL(process.env.APP_ORIGIN!).origin };
      const list = await page.request.get(appUrl('/api/extractions/claimable?pageSize=1&sort=reference&order=desc'));
      const [ref] = ((await list.json()) as { items: { id: number }[] }).items;
      assert.ok(ref, 'the demo data offers a reference to claim');
      const claimed = await page.request.post(appUrl('/api/extractions'), { headers, data: { referenceId: ref.id } });
      assert.equal(claimed.status(), 201);
      await page.goto(appUrl(`/extractions/${((await claimed.json()) as { id: number }).id}`));
      await page.getByRole('heading', { name: /Extraction sheet/ }).waitFor();

      await page.getByRole('button', { name: '+ Add a study' }).click();
      const study = page.getByRole('region', { name: 'Study 1' });
      await fillStudy(study, { design: 'within', n: '20', population: 'healthy_adults', modality: 'audiovisual', task: 'temporal_order_judgement' });
      const effect = study.getByRole('group', { name: 'Study 1, effect 1' });
      await effect.getByLabel('Outcome kind').selectOption('temporal_order');
      await effect.getByText(/Sign: positive = the PSS moves/).waitFor();
      await effect.getByLabel('Parameter (what was measured)').selectOption('pss');
      await effect.getByLabel('Manipulation').selectOption('expectation');
      await effect.getByLabel('Reported as').selectOption('smd_paired');
      await effect.getByLabel('t', { exact: true }).fill('2.4');
      await effect.getByLabel('n (participants)', { exact: true }).fill('20');

      // a paired t without r is g_z, and the sheet says how to get a raw-score g
      const advice = effect.getByTestId('gz-advice');
      await advice.waitFor();
      assert.match((await advice.textContent()) ?? '', /never pooled with g_s, g_av or g_rm\. Enter the correlation r between the conditions/);
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });

      // PSS is not a duration-distortion parameter: the save is refused and the allowed ones are offered
      await effect.getByLabel('Outcome kind').selectOption('duration_distortion');
      const choices = page.getByRole('group', { name: 'Choices for Study 1, effect 1' });
      await choices.waitFor({ timeout: 20_000 });
      await choices.getByText(/Duration distortion records Perceived-duration ratio, PSE, Bisection point, Weber fraction, Odds of a response, not PSS/).waitFor();
      await choices.getByRole('button', { name: 'Keep PSS (ms): outcome kind Temporal order' }).waitFor();
      await effect.getByText(/not PSS/).waitFor();
      await choices.getByRole('button', { name: 'PSE (ms)' }).click();
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });
      assert.equal(await choices.count(), 0);

      // the choice was saved: after a reload the sheet holds PSE in ms
      await page.reload();
      const again = page.getByRole('group', { name: 'Study 1, effect 1' });
      await again.getByLabel('Parameter (what was measured)').waitFor();
      assert.equal(await again.getByLabel('Parameter (what was measured)').inputValue(), 'pse');
      assert.equal(await again.getByLabel('Unit', { exact: true }).inputValue(), 'ms');
      assert.equal(await again.getByLabel('Outcome kind').inputValue(), 'duration_distortion');

      // entering r turns the g_z into a raw-score g_rm, and the advice goes
      await again.getByLabel('r (reported correlation)', { exact: true }).fill('0.6');
      await again.getByTestId('effect-result').getByText(/Hedges' g_rm/).waitFor();
      assert.equal(await again.getByTestId('gz-advice').count(), 0);
    },
  },
  {
    name: 'an effect from a p bound is flagged on the sheet, and a synthesis can leave such effects out (the address keeps it)',
    async run(page) {
      await signInThroughPage(page, 'curator');
      await openOwnSheet(page, 'bound', 'Dimmer flashes and a p bound');
      await page.getByRole('button', { name: '+ Add a study' }).click();
      const effect = page.getByRole('region', { name: 'Study 1' }).getByRole('group', { name: 'Study 1, effect 1' });
      await effect.getByLabel('Outcome kind').selectOption('duration_distortion');
      await effect.getByLabel('Manipulation').selectOption('luminance');
      await effect.getByLabel('Reported as').selectOption('smd');
      await effect.getByLabel('p below (a bound, e.g. 0.001)', { exact: true }).fill('0.001');
      await effect.getByLabel('n 1', { exact: true }).fill('20');
      await effect.getByLabel('n 2', { exact: true }).fill('20');
      await effect.getByLabel('Direction (1: group 1 higher, −1: lower)', { exact: true }).fill('1');
      await effect.getByTestId('bound-flag').getByText(/Computed from a bound/).waitFor();
      await page.getByTestId('save-state').getByText(/Saved at/).waitFor({ timeout: 20_000 });

      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByLabel('Leave out effects computed from a bound (p < …)').check();
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.getByTestId('pooled-estimate').waitFor({ timeout: 40_000 });
      assert.match(new URL(page.url()).search, /excludeBound=1/);
      await page.reload();
      await page.getByTestId('pooled-estimate').waitFor({ timeout: 40_000 });
      assert.equal(await page.getByLabel('Leave out effects computed from a bound (p < …)').isChecked(), true);
    },
  },
];
