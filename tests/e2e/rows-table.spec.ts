import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, openBrowser, signInThroughPage } from './browser.js';
import { SYNTHESIS_INLINE_ROWS, SYNTHESIS_ROWS_PAGE } from '../../shared/schemas/synthesis.js';

// Three papers of 30 studies with 12 effects each: 1,080 effect rows under the three-level model, more than an
// answer carries in full (SYNTHESIS_INLINE_ROWS), so the results table reads its pages from the server.
const PAPERS = 3;
const STUDIES = 30;
const EFFECTS = 12;
const TOTAL = PAPERS * STUDIES * EFFECTS;

type Row = { label: string; weight: number };

/** One coder's sheet of a paper (both coders enter the same one, so the pair settles as matched). */
function sheet(term: string, paper: number) {
  return {
    notes: '',
    studies: Array.from({ length: STUDIES }, (_, s) => {
      const n = 12 + ((s + paper) % 7) * 4;
      return {
        label: `Session ${s + 1}`,
        design: 'between',
        n1: n,
        n2: n,
        population: 'healthy_adults',
        modality: 'visual',
        task: 'reproduction',
        standardMs: 600,
        effects: Array.from({ length: EFFECTS }, (_, j) => ({
          label: `block ${j + 1}`,
          outcome: 'duration_distortion',
          manipulation: term,
          form: 'smd',
          reported: { mean1: 590 + ((s * 31 + j * 17 + paper * 13) % 120), sd1: 70 + (j % 5) * 8, n1: n, mean2: 600, sd2: 75, n2: n },
        })),
      };
    }),
  };
}

async function ok(res: { status(): number; text(): Promise<string> }, status: number, what: string) {
  assert.equal(res.status(), status, `${what} answered ${res.status()}: ${(await res.text()).slice(0, 300)}`);
}

/** The labels the effects table shows, once they equal `want` (or whatever it shows after the wait). */
async function shownLabels(page: Page, want: string[]) {
  const table = page.getByRole('table', { name: /one row per effect/i });
  const read = () => table.locator('tbody tr td:first-child').allTextContents();
  const until = Date.now() + 30_000;
  let got = await read();
  while (JSON.stringify(got) !== JSON.stringify(want) && Date.now() < until) {
    await page.waitForTimeout(200);
    got = await read();
  }
  return got;
}

