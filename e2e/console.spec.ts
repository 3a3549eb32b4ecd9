/**
 * A full session without a single console error or uncaught exception: each demo survey, every pane
 * (Trace board <-> Geometry back and forth, Site and Export sheets, US units), a pick edit and
 * undo, a layer boundary added, nudged and given back to the automatic layering, a splitter moved, and downloads (CSV, site summary, a plot image). Runs on the production build by default and on
 * the dev server with E2E_DEV=1 (its live-reload socket must pass the page's CSP).
 */
import { test, expect, type Page } from '@playwright/test';
import { waitProcessed } from './helpers';

async function download(page: Page, name: RegExp | string) {
  const [dl] = await Promise.all([
    page.waitForEvent('download'),
    page
      .getByRole('button', { name, exact: typeof name === 'string' })
      .first()
      .click(),
  ]);
  expect(dl.suggestedFilename().length).toBeGreaterThan(0);
}

test('a full session has no console errors', async ({ page }) => {
  test.setTimeout(240_000);
  await page.setViewportSize({ width: 1366, height: 768 });
  const errors: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => errors.push(`page: ${e.message}`));
  await page.goto('/');
  for (const demo of ['downhole', 'crosshole', 'downhole-pair']) {
    const button = page.locator(`button[data-demo="${demo}"]`);
    if (!(await button.count())) continue;
    await button.click();
    await waitProcessed(page);
    for (let i = 0; i < 3; i++) {
      const geometry = page.getByRole('tab', { name: 'Geometry' });
      await expect(async () => {
        await geometry.click();
        await expect(geometry).toHaveAttribute('aria-selected', 'true', { timeout: 1000 });
      }).toPass({ timeout: 15_000 });
      await page.getByRole('tab', { name: 'Trace board' }).click();
      await expect(page.locator('[data-plot="trace-board"]')).toBeVisible();
    }
    // A pick edit and its undo; a station with its magnified hits.
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('z');
    // Layer boundaries on the Travel time plot (downhole kinds): add one, nudge it, back to automatic.
    const add = page.getByRole('button', { name: 'Add boundary' });
    if (await add.isVisible()) {
      await add.click();
      await page.locator('section[aria-label="Travel time"]').getByRole('slider').first().focus();
      await page.keyboard.press('ArrowDown');
      await page.getByRole('button', { name: 'Automatic boundaries' }).click();
    }
    // The panes' splitters, by keyboard.
    await page.getByRole('separator', { name: 'Resize the Records pane' }).focus();
    await page.keyboard.press('ArrowRight');
    await page.getByLabel('Wave').selectOption('P');
    await page.getByLabel('Wave').selectOption('S');
    await page.getByRole('button', { name: 'US', exact: true }).click();
    await page.getByRole('button', { name: 'Site…' }).click();
    await expect(page.locator('.sheet')).toBeVisible();
    await page.getByRole('button', { name: 'Export…' }).click();
    await download(page, /^Picks \(CSV\)/);
    await download(page, /^Site summary/);
    await download(page, 'PNG');
    await page.getByRole('button', { name: 'Close', exact: true }).click();
    await page.getByRole('button', { name: 'SI', exact: true }).click();
    await page.waitForTimeout(300);
  }
  expect(errors).toEqual([]);
});
