import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage } from './browser.js';

export const specs: Spec[] = [
  {
    name: 'a signed-in reader lists their follows under "My follows" and stops one without the mail link',
    async run(page) {
      await signInThroughPage(page, 'reader');
      const headers = { Origin: new URL(process.env.APP_ORIGIN!).origin };
      const year = 1990 + (Date.now() % 30);
      const ids: number[] = [];
      for (const manipulation of ['luminance', 'pitch']) {
        const res = await page.request.post(appUrl('/api/follows'), { headers, data: { request: { filters: { manipulation, metric: 'g_s', yearFrom: year } }, seShare: 0.75 } });
        assert.equal(res.status(), 201);
        ids.push(((await res.json()) as { id: number }).id);
      }
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'My follows' }).click();
      await page.getByRole('heading', { name: 'My follows' }).waitFor();
      const row = (m: string) => page.getByRole('row').filter({ hasText: `manipulation: ${m}; metric: Hedges' g_s (independent groups); years ${year}–…` });
      await row('luminance').getByRole('cell', { name: '0.75' }).waitFor();
      await row('pitch').waitFor();
      await row('luminance').getByRole('button', { name: /Stop following/ }).click();
      await row('luminance').waitFor({ state: 'detached' });
      await row('pitch').waitFor();
      const left = (await (await page.request.get(appUrl('/api/follows'))).json()) as { items: { id: number }[] };
      const mine = left.items.map((f) => f.id);
      assert.ok(!mine.includes(ids[0]) && mine.includes(ids[1]), `follows left: ${mine.join(', ')}`);
      await page.reload();
      await row('pitch').waitFor();
      assert.equal(await row('luminance').count(), 0);
    },
  },
];