export const specs: Spec[] = [
  {
    name: 'a synthesis of more than 1,000 effects shows its first page and total; the reader pages and sorts the rows, served by the server',
    async run(page) {
      assert.ok(TOTAL > SYNTHESIS_INLINE_ROWS);
      const headers = { Origin: new URL(process.env.APP_ORIGIN!).origin };
      const stamp = Date.now();
      const term = `paged_rows_${stamp}`;
      const records: number[] = [];
      await signInThroughPage(page, 'curator');
      try {
        // a manipulation of this spec's own, so no other synthesis sees its effects
        await ok(await page.request.post(appUrl('/api/manipulations'), { headers, data: { term, label: `Paged rows ${stamp}`, description: 'Invented effects of the rows-table browser spec.' } }), 201, 'the new term');
        const titles = ['Brief tones over many sessions', 'Long flicker trains in a dark room', 'Dim discs reproduced at a steady pace'];
        const authors = ['Pagewright, Lene', 'Rowntree, Odile', 'Tallyman, Piers'];
        const bib = titles.map((title, i) => `@article{rows${stamp}${i}, title={${title} ${stamp}}, author={${authors[i]}}, journal={Journal of Invented Timing}, year={${2016 + i}}, doi={10.5555/rows.${stamp}.${i}}}`).join('\n');
        const imported = await page.request.post(appUrl('/api/imports'), { headers, data: { format: 'bibtex', text: bib } });
        await ok(imported, 201, 'the import');
        const refIds = ((await imported.json()) as { entries: { referenceId: number }[] }).entries.map((e) => e.referenceId);
        assert.equal(refIds.length, PAPERS);
        const coders = ((await (await page.request.get(appUrl('/api/assignments/coders'))).json()) as { items: { id: number; login: string }[] }).items;
        const coderId = (login: string) => coders.find((c) => c.login === login)!.id;
        const sheets: number[][] = [];
        for (const refId of refIds) {
          const { version } = ((await (await page.request.get(appUrl(`/api/references/${refId}`))).json()) as { reference: { version: number } }).reference;
          // included on title and abstract, then at full text
          for (const v of [version, version + 1]) await ok(await page.request.post(appUrl(`/api/references/${refId}/screening`), { headers, data: { decision: 'included', version: v } }), 201, 'screening');
          const assigned = await page.request.post(appUrl('/api/assignments'), { headers, data: { referenceId: refId, coder1Id: coderId('coder1'), coder2Id: coderId('coder2') } });
          await ok(assigned, 201, 'the assignment');
          sheets.push(((await assigned.json()) as { extractionIds: number[] }).extractionIds);
        }
        // each coder in a browser of their own enters the same sheets and submits; the second submission settles each pair
        for (const [c, login] of ['coder1', 'coder2'].entries()) {
          const b = await openBrowser();
          try {
            const p = await b.context.newPage();
            await signInThroughPage(p, login);
            for (const [i, ids] of sheets.entries()) {
              const saved = await p.request.put(appUrl(`/api/extractions/${ids[c]}`), { headers, data: { version: 1, sheet: sheet(term, i) } });
              await ok(saved, 200, `${login}'s sheet`);
              const submitted = await p.request.post(appUrl(`/api/extractions/${ids[c]}/submit`), { headers, data: { version: ((await saved.json()) as { version: number }).version } });
              await ok(submitted, 200, `${login}'s submission`);
              const result = (await submitted.json()) as { state: string; recordId?: number };
              if (c === 1) {
                assert.equal(result.state, 'settled', `the pair of paper ${i + 1} settles as matched`);
                records.push(result.recordId!);
              }
            }
          } finally {
            await b.close();
          }
        }

        // every row in the engine's order, read from the server 200 at a time, to say what each page must hold
        const request = { filters: { manipulation: term }, dependence: { mode: 'multilevel', robust: false } };
        const all: Row[] = [];
        for (let p = 1; all.length < TOTAL; p++) {
          const res = await page.request.post(appUrl(`/api/syntheses?rows=page&page=${p}&pageSize=200`), { headers, data: request });
          await ok(res, 200, 'a page of rows');
          const body = (await res.json()) as { rows: Row[]; rowsPage: { total: number } };
          assert.equal(body.rowsPage.total, TOTAL);
          assert.ok(body.rows.length, 'rows until the total');
          all.push(...body.rows);
        }
        assert.equal(new Set(all.map((r) => r.label)).size, TOTAL, 'each row has its own label');
        const labels = (rows: Row[], page: number) => rows.slice((page - 1) * SYNTHESIS_ROWS_PAGE, page * SYNTHESIS_ROWS_PAGE).map((r) => r.label);
        const byWeight = (dir: 1 | -1) => all.map((r, i) => ({ r, i })).sort((a, b) => (a.r.weight - b.r.weight) * dir || a.i - b.i).map((x) => x.r);

        // the reader's view: the first page of the answer, with the whole count
        await page.goto(appUrl(`/synthesis?manipulation=${term}&dependence=multilevel&robust=0`));
        await page.getByTestId('pooled-estimate').waitFor({ timeout: 60_000 });
        const table = page.getByRole('table', { name: /one row per effect/i });
        await table.getByText(`${TOTAL} effects in ${PAPERS} papers`).waitFor();
        const pager = table.locator('xpath=..').getByRole('navigation', { name: 'Pages' });
        const pages = Math.ceil(TOTAL / SYNTHESIS_ROWS_PAGE);
        await pager.getByText(`Page 1 of ${pages} · ${TOTAL} in all`).waitFor();
        assert.deepEqual(await shownLabels(page, labels(all, 1)), labels(all, 1));

        // the next page comes from the server (?rows=page)
        const asked = (pageNo: number, sort: string, order: string) =>
          page.waitForResponse((r) => {
            const u = new URL(r.url());
            return u.pathname === '/api/syntheses' && u.searchParams.get('rows') === 'page' && u.searchParams.get('page') === String(pageNo) && u.searchParams.get('sort') === sort && u.searchParams.get('order') === order;
          });
        let served = asked(2, 'position', 'asc');
        await pager.getByRole('button', { name: 'Next →' }).click();
        assert.equal((await served).status(), 200);
        await pager.getByText(`Page 2 of ${pages} · ${TOTAL} in all`).waitFor();
        assert.deepEqual(await shownLabels(page, labels(all, 2)), labels(all, 2));

        // sorting by weight goes back to page 1 of the whole list sorted on the server, then the other way round
        const weight = table.getByRole('columnheader', { name: /Weight %/ });
        served = asked(1, 'weight', 'asc');
        await weight.getByRole('button').click();
        assert.equal((await served).status(), 200);
        await pager.getByText(`Page 1 of ${pages} · ${TOTAL} in all`).waitFor();
        assert.equal(await weight.getAttribute('aria-sort'), 'ascending');
        const lightest = labels(byWeight(1), 1);
        assert.notDeepEqual(lightest, labels(all, 1), 'the order changes');
        assert.deepEqual(await shownLabels(page, lightest), lightest);
        served = asked(1, 'weight', 'desc');
        await weight.getByRole('button').click();
        assert.equal((await served).status(), 200);
        await table.locator('xpath=..').getByText('Loading rows…').waitFor({ state: 'hidden' });
        assert.equal(await weight.getAttribute('aria-sort'), 'descending');
        const heaviest = labels(byWeight(-1), 1);
        assert.deepEqual(await shownLabels(page, heaviest), heaviest);
        const shown = (await table.locator('tbody tr td:nth-child(6)').allTextContents()).map(Number);
        assert.deepEqual(shown, [...shown].sort((a, b) => b - a), 'weights fall down the page');
        // and paging keeps the sort
        served = asked(3, 'weight', 'desc');
        await pager.getByRole('button', { name: 'Next →' }).click();
        await pager.getByRole('button', { name: 'Next →' }).click();
        assert.equal((await served).status(), 200);
        await pager.getByText(`Page 3 of ${pages} · ${TOTAL} in all`).waitFor();
        assert.deepEqual(await shownLabels(page, labels(byWeight(-1), 3)), labels(byWeight(-1), 3));
      } finally {
        // take the invented effects out of the registry again for the specs that follow
        for (const id of records) await ok(await page.request.post(appUrl(`/api/records/${id}/withdraw`), { headers, data: { reason: 'Invented rows of the rows-table browser spec.' } }), 200, 'the withdrawal');
      }
    },
  },
];
