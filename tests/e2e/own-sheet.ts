// Coding-sheet set-up shared by the browser specs: a reference of the spec's own and the study fields of a sheet.
import assert from 'node:assert/strict';
import type { Locator, Page } from 'playwright-core';
import { appUrl } from './browser.js';

/**
 * Imports a reference of the spec's own (a unique stamp, so other specs' claims cannot use it up), includes it at
 * both screening stages (title and abstract, then full text: only then is it coded) and claims it; its sheet's id.
 */
export async function claimOwnReference(page: Page, key: string, title: string): Promise<number> {
  const headers = { Origin: new URL(process.env.APP_ORIGIN!).origin };
  const stamp = `${Date.now()}${Math.floor(Math.random() * 1000)}`;
  const imported = await page.request.post(appUrl('/api/imports'), {
    headers,
    data: { format: 'bibtex', text: `@article{${key}${stamp}, title={${title} ${stamp}}, author={Sheetwright, Ada}, year={2021}, doi={10.5555/${key}.${stamp}}}` },
  });
  assert.equal(imported.status(), 201, await imported.text());
  const refId = ((await imported.json()) as { entries: { referenceId: number }[] }).entries[0].referenceId;
  const { version } = ((await (await page.request.get(appUrl(`/api/references/${refId}`))).json()) as { reference: { version: number } }).reference;
  for (const v of [version, version + 1]) {
    const included = await page.request.post(appUrl(`/api/references/${refId}/screening`), { headers, data: { decision: 'included', version: v } });
    assert.equal(included.status(), 201, await included.text());
  }
  const claimed = await page.request.post(appUrl('/api/extractions'), { headers, data: { referenceId: refId } });
  assert.equal(claimed.status(), 201, await claimed.text());
  return ((await claimed.json()) as { id: number }).id;
}

/** Claims a reference of the spec's own and opens its coding sheet; the sheet's id. */
export async function openOwnSheet(page: Page, key: string, title: string): Promise<number> {
  const id = await claimOwnReference(page, key, title);
  await page.goto(appUrl(`/extractions/${id}`));
  await page.getByRole('heading', { name: /Extraction sheet/ }).waitFor();
  return id;
}

/** Fills a study's own fields on the sheet, as a coder picks them. */
export async function fillStudy(study: Locator, s: { design: string; n: string; population: string; modality: string; task: string }) {
  await study.getByLabel('Design', { exact: true }).selectOption(s.design);
  await study.getByLabel('n (participants)', { exact: true }).fill(s.n);
  await study.getByLabel('Population', { exact: true }).selectOption(s.population);
  await study.getByLabel('Modality', { exact: true }).selectOption(s.modality);
  await study.getByLabel('Task', { exact: true }).selectOption(s.task);
}
