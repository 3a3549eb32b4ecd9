/**
 * Reliability (docs/conventions.md "Quality": bad input of any kind loses nothing else): a page killed before or
 * during an autosave leaves the last completed save, never a half-written one. Common practice for
 * crash-safe saving: write the new data first, then switch one record that names it (one IndexedDB
 * transaction; IndexedDB 3.0, W3C, "transaction" durability and atomicity).
 *
 * The same browser context keeps IndexedDB between the pages, as a browser restart on the same profile.
 */
import { test, expect, type Page } from '@playwright/test';
import { appState, SCREENS, waitProcessed } from './helpers';

type Saved = { edits: unknown; comparison: unknown; survey: unknown };

async function sessionState(page: Page): Promise<Saved & { revision: number }> {
  return page.evaluate(() => {
    const bw = (
      window as unknown as {
        __borewave: {
          useApp: { getState: () => { edits: unknown; comparison: unknown; survey: unknown; revision: number } };
        };
      }
    ).__borewave;
    const s = bw.useApp.getState();
    return JSON.parse(
      JSON.stringify({ edits: s.edits, comparison: s.comparison, survey: s.survey, revision: s.revision }),
    );
  });
}

/** Waits until a save has completed that holds the store's current revision. */
async function waitSaved(page: Page): Promise<void> {
  await page.waitForFunction(
    () => {
      const bw = (
        window as unknown as {
          __borewave: {
            useApp: { getState: () => { revision: number } };
            useAutosave: { getState: () => { status: string; savedRevision: number | null } };
          };
        }
      ).__borewave;
      const a = bw.useAutosave.getState();
      return a.status === 'saved' && a.savedRevision === bw.useApp.getState().revision;
    },
    null,
    { timeout: 15_000 },
  );
}

async function restore(page: Page): Promise<void> {
  await page.goto('/');
  await expect(page.getByTestId('restore-banner')).toBeVisible();
  await page.getByRole('button', { name: 'Restore it' }).click();
  await waitProcessed(page);
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
}

test('a page closed before or during an autosave restores the last completed save', async ({ page, context }) => {
  test.setTimeout(150_000);
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await page.getByRole('button', { name: 'Compare with another profile…' }).click();
  await page
    .getByTestId('comparison-input')
    .setInputFiles({ name: 'masw.csv', mimeType: 'text/csv', buffer: Buffer.from('depth_m,vs_mps\n0,200\n10,400\n') });
  await expect(page.getByTestId('comparison-vs30')).toBeVisible();
  // Edit A: a pick nudged one sample; wait for the save that holds it.
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('ArrowRight');
  await waitSaved(page);
  const savedA = await sessionState(page);
  expect(Object.keys((savedA.edits as { picks: object }).picks)).toHaveLength(1);

  // Edit B, then the page dies before the save pause (700 ms) is over.
  await page.keyboard.press('ArrowRight');
  const lostB = await sessionState(page);
  expect(lostB.edits).not.toEqual(savedA.edits);
  await page.close({ runBeforeUnload: false });

  const page2 = await context.newPage();
  await restore(page2);
  const back = await sessionState(page2);
  expect(back.edits).toEqual(savedA.edits);
  expect(back.comparison).toEqual(savedA.comparison);
  expect(back.survey).toEqual(savedA.survey);
  await page2.screenshot({ path: `${SCREENS}/41-restored-after-crash.png` });

  // The page dies about when the save pause ends (before, during or just after the write): the
  // restored session is one of the two complete states (before or after the edit), with all 60 files.
  await waitSaved(page2);
  const before = await sessionState(page2);
  await page2.keyboard.press('ArrowDown');
  await page2.keyboard.press('ArrowDown');
  await page2.keyboard.press('ArrowLeft');
  const after = await sessionState(page2);
  expect(after.edits).not.toEqual(before.edits);
  await page2.waitForTimeout(700);
  await page2.close({ runBeforeUnload: false });

  const page3 = await context.newPage();
  await restore(page3);
  const third = await appState(page3);
  expect([JSON.stringify(before.edits), JSON.stringify(after.edits)]).toContain(JSON.stringify(third.edits));
});
