import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

export const specs: Spec[] = [
  {
    name: 'curators and reviewers reach the agreement page from the header; a contributor sees no link',
    async run(page) {
      for (const login of ['curator', 'reviewer']) {
        await signInThroughPage(page, login);
        await page.getByRole('banner').getByRole('link', { name: 'Agreement' }).click();
        await page.getByRole('heading', { name: 'Inter-coder agreement' }).waitFor();
        await signOut(page);
      }
      await signInThroughPage(page, 'coder1');
      await page.goto(appUrl('/'));
      await page.getByRole('banner').getByRole('link', { name: 'My coding' }).waitFor();
      assert.equal(await page.getByRole('banner').getByRole('link', { name: 'Agreement' }).count(), 0);
    },
  },
];
