/**
 * Screenshots of every pane after a typical session (demo downhole survey, one pick edited, a comparison
 * profile loaded), for a person to look at: readability, overlaps, units in headings, cautions. The
 * checks are what each pane must show (docs/conventions.md "Screens" and "Look"): units in the headings, the
 * cautions in the Site sheet, the pick legend on the Trace board.
 */
import { test, expect } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { SCREENS, waitProcessed } from './helpers';

test('every pane, one screenshot each', async ({ page }) => {
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await page.getByRole('button', { name: 'Compare with another profile…' }).click();
  await page.getByTestId('comparison-input').setInputFiles({
    name: 'masw.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('depth_m,vs_mps\n0,180\n6,260\n16,380\n'),
  });
  await expect(page.getByTestId('comparison-vs30')).toBeVisible();
  for (let i = 0; i < 12; i++) await page.keyboard.press('ArrowDown');
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('ArrowRight');
  await page.waitForTimeout(600);

  await page.screenshot({ path: `${SCREENS}/50-whole-window.png` });
  await page.locator('.records').screenshot({ path: `${SCREENS}/51-records.png` });
  await expect(page.locator('.board-foot')).toContainText('edited');
  await page.locator('.board').screenshot({ path: `${SCREENS}/52-trace-board.png` });

  // Zoom tool: a box dragged on the board; the pick overlay follows the board's axes exactly.
  await page.keyboard.press('m');
  const box = (await page.locator('[data-plot="trace-board"]').boundingBox())!;
  await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.2);
  await page.mouse.down();
  await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.4, { steps: 5 });
  await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.5, { steps: 5 });
  await page.mouse.up();
  const ranges = () =>
    page.evaluate(() =>
      ['trace-board', 'trace-board-picks'].map((n) => {
        const fl = (
          document.querySelector(`[data-plot="${n}"]`) as HTMLElement & {
            _fullLayout: { xaxis: { range: number[] }; yaxis: { range: number[] } };
          }
        )._fullLayout;
        return [...fl.xaxis.range, ...fl.yaxis.range].map((v) => Number(v.toFixed(6)));
      }),
    );
  await expect
    .poll(async () => {
      const [a, b] = await ranges();
      return JSON.stringify(a) === JSON.stringify(b);
    })
    .toBe(true);
  const [zoomed] = await ranges();
  expect(zoomed[1] - zoomed[0]).toBeLessThan(100);
  await page.locator('.board').screenshot({ path: `${SCREENS}/52b-trace-board-zoomed.png` });
  await page.mouse.dblclick(box.x + box.width * 0.5, box.y + box.height * 0.5);
  await page.keyboard.press('p');
  await expect(page.locator('.profile')).toContainText('Vs (m/s)');
  await page.locator('.profile').screenshot({ path: `${SCREENS}/53-profile.png` });
  await expect(page.locator('section[aria-label="Pair check"]')).toContainText('Δt');
  await page.locator('section[aria-label="Pair check"]').screenshot({ path: `${SCREENS}/54-pair-check.png` });
  await page.locator('section[aria-label="Travel time"]').screenshot({ path: `${SCREENS}/55-travel-time.png` });

  await page.getByRole('button', { name: 'Site…' }).click();
  await expect(page.getByTestId('site-spread')).toContainText('P05');
  await expect(page.locator('.sheet')).toContainText('qualified professional');
  await page.locator('.right').screenshot({ path: `${SCREENS}/56-site-sheet.png` });
  // A pick nudge: the Vs30 updates at once, the Monte Carlo spread follows after a 250 ms pause.
  const during = await page.evaluate(async () => {
    window.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight' }));
    await new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));
    return {
      updating: !!document.querySelector('[data-testid="spread-updating"]'),
      spread: !!document.querySelector('[data-testid="site-spread"]'),
    };
  });
  expect(during).toEqual({ updating: true, spread: false });
  await expect(page.getByTestId('site-spread')).toContainText('P05');
  await expect(page.getByTestId('spread-updating')).toHaveCount(0);
  await page.getByRole('button', { name: 'Close' }).click();
  await page.getByRole('button', { name: 'Export…' }).first().click();
  await page.locator('.right').screenshot({ path: `${SCREENS}/57-export-sheet.png` });
  // The Trace board image carries the pick markers (drawn on an overlay on screen): Plotly draws each
  // marker as an SVG path whose class list starts with "point", one per station of the 30-depth board.
  const [svg] = await Promise.all([
    page.waitForEvent('download'),
    page
      .locator('.sheet table.screen-plots tr', { hasText: 'Trace board' })
      .getByRole('button', { name: 'SVG' })
      .click(),
  ]);
  const text = readFileSync((await svg.path())!, 'utf8');
  expect(text.match(/class="point[" ]/g)?.length ?? 0).toBeGreaterThanOrEqual(30);
  await page.getByRole('button', { name: 'Close' }).click();
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await page.locator('.centre').screenshot({ path: `${SCREENS}/58-geometry.png` });
});
