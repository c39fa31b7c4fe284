import type { Spec } from './run.js';
import { appUrl, signInThroughPage, signOut } from './browser.js';

const SUBJECT = /sent again after an outage/;

export const specs: Spec[] = [
  {
    name: 'an admin resends a mail that failed during an outage; it goes out, and a reader is kept off the screen',
    async run(page) {
      await signInThroughPage(page, 'admin');
      await page.goto(appUrl('/admin/mail'));
      await page.getByRole('heading', { name: 'Delivery log' }).waitFor();
      await page.getByLabel('Status').selectOption('failed');
      const row = page.getByRole('row').filter({ hasText: SUBJECT });
      await row.locator('[data-state="failed"]').waitFor();
      await row.getByText(/ECONNREFUSED/).waitFor();
      await row.getByRole('button', { name: /^Resend/ }).click();
      await page.getByRole('status').filter({ hasText: 'Queued again' }).waitFor();
      // The failed filter no longer lists it; among all mail it ends as sent and the mailbox received it.
      await page.getByLabel('Status').selectOption('');
      const sent = page.getByRole('row').filter({ hasText: SUBJECT }).filter({ has: page.locator('[data-state="sent"]') });
      await sent.waitFor({ timeout: 30_000 });
      if (await sent.getByRole('button', { name: /^Resend/ }).count()) throw new Error('a sent mail still offers Resend');
      await page.getByRole('article', { name: SUBJECT }).waitFor({ timeout: 20_000 });

      // At phone width the log scrolls sideways inside its box, not the page.
      await page.setViewportSize({ width: 390, height: 844 });
      await page.getByRole('heading', { name: 'Delivery log' }).waitFor();
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      if (overflow > 1) {
        const wide = await page.evaluate(() =>
          [...document.querySelectorAll('body *')].filter((e) => e.getBoundingClientRect().right > window.innerWidth + 1).slice(0, 8).map((e) => `${e.tagName}.${e.className} ${Math.round(e.getBoundingClientRect().right)}`),
        );
        throw new Error(`the page is ${overflow} px wider than a 390 px phone: ${wide.join(' | ')}`);
      }

      await page.setViewportSize({ width: 1280, height: 900 });
      await signOut(page);
      await signInThroughPage(page, 'reader');
      await page.goto(appUrl('/admin/mail'));
      await page.getByText(/This page needs the/).waitFor();
      if (await page.getByRole('button', { name: /^Resend/ }).count()) throw new Error('a reader was offered Resend');
    },
  },
];
