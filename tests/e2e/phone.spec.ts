import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

const PHONE = { width: 390, height: 844 };

async function json<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(appUrl(path));
  assert.equal(res.status(), 200, `GET ${path} answered ${res.status()}`);
  return (await res.json()) as T;
}

/** Opens a page and waits until it has settled: its heading drawn, nothing still loading. */
async function visit(page: Page, path: string) {
  await page.goto(appUrl(path));
  await page.locator('main h1').first().waitFor();
  await page.waitForLoadState('networkidle');
  await page.waitForFunction(() => !document.querySelector('main [aria-busy="true"], main [role="status"][data-loading]'), undefined, { timeout: 10_000 }).catch(() => undefined);
}

async function widths(page: Page) {
  return page.evaluate(() => {
    const wide: string[] = [];
    for (const el of document.querySelectorAll('body *')) {
      const r = el.getBoundingClientRect();
      if (r.right > window.innerWidth + 0.5 && !el.closest('table, pre, [data-scroll-box]')) wide.push(`${el.tagName.toLowerCase()}.${String(el.className).slice(0, 40)}`);
    }
    return { scroll: document.documentElement.scrollWidth, inner: window.innerWidth, wide: wide.slice(0, 5) };
  });
}

async function fitsThePhone(page: Page, path: string) {
  await visit(page, path);
  const w = await widths(page);
  assert.ok(w.scroll <= PHONE.width, `${path} is ${w.scroll} px wide at ${PHONE.width} px (too wide: ${w.wide.join(', ')})`);
}

