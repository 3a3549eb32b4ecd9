/**
 * Trace board view and the layout on a field laptop (1366 x 768) and a desktop (1920 x 1080):
 * zoom then "see all" redraws the traces over the whole axis (checked on the drawn data, not a picture),
 * pan moves the range and the traces follow, no horizontal page overflow, a one-line top bar, at least
 * 8 rows of the method table in view with its "Used" menu and "omit" reachable, the Site sheet leaves
 * the Export button usable (design.md "Look"; issue 16).
 */
import { test, expect, type Page } from '@playwright/test';
import { SCREENS, waitProcessed } from './helpers';

/** A button of the Trace board's own toolbar (Plotly's mode bar has buttons of the same names). */
const tool = (page: Page, name: string) =>
  page.getByRole('toolbar', { name: 'Trace board tools' }).getByRole('button', { name, exact: true });

const SIZES = [
  { width: 1366, height: 768 },
  { width: 1920, height: 1080 },
];

/** Axis range and the x range of the drawn wiggles (finite values of the 'wiggles' traces). */
async function boardRanges(page: Page): Promise<{ axis: number[]; drawn: number[] }> {
  return page.evaluate(() => {
    const div = document.querySelector('[data-plot="trace-board"]') as HTMLElement & {
      data: { name?: string; x: ArrayLike<number> }[];
      _fullLayout: { xaxis: { range: number[] } };
    };
    let lo = Infinity;
    let hi = -Infinity;
    for (const tr of div.data) {
      if (tr.name !== 'wiggles') continue;
      for (let i = 0; i < tr.x.length; i++) {
        const v = tr.x[i];
        if (Number.isFinite(v)) {
          lo = Math.min(lo, v);
          hi = Math.max(hi, v);
        }
      }
    }
    return { axis: [...div._fullLayout.xaxis.range], drawn: [lo, hi] };
  });
}

/** The drawn traces cover the axis: within 2 % of its width at each end. */
function expectSpans(r: { axis: number[]; drawn: number[] }) {
  const w = r.axis[1] - r.axis[0];
  expect(r.drawn[0]).toBeLessThanOrEqual(r.axis[0] + 0.02 * w);
  expect(r.drawn[1]).toBeGreaterThanOrEqual(r.axis[1] - 0.02 * w);
}

