import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

export const CHROMIUM_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** A fresh Chromium profile (Debian's /usr/bin/chromium), closed and removed by the returned close(). */
export async function openBrowser(): Promise<{ context: BrowserContext; close(): Promise<void> }> {
  const profile = mkdtempSync(path.join(tmpdir(), 'chronometa-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_FLAGS,
    viewport: { width: 1280, height: 900 },
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export const appUrl = (p = '/') => new URL(p, process.env.APP_ORIGIN).toString();

/** Signs in through the local provider's own page by clicking the person's entry. */
export async function signInThroughPage(page: Page, login: string) {
  await page.goto(appUrl('/'));
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).click();
  await page.getByRole('link', { name: new RegExp(`@${login}\\b`) }).click();
  await page.waitForURL((u) => u.origin === new URL(process.env.APP_ORIGIN!).origin);
}

export async function signOut(page: Page) {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();
}
