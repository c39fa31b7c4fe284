import type { Page } from 'playwright-core';

/** Decides the record (or the marked ones) from the keyboard: Enter, the first letters of a choice, Enter, a note, Enter. */
export async function decideByKeys(page: Page, letters: string, note?: string, heading = 'Decide this record') {
  await page.keyboard.press('Enter');
  const chooser = page.getByRole('region', { name: 'Decision' });
  await chooser.getByRole('heading', { name: heading }).waitFor();
  await chooser.getByRole('combobox').waitFor();
  await page.keyboard.type(letters);
  await page.keyboard.press('Enter');
  await chooser.getByRole('textbox', { name: /^Note/ }).waitFor();
  if (note) await page.keyboard.type(note);
  await page.keyboard.press('Enter');
  await chooser.waitFor({ state: 'detached' });
}

/** Marks the next `n` records from the cursor down (Space, ↓ …) and decides them together. */
export async function batchByKeys(page: Page, n: number, letters: string, note?: string) {
  for (let i = 0; i < n; i++) {
    await page.keyboard.press('Space');
    if (i < n - 1) await page.keyboard.press('ArrowDown');
  }
  await page.getByText(`· ${n} marked`).waitFor();
  await decideByKeys(page, letters, note, `Decide the ${n} marked records`);
}
