import assert from 'node:assert/strict';
import type { Page } from 'playwright-core';
import { ROLES, type Role } from '../../shared/roles.js';
import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

const nav = (page: Page) => page.getByRole('navigation', { name: 'Main' });
/** The cell of one role in one person's row on the people screen (login, name, then one cell per role). */
const roleCell = (page: Page, login: string, role: Role) =>
  page.getByRole('row', { name: new RegExp(`@${login}\\b`) }).getByRole('cell').nth(2 + ROLES.indexOf(role));

export const specs: Spec[] = [
  {
    name: 'the people screen marks roles held through another: an administrator holds every role, a curator is a contributor',
    async run(page) {
      await signInThroughPage(page, 'admin');
      await nav(page).getByRole('link', { name: 'People' }).click();
      await page.getByRole('row', { name: /@admin\b/ }).waitFor();
      for (const role of ['curator', 'reviewer', 'contributor'] as const) {
        const cell = roleCell(page, 'admin', role);
        assert.equal(await cell.getByRole('checkbox').isChecked(), false, `${role} is not granted on its own`);
        assert.equal((await cell.innerText()).trim(), '✓ through Administrator');
      }
      assert.equal(await roleCell(page, 'admin', 'admin').getByRole('checkbox').isChecked(), true);
      assert.equal((await roleCell(page, 'curator', 'contributor').innerText()).trim(), '✓ through Curator');
      assert.equal((await roleCell(page, 'curator', 'reviewer').innerText()).trim(), '', 'a curator is not a reviewer');
      assert.equal((await roleCell(page, 'coder2', 'curator').innerText()).trim(), '');
    },
  },
  {
    name: 'a curator reads the audit log from the menu, filters it by person, action, record and day, and reads details in words; a reader is refused',
    async run(page) {
      // an admin grants coder2 the Reviewer role and takes it back: two entries to find
      await signInThroughPage(page, 'admin');
      await nav(page).getByRole('link', { name: 'People' }).click();
      const box = roleCell(page, 'coder2', 'reviewer').getByRole('checkbox');
      await box.check();
      await roleCell(page, 'coder2', 'reviewer').getByText('Saved').waitFor();
      await box.uncheck();
      await page.waitForResponse((r) => r.url().includes('/roles/reviewer') && r.request().method() === 'DELETE');
      await signOut(page);

      await signInThroughPage(page, 'curator');
      await nav(page).getByRole('link', { name: 'Audit log' }).click();
      await page.getByRole('heading', { name: 'Audit log' }).waitFor();
      const form = page.getByRole('form', { name: 'Filter the audit log' });
      await form.getByLabel('Person', { exact: true }).fill('admin');
      await form.getByLabel('Action', { exact: true }).selectOption({ label: 'Role removed' });
      await form.getByLabel('Record', { exact: true }).selectOption({ label: 'Person' });
      const today = new Date().toISOString().slice(0, 10);
      await form.getByLabel('From', { exact: true }).fill(today);
      // the list answers each filter in turn: wait for the answer to the last one before reading it
      const filtered = page.waitForResponse((r) => r.url().includes('/api/audit') && new URL(r.url()).searchParams.get('to') === today && new URL(r.url()).searchParams.get('action') === 'role.revoked');
      await form.getByLabel('To', { exact: true }).fill(today);
      await filtered;
      await page.getByRole('row', { name: /Role granted/ }).first().waitFor({ state: 'detached' });
      const row = page.getByRole('row', { name: /Role removed/ }).first();
      await row.waitFor();
      const text = await row.innerText();
      assert.match(text, /@admin/);
      assert.match(text, /Person \d+/);
      assert.match(text, /role: Reviewer/);
      assert.doesNotMatch(text, /[{}"]/, 'details are words, not JSON');
      assert.equal(await page.getByRole('row', { name: /Role granted/ }).count(), 0, 'the action filter leaves out the grant');

      // a day range with nothing in it
      await form.getByLabel('From', { exact: true }).fill('2001-01-01');
      await form.getByLabel('To', { exact: true }).fill('2001-01-02');
      await page.getByText('No audit entries match.').waitFor();

      // the earlier admin address still leads to the log
      await page.goto(appUrl('/admin/audit'));
      await page.waitForURL((u) => u.pathname === '/audit');
      await page.getByRole('heading', { name: 'Audit log' }).waitFor();
      await signOut(page);

      await signInThroughPage(page, 'reader');
      assert.equal(await nav(page).getByRole('link', { name: 'Audit log' }).count(), 0);
      await page.goto(appUrl('/audit'));
      await page.getByText('This page needs the Curator role.').waitFor();
      assert.equal(await page.getByRole('table').count(), 0);
    },
  },
];
