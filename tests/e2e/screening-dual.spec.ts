import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';
import { batchByKeys } from './screening-keys.js';

const ORIGIN = () => ({ Origin: new URL(process.env.APP_ORIGIN!).origin });

async function apiJson<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

/** Back to one screener, whoever is signed in (the other specs screen under the one-screener rule). */
async function backToOneScreener(page: Page) {
  await signOut(page).catch(() => undefined);
  await signInThroughPage(page, 'curator');
  const res = await page.request.put(appUrl('/api/screening/rule'), { headers: ORIGIN(), data: { screeners: 1 } });
  assert.equal(res.status(), 200);
}

export const specs: Spec[] = [
  {
    name: 'two screeners decide the same records differently, blind; the curator settles from the disagreement queue (a stale tab is refused), agreement shown',
    async run(page) {
      const stamp = Date.now();
      const titles = [`Blind pair tone durations ${stamp}`, `Blind pair flicker intervals ${stamp}`];
      try {
        // A curator sets the rule on the screen where curators manage screening.
        await signInThroughPage(page, 'curator');
        await page.goto(appUrl('/'));
        await page.getByRole('link', { name: 'Screen rule' }).first().click();
        await page.getByRole('heading', { name: 'Screening rule and disagreements' }).waitFor();
        await page.getByRole('radio', { name: /Two independent screeners/ }).check();
        await page.getByRole('button', { name: 'Save rule' }).click();
        await page.getByText('✓ Saved: two screeners.').waitFor();
        await page.getByText(/Now: two screeners, set by curator/).waitFor();
        const text = titles.map((t, i) => `@article{blind${stamp}${i}, title={${t}}, author={Pairing, Pia}, year={2020}, doi={10.5555/blind.${stamp}.${i}}}`).join('\n');
        const res = await page.request.post(appUrl('/api/imports'), { headers: ORIGIN(), data: { format: 'bibtex', text } });
        assert.equal(res.status(), 201);
        const body = (await res.json()) as { batch: { id: number }; entries: { referenceId: number }[] };
        const batch = body.batch.id;
        const ids = body.entries.map((e) => e.referenceId);
        await signOut(page);

        // The first screener includes both; they leave her list and nothing anywhere shows her decision.
        await signInThroughPage(page, 'coder1');
        await page.goto(appUrl(`/screening?batch=${batch}`));
        await page.getByRole('option', { name: new RegExp(titles[0]) }).getByText(`new in batch ${batch}`).waitFor();
        await batchByKeys(page, 2, 'inc');
        await page.getByText(/Last: ✓ Included on title and abstract: 2 records \(your blind decision; 2 waiting for the other screener or a curator\)/).waitFor();
        await page.getByText('Nothing is waiting from this batch.').waitFor();
        await signOut(page);

        // The second screener sees why they are there, not what the first decided, and excludes both.
        await signInThroughPage(page, 'coder2');
        await page.goto(appUrl(`/screening?batch=${batch}`));
        await page.getByRole('option', { name: new RegExp(titles[0]) }).getByText('◐ second screener needed').waitFor();
        await page.goto(appUrl(`/references/${ids[0]}`));
        await page.getByRole('button', { name: 'Record decision' }).waitFor();
        assert.equal(await page.getByRole('cell', { name: /Include/ }).count(), 0, 'the reference page shows no decision of the first screener');
        const detail = await apiJson<{ reference: { screeningStatus: string }; screening: unknown[] }>(page, `/api/references/${ids[0]}`);
        assert.deepEqual([detail.reference.screeningStatus, detail.screening.length], ['unscreened', 0]);
        await page.goto(appUrl(`/screening?batch=${batch}`));
        await page.getByRole('option', { name: new RegExp(titles[0]) }).waitFor();
        await batchByKeys(page, 2, 'not');
        await page.getByText(/your blind decision; 2 waiting for the other screener or a curator/).waitFor();
        await signOut(page);

        // The curator's reading list says "conflict" and leads to the disagreement queue.
        await signInThroughPage(page, 'curator');
        await page.goto(appUrl(`/screening?batch=${batch}`));
        await page.getByRole('option', { name: new RegExp(titles[0]) }).getByText('⚑ conflict: awaiting a curator’s settlement').waitFor();
        await page.getByRole('link', { name: 'settle it in the disagreement queue' }).click();
        const first = page.getByRole('listitem', { name: `Disagreement on ${titles[0]}` });
        const decisions = first.getByRole('table', { name: 'The two decisions' });
        await decisions.getByRole('row', { name: /coder1 ✓ Include/ }).waitFor();
        await decisions.getByRole('row', { name: /coder2 ✕ Exclude: Not about time perception/ }).waitFor();

        // A second tab of the same queue goes stale once the first settles a record.
        const stale = await page.context().newPage();
        await stale.goto(appUrl('/screening/disagreements'));
        await stale.getByRole('listitem', { name: `Disagreement on ${titles[1]}` }).waitFor();

        await first.getByRole('button', { name: 'Settle' }).click();
        await first.getByText(/✕ decision must be included or excluded/).waitFor();
        await first.getByRole('combobox', { name: 'Outcome' }).selectOption({ label: 'Include' });
        await first.getByRole('button', { name: 'Settle' }).click();
        await first.getByText(/✕ say why you settle it this way/).waitFor();
        await first.getByRole('textbox', { name: /^Why/ }).fill('An interval-timing task in adults; in scope.');
        await first.getByRole('button', { name: 'Settle' }).click();
        await first.waitFor({ state: 'detached' });

        const second = page.getByRole('listitem', { name: `Disagreement on ${titles[1]}` });
        await second.getByRole('combobox', { name: 'Outcome' }).selectOption({ label: 'Exclude: Not about time perception' });
        await second.getByRole('textbox', { name: /^Why/ }).fill('Flicker rate, not duration, is judged.');
        await second.getByRole('button', { name: 'Settle' }).click();
        await second.waitFor({ state: 'detached' });
        await page.getByText('No disagreement is waiting at this stage.').waitFor();

        const late = stale.getByRole('listitem', { name: `Disagreement on ${titles[1]}` });
        await late.getByRole('combobox', { name: 'Outcome' }).selectOption({ label: 'Include' });
        await late.getByRole('textbox', { name: /^Why/ }).fill('From an old tab.');
        await late.getByRole('button', { name: 'Settle' }).click();
        await stale.getByRole('alert').getByText(/changed since you opened it .*reload the disagreement queue/).waitFor();
        await stale.getByText('No disagreement is waiting at this stage.').waitFor();
        await stale.close();

        const statuses = await Promise.all(ids.map(async (id) => (await apiJson<{ reference: { screeningStatus: string } }>(page, `/api/references/${id}`)).reference.screeningStatus));
        assert.deepEqual(statuses, ['awaiting_full_text', 'excluded']);

        // Agreement: both pairs disagreed, shown per stage on the curator's screen and beside the PRISMA counts.
        const agreement = await apiJson<{ stages: { title_abstract: { pairs: number; agreed: number; percentAgreement: number } } }>(page, '/api/screening/agreement');
        assert.ok(agreement.stages.title_abstract.pairs >= 2);
        const shown = `${(100 * agreement.stages.title_abstract.percentAgreement).toFixed(1)} %`;
        await page.reload();
        const row = page.getByRole('table', { name: 'Screener agreement' }).getByRole('row', { name: /Title and abstract/ });
        await row.getByRole('cell', { name: shown, exact: true }).waitFor();
        await page.goto(appUrl('/screening/counts'));
        await page.getByRole('table', { name: 'Screener agreement' }).getByRole('row', { name: /Title and abstract/ }).getByRole('cell', { name: shown, exact: true }).waitFor();
      } finally {
        await backToOneScreener(page);
      }
    },
  },
  {
    name: 'a contributor is not shown the rule screen, and the same screener cannot decide a record twice under two screeners',
    async run(page) {
      const stamp = Date.now();
      try {
        await signInThroughPage(page, 'curator');
        assert.equal((await page.request.put(appUrl('/api/screening/rule'), { headers: ORIGIN(), data: { screeners: 2 } })).status(), 200);
        await signOut(page);
        await signInThroughPage(page, 'coder1');
        assert.equal(await page.getByRole('link', { name: 'Screen rule' }).count(), 0);
        await page.goto(appUrl('/screening/disagreements'));
        await page.getByText(/curator/i).first().waitFor();
        assert.equal(await page.getByRole('button', { name: 'Save rule' }).count(), 0);
        const res = await page.request.post(appUrl('/api/imports'), {
          headers: ORIGIN(),
          data: { format: 'bibtex', text: `@article{twice${stamp}, title={Twice decided interval ${stamp}}, author={Twice, Tom}, year={2021}, doi={10.5555/twice.${stamp}}}` },
        });
        const refId = ((await res.json()) as { entries: { referenceId: number }[] }).entries[0].referenceId;
        // Two tabs of the same reference: the second decision of the same screener is refused in words.
        const other = await page.context().newPage();
        for (const p of [page, other]) {
          await p.goto(appUrl(`/references/${refId}`));
          await p.getByRole('button', { name: 'Record decision' }).waitFor();
        }
        await page.getByRole('radio', { name: /Include/ }).check();
        await page.getByRole('button', { name: 'Record decision' }).click();
        await page.getByText(/Recorded as your blind decision/).waitFor();
        await other.getByRole('radio', { name: /Exclude/ }).check();
        await other.getByRole('button', { name: 'Record decision' }).click();
        await other.getByRole('alert').getByText(/already decided reference .* another screener/).waitFor();
        await other.close();
      } finally {
        await backToOneScreener(page);
      }
    },
  },
];