for (const size of SIZES) {
  test(`board view and layout at ${size.width}x${size.height}`, async ({ page }) => {
    await page.setViewportSize(size);
    await page.goto('/');
    await page.locator('button[data-demo="downhole"]').click();
    await waitProcessed(page);
    const tag = `${size.width}`;

    // Default window fitted to the arrivals, and the traces drawn over exactly that window.
    await expect.poll(async () => (await boardRanges(page)).drawn[0]).toBeLessThan(Infinity);
    const fitted = await boardRanges(page);
    expectSpans(fitted);

    // Zoom: a box in the middle of the board.
    await tool(page, 'Zoom').click();
    let box = (await page.locator('[data-plot="trace-board"]').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height * 0.3);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.45, { steps: 4 });
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.6, { steps: 4 });
    await page.mouse.up();
    await expect
      .poll(async () => {
        const r = await boardRanges(page);
        return r.axis[1] - r.axis[0] < 0.5 * (fitted.axis[1] - fitted.axis[0]) && r.drawn[1] <= r.axis[1] + 1;
      })
      .toBe(true);
    const zoomed = await boardRanges(page);
    expectSpans(zoomed);
    await page.locator('.board').screenshot({ path: `${SCREENS}/board-${tag}-zoomed.png` });

    // See all (double-click): the whole record on the axis, and the traces drawn over all of it.
    await page.mouse.dblclick(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await expect
      .poll(async () => (await boardRanges(page)).axis[1] - (await boardRanges(page)).axis[0])
      .toBeGreaterThan((fitted.axis[1] - fitted.axis[0]) * 0.99);
    const all = await boardRanges(page);
    expectSpans(all);
    expect(all.axis[0]).toBeLessThanOrEqual(0.001);

    // Zoom again, then Pan: a drag to the left moves the range to later times; the traces follow.
    // (The double-click selected a station: its magnified hits now sit beside a narrower board.)
    box = (await page.locator('[data-plot="trace-board"]').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.3);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height * 0.6, { steps: 6 });
    await page.mouse.up();
    await expect
      .poll(async () => (await boardRanges(page)).axis[1] - (await boardRanges(page)).axis[0])
      .toBeLessThan(0.5 * (all.axis[1] - all.axis[0]));
    const before = await boardRanges(page);
    await tool(page, 'Pan').click();
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.5);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height * 0.5, { steps: 6 });
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.5, { steps: 6 });
    await page.mouse.up();
    await expect.poll(async () => (await boardRanges(page)).axis[0]).toBeGreaterThan(before.axis[0] + 1);
    await expect.poll(async () => (await boardRanges(page)).drawn[1]).toBeGreaterThan(before.axis[1] + 1);
    expectSpans(await boardRanges(page));

    // "Fit" returns to the window fitted to the arrivals.
    await tool(page, 'Fit').click();
    await expect
      .poll(async () => (await boardRanges(page)).axis.map((v) => Math.round(v)))
      .toEqual(fitted.axis.map((v) => Math.round(v)));

    // Layout: no horizontal overflow, a one-line top bar.
    const layout = await page.evaluate(() => ({
      scroll: document.documentElement.scrollWidth,
      inner: window.innerWidth,
      top: document.querySelector('.topbar')!.getBoundingClientRect().height,
    }));
    expect(layout.scroll).toBeLessThanOrEqual(layout.inner);
    expect(layout.top).toBeLessThan(40);

    // Method table: at least 8 body rows fully inside its scroll box; the Used menu and omit in view.
    const table = await page.evaluate(() => {
      const wrap = document.querySelector('.intervals .table-wrap')!.getBoundingClientRect();
      const head = document.querySelector('.intervals thead')!.getBoundingClientRect();
      const rows = [...document.querySelectorAll('.intervals tbody tr')].filter((r) => {
        const b = r.getBoundingClientRect();
        return b.top >= head.bottom - 1 && b.bottom <= wrap.bottom + 1;
      }).length;
      const sel = document.querySelector('.intervals tbody tr td:last-child select')!.getBoundingClientRect();
      const omit = document.querySelector('.intervals tbody tr td:last-child button')!.getBoundingClientRect();
      return {
        rows,
        selInside: sel.left >= wrap.left && sel.right <= wrap.right + 1,
        omitInside: omit.left >= wrap.left && omit.right <= wrap.right + 1 && omit.right <= window.innerWidth,
      };
    });
    expect(table.rows).toBeGreaterThanOrEqual(8);
    expect(table.selInside).toBe(true);
    expect(table.omitInside).toBe(true);

    // Vs and Vp on their own axes; Vp can be hidden.
    await expect(page.locator('.profile')).toContainText('Vs (m/s)');
    await expect(page.locator('.profile')).toContainText('Vp (m/s)');
    await page.locator('.profile').screenshot({ path: `${SCREENS}/profile-${tag}.png` });
    await page.getByTitle('Show or hide the Vp column').locator('input').uncheck();
    await expect(page.locator('.profile')).not.toContainText('Vp (m/s)');
    await page.getByTitle('Show or hide the Vp column').locator('input').check();

    // Site sheet open: the Export button stays visible and opens the Export sheet.
    await page.getByRole('button', { name: 'Site…' }).click();
    await expect(page.locator('.sheet')).toBeVisible();
    await page.screenshot({ path: `${SCREENS}/site-sheet-${tag}.png` });
    await page.getByRole('button', { name: 'Export…' }).click();
    await expect(page.locator('.sheet')).toContainText('Site summary (JSON)');
    await page.getByRole('button', { name: 'Close', exact: true }).click();

    // A station with reversed hits, selected: magnified beside the board.
    await tool(page, 'Pick').click();
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowDown');
    await expect(page.locator('.hits-detail')).toBeVisible();
    await page.screenshot({ path: `${SCREENS}/whole-${tag}.png` });
  });
}

test('display gains, clip and style redraw the board; excluded traces are greyed', async ({ page }) => {
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  await page.locator('button[data-demo="crosshole"]').click();
  await waitProcessed(page);
  await page.locator('.board-display summary').click();
  await page.getByLabel('Amplitude scaling').selectOption('agc');
  await expect(page.getByLabel('AGC window (ms)')).toBeVisible();
  await page.getByLabel('Clip').selectOption('0.5');
  await page.getByLabel('Trace style').selectOption('wiggle');
  await page.locator('.board').screenshot({ path: `${SCREENS}/board-crosshole-agc.png` });
  const lobes = await page.evaluate(
    () =>
      (document.querySelector('[data-plot="trace-board"]') as HTMLElement & { data: { name?: string }[] }).data.filter(
        (t) => t.name === 'lobes',
      ).length,
  );
  expect(lobes).toBe(0);
  await page.locator('.board-display summary').click();
  // Crosshole arrivals (6–25 ms) fill most of the fitted window, not its first fifth.
  const r = await boardRanges(page);
  expect(r.axis[1]).toBeLessThan(80);
  // Exclude the selected station's pick (x): its trace is drawn in the greyed trace.
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('x');
  await expect
    .poll(() =>
      page.evaluate(() =>
        (document.querySelector('[data-plot="trace-board"]') as HTMLElement & { data: { name?: string }[] }).data.some(
          (t) => t.name === 'excluded traces',
        ),
      ),
    )
    .toBe(true);
  await page.locator('.board').screenshot({ path: `${SCREENS}/board-crosshole-excluded.png` });
});
