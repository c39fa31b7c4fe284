import assert from 'node:assert/strict';
import type { Spec } from './run.js';
import { appUrl, signOut } from './browser.js';

const appOrigin = () => new URL(process.env.APP_ORIGIN!).origin;

export const specs: Spec[] = [
  {
    name: 'sign-in returns only to a path on this site: /\\host and //host land on the home page, a real path is kept',
    async run(page) {
      for (const [returnTo, expected] of [
        ['/\\evil.example', '/'],
        ['//evil.example/x', '/'],
        ['/atlas?from=signin', '/atlas?from=signin'],
      ]) {
        await page.goto(appUrl(`/auth/github?returnTo=${encodeURIComponent(returnTo)}`));
        await page.getByRole('link', { name: /@reader\b/ }).click();
        await page.waitForURL((u) => u.origin === appOrigin() && !u.pathname.startsWith('/auth/'));
        const url = new URL(page.url());
        assert.equal(url.origin, appOrigin(), returnTo);
        assert.equal(`${url.pathname}${url.search}`, expected, returnTo);
        await page.getByRole('button', { name: 'Sign out' }).waitFor();
        await signOut(page);
      }
    },
  },
];
