import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

const stamp = Date.now().toString(36);
const forestSvg = 'figure[aria-label="Forest plot"] svg.main-svg';

export const specs: Spec[] = [
  {
    name: 'a curator’s forms name what is wrong beside the field, in words, and save once it is right',
    async run(page) {
      await signInThroughPage(page, 'curator');

      // API token: a name is required.
      await page.goto(appUrl('/settings/tokens'));
      await page.getByRole('button', { name: 'Create token' }).click();
      await page.getByText('✕ give the token a name').waitFor();
      await page.getByLabel('Token name').fill(`script ${stamp}`);
      await page.getByRole('button', { name: 'Create token' }).click();
      await page.getByRole('status').filter({ hasText: 'Copy this token now' }).waitFor();
      await page.getByRole('cell', { name: `script ${stamp}` }).waitFor();
      assert.equal(await page.getByText('✕ give the token a name').count(), 0);

      // Vocabulary: the term's own rule and the label's length, then a good term, then a rename.
      await page.goto(appUrl('/manipulations'));
      await page.getByLabel('Term (stable slug)').fill('Bad Term!');
      await page.getByLabel('Label', { exact: true }).fill('X');
      await page.getByRole('button', { name: 'Add the term' }).click();
      await page.getByText('✕ lower-case letters, digits and single underscores (e.g. emotional_arousal)').waitFor();
      await page.getByText('✕ at least 2 characters').waitFor();
      const term = `probe_${stamp}`;
      await page.getByLabel('Term (stable slug)').fill(term);
      await page.getByLabel('Label', { exact: true }).fill(`Probe ${stamp}`);
      await page.getByRole('button', { name: 'Add the term' }).click();
      await page.getByText('✓ Added').waitFor();
      const label = page.getByLabel(`Label of ${term}`);
      await label.waitFor();
      await label.fill('P');
      await page.getByRole('row', { name: new RegExp(term) }).getByRole('button', { name: 'Rename' }).click();
      await page.getByRole('row', { name: new RegExp(term) }).getByText('✕ at least 2 characters').waitFor();
      await label.fill(`Probe ${stamp} renamed`);
      await page.getByRole('row', { name: new RegExp(term) }).getByRole('button', { name: 'Rename' }).click();
      await page.getByRole('row', { name: new RegExp(term) }).getByRole('button', { name: 'Rename' }).and(page.locator(':disabled')).waitFor();
      await page.reload();
      assert.equal(await page.getByLabel(`Label of ${term}`).inputValue(), `Probe ${stamp} renamed`);

      // Double coding: the same person twice is refused by the schema the server uses.
      await page.goto(appUrl('/assignments'));
      await page.getByLabel('also show coded references').check();
      const table = page.getByRole('table').first();
      // wait for the list with coded references, then pin one row by its reference (the list re-sorts on refetch)
      await table.getByText('settled').first().waitFor();
      const reference = (await table.locator('tbody tr').first().getByRole('link').first().textContent())!.trim();
      const row = table.locator('tbody tr').filter({ has: page.getByRole('link', { name: reference, exact: true }) });
      const first = row.getByRole('combobox', { name: /^First coder/ });
      const value = await first.locator('option').nth(1).getAttribute('value');
      await first.selectOption(value!);
      await row.getByRole('combobox', { name: /^Second coder/ }).selectOption(value!);
      await row.getByRole('button', { name: 'Assign' }).click();
      await row.getByText('✕ choose two different coders').waitFor();

      // Screening a reference: optional reason on title and abstract, required at full text.
      const imported = await page.request.post(appUrl('/api/imports'), {
        headers: { Origin: new URL(process.env.APP_ORIGIN!).origin },
        data: { format: 'bibtex', text: `@article{forms${stamp}, title={Forms check ${stamp} on empty intervals}, author={Formwright, Ida}, year={2019}, journal={Invented Timing Reports}, doi={10.5555/forms.${stamp}}}` },
      });
      assert.equal(imported.status(), 201);
      const refId = ((await imported.json()) as { entries: { referenceId?: number }[] }).entries[0]!.referenceId!;
      await page.goto(appUrl(`/references/${refId}`));
      await page.getByRole('button', { name: 'Record decision' }).waitFor();
      await page.getByRole('radio', { name: '✕ Exclude' }).check();
      await page.getByRole('combobox', { name: 'Reason' }).locator('option', { hasText: 'none (optional here)' }).waitFor({ state: 'attached' });
      await page.getByRole('radio', { name: '✓ Include' }).check();
      await page.getByRole('button', { name: 'Record decision' }).click();
      await page.getByText('✓ Recorded').waitFor();
      await page.getByRole('radio', { name: '✕ Exclude' }).check();
      await page.getByRole('combobox', { name: 'Reason' }).locator('option', { hasText: 'choose…' }).waitFor({ state: 'attached' });
      await page.getByRole('combobox', { name: 'Reason' }).selectOption({ value: '' });
      await page.getByRole('button', { name: 'Record decision' }).click();
      await page.getByText('✕ a full-text exclusion needs a reason').waitFor();
      await signOut(page);
    },
  },
  {
    name: 'the synthesis form names a bad year at its field; the address keeps only what differs from the defaults, and a bad address still opens',
    async run(page) {
      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('From year').fill('20');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.getByText('✕ a year has four digits').waitFor();
      assert.equal(new URL(page.url()).search, '');
      await page.getByLabel('From year').fill('2030');
      await page.getByLabel('To year').fill('2000');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.getByText('✕ the from-year must not be after the to-year').waitFor();
      assert.equal(new URL(page.url()).search, '');

      await page.getByLabel('From year').fill('');
      await page.getByLabel('To year').fill('');
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByLabel('Confidence level').fill('0.9');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      assert.equal(new URL(page.url()).search, '?manipulation=luminance&outcome=duration_distortion&level=0.9&smdFamily=raw_score');
      await page.getByTestId('pooled-estimate').getByText('90% CI').waitFor();

      // A hand-edited address: the bad parts fall back to their defaults, the rest runs.
      await page.goto(appUrl('/synthesis?manipulation=luminance&outcome=duration_distortion&smdFamily=raw_score&level=abc&method=XYZ&r=7'));
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });
      assert.equal(await page.getByLabel('Confidence level').inputValue(), '0.95');
      assert.equal(await page.getByLabel('Estimator').inputValue(), 'DL');
      assert.equal(await page.getByLabel('Assumed correlation r').inputValue(), '0.5');
      await page.getByTestId('pooled-estimate').getByText('95% CI').waitFor();

      // The references table's filters say the same about a year.
      await page.goto(appUrl('/references'));
      await page.getByLabel('Year from').fill('19');
      await page.getByText('✕ a year has four digits').waitFor();
      await page.getByLabel('Year from').fill('2019');
      assert.equal(await page.getByText('✕ a year has four digits').count(), 0);
    },
  },
];
