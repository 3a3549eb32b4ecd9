/**
 * Geometry pane, "Layer boundaries for the travel-time fits": boundaries typed by the user replace the
 * soil layers as the layers of the Travel time fits, and the Travel time pane draws the new fit lines.
 * The fitted velocity is checked against an ordinary least-squares line (closed form, common practice)
 * through the same travel-time rows the pane shows: time = intercept + path / velocity.
 */
import { test, expect, type Page } from '@playwright/test';
import { appState, SCREENS, waitProcessed } from './helpers';

interface Row {
  wave: string;
  receiver: string;
  depthM: number;
  pathM: number;
  times: Record<string, { timeS: number } | undefined>;
}
interface Fit {
  wave: string;
  topM: number;
  bottomM: number;
  method: string;
  velocityMps: number;
}

async function fitsAndRows(page: Page): Promise<{ fits: Fit[]; rows: Row[] }> {
  return page.evaluate(() => {
    const bw = (
      window as unknown as { __borewave: { derived: () => { layerFits: unknown[]; travelTimes: unknown[] } | null } }
    ).__borewave;
    const d = bw.derived()!;
    return JSON.parse(JSON.stringify({ fits: d.layerFits, rows: d.travelTimes }));
  });
}

/** Ordinary least squares of y on x: slope = sum((x - mx)(y - my)) / sum((x - mx)^2). */
function olsSlope(x: number[], y: number[]): number {
  const mx = x.reduce((a, b) => a + b, 0) / x.length;
  const my = y.reduce((a, b) => a + b, 0) / y.length;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < x.length; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
  }
  return sxy / sxx;
}

test('layer boundaries typed in Geometry (5, 10 m) set the Travel time fits', async ({ page }) => {
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  const before = await fitsAndRows(page);
  // Before: the fits follow the soil layers of the demo survey (at least one of them crosses 5-10 m).
  expect(
    before.fits.some(
      (f) => f.wave === 'S' && !(f.topM >= 5 - 1e-9 && f.bottomM <= 10 + 1e-9) && f.topM < 10 && f.bottomM > 5,
    ),
  ).toBe(true);

  await page.getByRole('tab', { name: 'Geometry' }).click();
  const field = page.getByLabel('Layer boundaries');
  await field.fill('5, 10');
  await field.press('Enter');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual([5, 10]);
  // The field shows the committed boundaries in the displayed unit.
  await expect(field).toHaveValue('5.00, 10.00');
  await page.locator('.geometry-pane').screenshot({ path: `${SCREENS}/59-geometry-layer-boundaries.png` });

  const { fits, rows } = await fitsAndRows(page);
  const s = fits.filter((f) => f.wave === 'S' && f.method === 'onset');
  // Every S fit lies inside one of the layers the boundaries make (none crosses 5 m or 10 m).
  for (const f of s)
    expect([f.bottomM <= 5 + 1e-9, f.topM >= 5 - 1e-9 && f.bottomM <= 10 + 1e-9, f.topM >= 10 - 1e-9]).toContain(true);
  const mid = s.find((f) => Math.abs(f.topM - 5) < 1e-9 && Math.abs(f.bottomM - 10) < 1e-9);
  expect(mid).toBeDefined();
  // Its velocity: 1 / OLS slope of onset time against straight path over the stations from 5 to 10 m.
  const inLayer = rows.filter((r) => r.wave === 'S' && r.times.onset && r.depthM >= 5 - 1e-9 && r.depthM <= 10 + 1e-9);
  expect(inLayer.length).toBeGreaterThanOrEqual(2);
  const vRef =
    1 /
    olsSlope(
      inLayer.map((r) => r.pathM),
      inLayer.map((r) => r.times.onset!.timeS),
    );
  expect(mid!.velocityMps).toBeCloseTo(vRef, 6);

  // The Travel time pane follows: a fit line from 5 m to 10 m, one point per station of the layer.
  await page.getByRole('tab', { name: 'Trace board' }).click();
  await expect
    .poll(() =>
      page.evaluate(() => {
        const div = document.querySelector('[data-plot="travel-time"]') as
          | (HTMLElement & { data?: { name: string; y: number[] }[] })
          | null;
        const t = div?.data?.find((d) => d.name === 'fit 5-10');
        return t ? [Math.min(...t.y), Math.max(...t.y), t.y.length] : null;
      }),
    )
    .toEqual([
      expect.closeTo(Math.min(...inLayer.map((r) => r.depthM)), 9),
      expect.closeTo(Math.max(...inLayer.map((r) => r.depthM)), 9),
      inLayer.length,
    ]);
  await page
    .locator('section[aria-label="Travel time"]')
    .screenshot({ path: `${SCREENS}/60-travel-time-layer-boundaries.png` });

  // Emptying the field goes back to the soil layers.
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await page.getByLabel('Layer boundaries').fill('');
  await page.getByLabel('Layer boundaries').press('Enter');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual([]);
  expect((await fitsAndRows(page)).fits).toEqual(before.fits);
});

interface Layering {
  fit: { layers: { topM: number; bottomM: number; vsMps: number }[] } | null;
  reason: string | null;
}

async function layering(page: Page): Promise<Layering> {
  return page.evaluate(() => {
    const bw = (window as unknown as { __borewave: { derived: () => { layering: unknown } | null } }).__borewave;
    return JSON.parse(JSON.stringify(bw.derived()!.layering));
  });
}

test('layered model: boundaries from the travel times, then edited by the user, and the fit follows', async ({
  page,
}) => {
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  const auto = await layering(page);
  // The demo's automatic layering gives a model with at least two layers (never silently nothing).
  expect(auto.reason).toBeNull();
  expect(auto.fit!.layers.length).toBeGreaterThanOrEqual(2);
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await page.getByRole('button', { name: /Edit these boundaries/ }).click();
  await expect.poll(async () => (await appState(page)).settings.layering.mode).toBe('user');
  const entered = (await appState(page)).settings.layering.boundariesM as number[];
  expect(entered.length).toBe(auto.fit!.layers.length - 1);
  // Remove the first boundary: the fit follows with one layer fewer, starting at the source depth.
  const field = page.getByLabel('Layer boundaries', { exact: true });
  await field.fill(entered.slice(1).join(', '));
  await field.press('Enter');
  await expect.poll(async () => (await layering(page)).fit?.layers.length).toBe(auto.fit!.layers.length - 1);
  const user = await layering(page);
  expect(user.fit!.layers.slice(1).map((l) => l.topM)).toEqual(entered.slice(1));
});
