import assert from 'node:assert/strict';
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';

const forestSvg = 'figure[aria-label="Forest plot"] svg.main-svg';

async function runLuminance(page: Page) {
  await page.goto(appUrl('/synthesis'));
  await page.getByLabel('Manipulation').selectOption(['luminance']);
  await page.getByLabel('Outcome kind').selectOption('duration_distortion');
  await page.getByLabel('Standardized mean differences').selectOption('raw_score');
  await page.getByRole('button', { name: 'Run synthesis' }).click();
  await page.getByTestId('pooled-estimate').waitFor({ timeout: 40_000 });
}

async function download(page: Page, link: RegExp) {
  const [file] = await Promise.all([page.waitForEvent('download', { timeout: 40_000 }), page.getByRole('region', { name: 'Export this synthesis' }).getByRole('link', { name: link }).click()]);
  return { name: file.suggestedFilename(), text: await readFile((await file.path())!, 'utf8') };
}

export const specs: Spec[] = [
  {
    name: 'signed out, a live synthesis downloads per-study and per-effect CSV and JSON named by the registry version, without saving',
    async run(page) {
      await runLuminance(page);
      const studies = await download(page, /one row per study/);
      assert.match(studies.name, /^chronometa-synthesis-v\d+-studies\.csv$/);
      assert.match(studies.text.split('\n')[0], /effect,variance/);
      const rows = await page.getByRole('table', { name: /one row per study/i }).locator('tbody tr').count();
      assert.equal(studies.text.trim().split('\n').length - 1, rows);
      const effects = await download(page, /every effect as coded/);
      assert.match(effects.name, /^chronometa-synthesis-v\d+-effects\.csv$/);
      const json = await download(page, /JSON/);
      assert.match(json.name, /^chronometa-synthesis-v\d+\.json$/);
      assert.equal(typeof JSON.parse(json.text).result.estimate, 'number');
      await page.locator(forestSvg).first().waitFor({ timeout: 40_000 });

      // the figures as files: the forest plot as SVG (with its title) and as PNG
      const forest = page.getByRole('figure', { name: 'Forest plot' });
      const figureFile = async (format: 'SVG' | 'PNG') => {
        const [file] = await Promise.all([page.waitForEvent('download', { timeout: 40_000 }), forest.getByRole('button', { name: `Download the forest plot as ${format}` }).click()]);
        return { name: file.suggestedFilename(), bytes: await readFile((await file.path())!) };
      };
      const svg = await figureFile('SVG');
      assert.match(svg.name, /^chronometa-synthesis-v\d+-forest\.svg$/);
      assert.match(svg.bytes.toString('utf8'), /<svg[^>]*>[\s\S]*Forest plot/);
      const png = await figureFile('PNG');
      assert.match(png.name, /^chronometa-synthesis-v\d+-forest\.png$/);
      assert.deepEqual([...png.bytes.subarray(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], 'a PNG file');
      assert.ok(png.bytes.length > 5_000, `a drawn image, not an empty one (${png.bytes.length} bytes)`);
    },
  },
  {
    name: 'a reviewer downloads the live PRISMA 2020 flow diagram, saves the synthesis, and the snapshot shows its flow stage by stage with the diagram',
    async run(page) {
      await signInThroughPage(page, 'reviewer');
      await runLuminance(page);
      const flow = await download(page, /PRISMA 2020 flow diagram/);
      assert.match(flow.name, /^chronometa-synthesis-v\d+-flow\.svg$/);
      assert.match(flow.text, /<svg [^>]*role="img"/);
      const entering = flow.text.match(/Entering this synthesis \(n = ([\d,]+) references?\)/);
      assert.ok(entering, 'the diagram names what enters the synthesis');
      // one box per screening stage, each with its exclusions and what still waits (counts with thousands separators)
      assert.match(flow.text, /Records screened on title and abstract \(n = [\d,]+\)/);
      assert.match(flow.text, /Reports assessed in full text \(n = [\d,]+\)/);
      assert.match(flow.text, /Reports excluded \(n = [\d,]+\)/);
      assert.match(flow.text, /Awaiting full-text screening \(n = [\d,]+\)/);

      await page.getByLabel('Snapshot title (optional)').fill('Luminance flow, browser check');
      await page.getByRole('button', { name: 'Save snapshot' }).click();
      const saved = page.getByRole('status').filter({ hasText: 'Saved' });
      await saved.waitFor({ timeout: 40_000 });
      const href = new URL((await saved.getByRole('link').getAttribute('href'))!, appUrl('/')).pathname;
      await page.goto(appUrl(href));
      const table = page.getByRole('table', { name: 'Flow of records into this synthesis' });
      await table.waitFor({ timeout: 40_000 });
      for (const step of ['Records identified in the registry', 'Titles and abstracts screened', 'Not yet screened', 'Full texts assessed', 'Awaiting full-text screening', 'Reports coded', 'Codings settled', 'Entering this synthesis'])
        await table.getByText(step, { exact: false }).first().waitFor();
      const lastRow = table.locator('tbody tr').last();
      assert.equal((await lastRow.locator('td.num').textContent())!.trim(), entering![1]);
      await page.waitForFunction(() => {
        const img = document.querySelector<HTMLImageElement>('img[alt^="PRISMA 2020 flow diagram"]');
        return !!img && img.complete && img.naturalWidth > 0;
      });
      const [file] = await Promise.all([page.waitForEvent('download', { timeout: 40_000 }), page.getByRole('link', { name: 'Flow diagram (SVG)' }).click()]);
      assert.equal(file.suggestedFilename(), `chronometa-snapshot-${href.split('/').pop()}-flow.svg`);
    },
  },
  {
    name: 'signed out, a snapshot page cites the snapshot itself: identifier, address, registry version, date, and BibTeX, RIS and CSL-JSON to copy',
    async run(page) {
      await page.context().grantPermissions(['clipboard-read', 'clipboard-write'], { origin: appUrl('/').replace(/\/$/, '') });
      const list = await (await page.request.get(appUrl('/api/snapshots?pageSize=1'))).json();
      const id: string = list.items[0].id;
      const citation = await (await page.request.get(appUrl(`/api/snapshots/${id}/citation`))).json();
      await page.goto(appUrl(`/snapshots/${id}`));
      const cite = page.getByRole('region', { name: 'Cite this snapshot' });
      await cite.getByText(`chronometa:snapshot:${id}`, { exact: true }).waitFor({ timeout: 40_000 });
      await cite.getByText(citation.url, { exact: true }).waitFor();
      await cite.getByText(citation.date, { exact: true }).waitFor();
      await cite.getByText(String(citation.registryVersion), { exact: true }).waitFor();
      const clipboard = () => page.evaluate(() => navigator.clipboard.readText());
      await cite.getByRole('button', { name: 'Copy BibTeX' }).click();
      await cite.getByRole('status').filter({ hasText: '✓ BibTeX copied' }).waitFor();
      assert.equal(await clipboard(), citation.bibtex.trim());
      assert.match(await clipboard(), /^@\w+\{chronometa_/);
      await cite.getByRole('button', { name: 'Copy RIS' }).click();
      await cite.getByRole('status').filter({ hasText: '✓ RIS copied' }).waitFor();
      assert.match(await clipboard(), /^TY {2}- /);
      await cite.getByRole('button', { name: 'Copy CSL-JSON' }).click();
      await cite.getByRole('status').filter({ hasText: '✓ CSL-JSON copied' }).waitFor();
      assert.equal(JSON.parse(await clipboard()).URL, citation.url);
      assert.equal(await cite.locator('button[aria-pressed="true"]').textContent(), 'Copy CSL-JSON');
      await cite.getByLabel('CSL-JSON of this snapshot').waitFor();
      // copy buttons, not links: the page keeps its one BibTeX download (the included references)
      assert.equal(await page.getByRole('link', { name: /BibTeX/ }).count(), 1);
    },
  },
];