export const specs: Spec[] = [
  {
    name: 'at 390 px every main page fits the screen, tables scroll inside their box, and the navigation is a menu',
    async run(page) {
      await page.setViewportSize(PHONE);
      const stamp = Date.now();
      const headers = { Origin: new URL(process.env.APP_ORIGIN!).origin };

      // the reader's pages
      for (const p of ['/', '/atlas', '/synthesis', '/snapshots', '/references', '/search?q=duration', '/manipulations', '/screening/counts', '/no-such-page']) await fitsThePhone(page, p);
      const atlas = await json<{ manipulations: { term: string; outcomes: string[] }[] }>(page, '/api/atlas');
      const term = atlas.manipulations.find((m) => m.outcomes.length)!;
      await fitsThePhone(page, `/atlas/manipulations/${term.term}`);
      await fitsThePhone(page, `/atlas/outcomes/${term.outcomes[0]}`);
      const snaps = await json<{ items: { id: string }[] }>(page, '/api/snapshots?pageSize=1');
      assert.ok(snaps.items.length, 'the demo data holds a snapshot');
      await fitsThePhone(page, `/snapshots/${snaps.items[0].id}`);

      // the navigation is folded into a menu that opens, leads to a page and closes again
      const nav = page.getByRole('navigation', { name: 'Main' });
      assert.equal(await nav.isVisible(), false);
      const menu = page.getByRole('button', { name: /Menu/ });
      assert.equal(await menu.getAttribute('aria-expanded'), 'false');
      await menu.click();
      await nav.waitFor();
      assert.equal(await page.getByRole('button', { name: /Close menu/ }).getAttribute('aria-expanded'), 'true');
      await nav.getByRole('link', { name: 'References' }).click();
      await page.waitForURL(/\/references$/);
      await nav.waitFor({ state: 'hidden' });

      // a curator's pages, with a reference of this spec's own whose title and DOI are long unbroken strings
      await signInThroughPage(page, 'curator');
      const long = `Chronostasis${'-and-dilation'.repeat(12)}-${stamp}`;
      const imported = await page.request.post(appUrl('/api/imports'), {
        headers,
        data: { format: 'bibtex', text: `@article{phone${stamp}, title={${long} under dim flashes}, author={Widthwise, Oona and Narrowmore, Pell}, journal={Journal of Invented Timing}, year={2021}, doi={10.5555/phone.${'x'.repeat(60)}.${stamp}}}` },
      });
      assert.equal(imported.status(), 201);
      const batch = (await imported.json()) as { batch: { id: number }; entries: { referenceId: number }[] };
      const refId = batch.entries[0].referenceId;
      await fitsThePhone(page, `/references/${refId}`);
      await page.getByText(long, { exact: false }).first().waitFor();
      await fitsThePhone(page, `/imports/${batch.batch.id}`);
      for (const p of ['/import', '/screening', '/duplicates', '/extractions', '/assignments', '/reconciliation', '/agreement', '/follows', '/settings/tokens']) await fitsThePhone(page, p);
      const queue = await json<{ items: { assignmentId: number }[] }>(page, '/api/reconciliation');
      if (queue.items[0]) await fitsThePhone(page, `/reconciliation/${queue.items[0].assignmentId}`);
      const effects = await json<{ items: { recordId: number }[] }>(page, '/api/effects?pageSize=1');
      assert.ok(effects.items.length, 'the demo data holds a settled record');
      await fitsThePhone(page, `/records/${effects.items[0].recordId}`);
      const { version } = (await json<{ reference: { version: number } }>(page, `/api/references/${refId}`)).reference;
      // Included on title and abstract, then at full text: only then may it be claimed.
      for (const v of [version, version + 1]) {
        const included = await page.request.post(appUrl(`/api/references/${refId}/screening`), { headers, data: { decision: 'included', version: v } });
        assert.equal(included.status(), 201);
      }
      const claimed = await page.request.post(appUrl('/api/extractions'), { headers, data: { referenceId: refId } });
      assert.equal(claimed.status(), 201);
      await fitsThePhone(page, `/extractions/${((await claimed.json()) as { id: number }).id}`);

      // the references table is wider than the phone: it scrolls inside its own box
      await visit(page, '/references');
      const table = page.locator('main table').first();
      const box = await table.evaluate((t) => ({ client: t.clientWidth, scroll: t.scrollWidth, overflow: getComputedStyle(t).overflowX }));
      assert.equal(box.overflow, 'auto');
      assert.ok(box.client <= PHONE.width, `the table box is ${box.client} px`);
      assert.ok(await page.getByRole('row').count() > 1, 'the table keeps its rows');
      await signOut(page);

      // a reviewer's synthesis with results, and an admin's pages
      await signInThroughPage(page, 'reviewer');
      await fitsThePhone(page, `/synthesis?manipulation=${term.term}&outcome=${term.outcomes[0]}`);
      await signOut(page);
      await signInThroughPage(page, 'admin');
      for (const p of ['/admin/people', '/audit', '/admin/mail', '/screening/disagreements']) await fitsThePhone(page, p);
    },
  },
  {
    name: 'at 390 px the forest plot is drawn narrow: labels above their rows, nothing overprinted or cut off, no second title; wide again on a wide screen',
    async run(page) {
      await page.setViewportSize(PHONE);
      await signInThroughPage(page, 'reviewer');
      await page.goto(appUrl('/synthesis'));
      await page.getByLabel('Manipulation').selectOption(['luminance']);
      await page.getByLabel('Outcome kind').selectOption('duration_distortion');
      await page.getByLabel('Standardized mean differences').selectOption('raw_score');
      await page.getByLabel('Subgroups by').selectOption('task');
      await page.getByRole('button', { name: 'Run synthesis' }).click();
      const figure = page.getByRole('figure', { name: 'Forest plot' });
      const svg = figure.locator('svg.main-svg').first();
      await svg.waitFor({ timeout: 40_000 });
      await figure.getByText('Study (year, n, weight)').waitFor();
      assert.equal(await figure.getByText('Weight %').count(), 0);

      const drawn = await figure.evaluate((fig) => {
        const box = fig.querySelector('svg.main-svg')!.getBoundingClientRect();
        const texts = [...fig.querySelectorAll('.textpoint text')].map((t) => ({ text: t.textContent ?? '', r: t.getBoundingClientRect() })).filter((t) => t.text && t.r.width > 0);
        const overlaps: string[] = [];
        for (let i = 0; i < texts.length; i++)
          for (let j = i + 1; j < texts.length; j++) {
            const a = texts[i].r;
            const b = texts[j].r;
            if (a.left < b.right - 1 && b.left < a.right - 1 && a.top < b.bottom - 1 && b.top < a.bottom - 1) overlaps.push(`"${texts[i].text}" / "${texts[j].text}"`);
          }
        const outside = texts.filter((t) => t.r.left < box.left - 1 || t.r.right > box.right + 1).map((t) => t.text);
        const title = [...fig.querySelectorAll('.gtitle')].map((t) => t.textContent ?? '').join('');
        return { n: texts.length, overlaps, outside, title, right: box.right };
      });
      assert.ok(drawn.n > 5, `only ${drawn.n} labels drawn`);
      assert.deepEqual(drawn.overlaps, [], 'labels overprint');
      assert.deepEqual(drawn.outside, [], 'labels cut off at the edge');
      assert.equal(drawn.title, '', 'the plot draws no title of its own (the caption names it)');
      assert.ok(drawn.right <= PHONE.width, `the plot reaches ${drawn.right} px`);
      assert.ok((await page.evaluate(() => document.documentElement.scrollWidth)) <= PHONE.width);
      // the caption names the figure once
      assert.equal(await figure.getByText('Forest plot', { exact: true }).count(), 1);

      await page.setViewportSize({ width: 1280, height: 900 });
      await figure.getByText('Weight %').waitFor();
      assert.equal(await figure.getByText('Study (year, n, weight)').count(), 0);
    },
  },
];
