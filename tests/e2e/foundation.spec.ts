import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { signInThroughPage, signOut, appUrl } from './browser.js';

export const specs: Spec[] = [
  {
    name: 'signs in through the provider page, shows the name, and an admin grants a role',
    async run(page) {
      await signInThroughPage(page, 'admin');
      await page.getByText('Ines Valtonen').first().waitFor();
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
      const row = page.getByRole('row', { name: /@reader/ });
      await row.waitFor();
      const box = row.getByRole('checkbox', { name: 'Reviewer' });
      assert.equal(await box.isChecked(), false);
      await box.check();
      await row.getByText('Saved').waitFor();
      await page.reload();
      assert.equal(await page.getByRole('row', { name: /@reader/ }).getByRole('checkbox', { name: 'Reviewer' }).isChecked(), true);
      await signOut(page);
      await page.goto(appUrl('/'));
      assert.equal(await page.getByText('Ines Valtonen').count(), 0);
    },
  },
];
