import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl } from './browser.js';

export const specs: Spec[] = [
  {
    name: 'a student filters search by manipulation, outcome kind and task, and follows a hit to the atlas and to its settled record',
    async run(page) {
      await page.goto(appUrl('/'));
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Search' }).click();
      const filters = page.getByRole('search', { name: 'Search references' });
      await filters.waitFor();
      await filters.getByLabel('Manipulation', { exact: true }).selectOption('luminance');
      await filters.getByLabel('Outcome kind', { exact: true }).selectOption('duration_distortion');
      await filters.getByLabel('Task', { exact: true }).selectOption('bisection');
      await page.waitForURL((u) => u.searchParams.get('task') === 'bisection' && u.searchParams.get('manipulation') === 'luminance');
      const results = page.getByRole('region', { name: 'Results' });
      // the demo's luminance paper on bisection is found; the two-interval and reproduction ones are not
      const hit = results.getByRole('listitem').filter({ hasText: 'Dim stimuli shorten bisection points' });
      // the unfiltered list may still be in view for a moment: wait until the filtered answer replaces it
      await results.getByText('Brighter flashes are judged to last longer').first().waitFor({ state: 'hidden' });
      await results.getByText('Luminance contrast and reproduced duration of discs').first().waitFor({ state: 'hidden' });
      await hit.waitFor();
      const hits = results.getByRole('listitem');
      const n = await hits.count();
      assert.ok(n >= 1);
      for (let i = 0; i < n; i++) {
        const settled = hits.nth(i).getByLabel(/^Settled data of /);
        const text = await settled.innerText();
        assert.match(text, /Atlas: Luminance/);
        assert.match(text, /Bisection/);
        assert.doesNotMatch(text, /\bbisection\b|duration_distortion/, 'labels, not codes');
      }
      const status = page.getByRole('status').filter({ hasText: /references?/ });
      assert.match(await status.innerText(), new RegExp(`^${n} reference`));

      // to the atlas page of the manipulation
      await hit.getByRole('link', { name: 'Atlas: Luminance' }).click();
      await page.waitForURL((u) => u.pathname === '/atlas/manipulations/luminance');
      await page.getByRole('heading', { level: 1, name: 'Luminance' }).waitFor();
      await page.goBack();
      // to the settled record
      const again = page.getByRole('region', { name: 'Results' }).getByRole('listitem').filter({ hasText: 'Dim stimuli shorten bisection points' });
      await again.getByRole('link', { name: /Settled record/ }).first().click();
      await page.waitForURL((u) => /^\/records\/\d+$/.test(u.pathname));
      await page.getByRole('heading', { level: 1, name: /Settled record of / }).waitFor();
      await page.getByText('Dim stimuli shorten bisection points').first().waitFor();
    },
  },
];
