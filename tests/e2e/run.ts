// Runs every tests/e2e/*.spec.ts in turn against the running app (APP_ORIGIN), one fresh browser each.
import { readdirSync, writeFileSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { openBrowser } from './browser.js';

export type Spec = { name: string; run: (page: Page) => Promise<void> };

const dir = import.meta.dirname;
const resultsArg = process.argv.indexOf('--results');
const resultsFile = resultsArg > 0 ? process.argv[resultsArg + 1] : undefined;
const only = process.env.E2E_ONLY;
const files = readdirSync(dir).filter((f) => f.endsWith('.spec.ts') && (!only || f.includes(only))).sort();

let passed = 0;
let failed = 0;
for (const file of files) {
  const mod = (await import(path.join(dir, file))) as { specs: Spec[] };
  for (const spec of mod.specs) {
    const browser = await openBrowser();
    const page = await browser.context.newPage();
    page.setDefaultTimeout(15_000);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const started = Date.now();
    try {
      await spec.run(page);
      if (errors.length) throw new Error(`uncaught errors in the page: ${errors.join('; ')}`);
      passed++;
      console.log(`  ✓ ${file} › ${spec.name} (${Date.now() - started} ms)`);
    } catch (err) {
      failed++;
      console.log(`  ✗ ${file} › ${spec.name}\n    ${(err as Error).message.split('\n').join('\n    ')}`);
      if (resultsFile) {
        const shot = path.join(path.dirname(resultsFile), `${file}-${spec.name.replace(/\W+/g, '-')}.png`);
        mkdirSync(path.dirname(shot), { recursive: true });
        await page.screenshot({ path: shot, fullPage: true }).catch(() => undefined);
        console.log(`    screenshot: ${shot}`);
      }
    } finally {
      await browser.close();
    }
  }
}
console.log(`\nBrowser tests: ${passed} passed, ${failed} failed`);
if (resultsFile) writeFileSync(resultsFile, JSON.stringify({ passed, failed }));
process.exit(failed || !passed ? 1 : 0);
