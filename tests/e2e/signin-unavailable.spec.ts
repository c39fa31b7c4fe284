import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signOut } from './browser.js';
import { startStandIn, stopStandIn } from './stand-ins.js';

const PHONE = { width: 390, height: 844 };

export const specs: Spec[] = [
  {
    name: 'sign-in while the OAuth provider is down: a page says so in words, leads back to where the reader was, and signing in works once the provider is back',
    async run(page) {
      await page.setViewportSize(PHONE);
      await page.goto(appUrl('/atlas'));
      await stopStandIn('oauth');
      let back = false;
      try {
        // the server keeps the provider's last answer for a few seconds: the first try may still go out
        const status = await clickSignInUntilDown(page);
        assert.equal(status, 503);
        await page.getByRole('heading', { level: 1, name: /Sign-in is unavailable just now/ }).waitFor();
        await page.getByText('The GitHub sign-in service cannot be reached, so you cannot sign in at the moment. Try again in a minute.').waitFor();
        await page.getByText(/Everything open to readers .* still works without signing in/).waitFor();
        assert.equal(new URL(page.url()).pathname, '/auth/github');
        const width = await page.evaluate(() => document.documentElement.scrollWidth);
        assert.ok(width <= PHONE.width, `the page fits a phone (${width}px wide)`);

        await page.getByRole('link', { name: 'Back to Chronometa' }).click();
        await page.waitForURL((u) => u.pathname === '/atlas');
        await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();

        await startStandIn('oauth');
        back = true;
        await clickSignInUntilUp(page);
        await page.getByRole('link', { name: /@reader\b/ }).click();
        await page.waitForURL((u) => u.origin === new URL(process.env.APP_ORIGIN!).origin && u.pathname === '/atlas');
        await page.getByRole('button', { name: 'Sign out' }).waitFor();
        await signOut(page);
      } finally {
        if (!back) await startStandIn('oauth');
      }
    },
  },
];

type Page = Parameters<Spec['run']>[0];

/** Clicks the banner's Sign in until the server has noticed the provider is away; answers the last status. */
async function clickSignInUntilDown(page: Page): Promise<number> {
  const end = Date.now() + 15_000;
  for (;;) {
    const [res] = await Promise.all([page.waitForResponse((r) => r.url().includes('/auth/github')), page.getByRole('banner').getByRole('link', { name: 'Sign in' }).click()]);
    if (res.status() === 503 || Date.now() > end) return res.status();
    await page.goto(appUrl('/atlas'));
    await page.waitForTimeout(1000);
  }
}

/** Tries signing in again from the unavailable page until the provider's own page shows. */
async function clickSignInUntilUp(page: Page): Promise<void> {
  const end = Date.now() + 15_000;
  const down = page.getByRole('heading', { name: /Sign-in is unavailable just now/ });
  const provider = page.getByRole('link', { name: /@reader\b/ });
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).click();
  for (;;) {
    await provider.or(down).first().waitFor();
    if (await provider.isVisible()) return;
    if (Date.now() > end) throw new Error('the sign-in page still says unavailable 15 s after the provider came back');
    await page.waitForTimeout(1000);
    await page.getByRole('link', { name: 'Try signing in again' }).click();
    await page.waitForLoadState('load');
  }
}
