/**
 * Curves & liquefaction view on the demo downhole survey (our invented site): curves per layer on a
 * log-strain axis; shaking and soil types typed in the Geometry soil column start the Vs-based screen;
 * the factor of safety the app shows is checked against the simplified procedure's formulas evaluated
 * here from the row's own stresses and Vs (Youd et al. 2001 CSR and rd; Andrus & Stokoe 2000 CRR,
 * coefficients from memory); liquefaction.csv carries the screening cautions. Out-of-range shaking is
 * refused at the field and never produces a factor of safety.
 */
import { readFileSync } from 'node:fs';
import { expect, type Page, test } from '@playwright/test';
import type { Derived } from '../src/core/pipeline';
import { appState, SCREENS, waitProcessed } from './helpers';

async function design(page: Page): Promise<Derived['design']> {
  return page.evaluate(() => {
    const bw = (window as unknown as { __borewave: { derived: () => Derived | null } }).__borewave;
    return JSON.parse(JSON.stringify(bw.derived()!.design));
  });
}

async function typeInto(page: Page, name: string, value: string): Promise<void> {
  const f = page.getByRole('textbox', { name, exact: true });
  await f.fill(value);
  await f.press('Enter');
}

test('curves per layer, then the liquefaction screen from typed shaking and soil types', async ({ page }) => {
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);

  await page.getByRole('tab', { name: 'Curves & liquefaction' }).click();
  await expect(page.locator('[data-plot="design-curves"]')).toBeVisible();
  let d = await design(page);
  expect(d.layers.length).toBe(6);
  expect(d.liquefaction).toBeNull();
  // Darendeli: G/Gmax = 0.5 at gamma_r for every layer (definition); curves span 0.0001-1 %.
  for (const l of d.layers) {
    expect(l.curve[0].strainPct).toBeCloseTo(1e-4, 10);
    expect(l.curve[l.curve.length - 1].strainPct).toBeCloseTo(1, 10);
  }
  await expect(page.getByText('Enter the peak ground acceleration')).toBeVisible();

  // Out-of-range shaking is refused at the field: no screen.
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await typeInto(page, 'Peak ground acceleration', '5');
  await expect(page.getByRole('textbox', { name: 'Peak ground acceleration', exact: true })).toHaveAttribute(
    'aria-invalid',
    'true',
  );
  expect((await appState(page)).settings.design.pgaG).toBeNull();

  // Shaking, the clay layer re-marked silty sand with 20 % fines, a working strain on the sand.
  await typeInto(page, 'Peak ground acceleration', '0.3');
  await typeInto(page, 'Magnitude', '7.5');
  await page.getByRole('combobox', { name: 'Soil type, layer 2' }).selectOption('silty-sand');
  await typeInto(page, 'Fines content, layer 2', '20');
  await typeInto(page, 'Working strain, layer 3', '0.01');
  await page.locator('table.soil-design').scrollIntoViewIfNeeded();
  await page.screenshot({ path: `${SCREENS}/62-geometry-soil-design-1366.png` });
  const st = await appState(page);
  expect(st.settings.design.pgaG).toBe(0.3);
  expect(st.survey.soil.layers[1].soilType).toBe('silty-sand');

  await page.getByRole('tab', { name: 'Curves & liquefaction' }).click();
  await expect(page.locator('[data-plot="liquefaction-screen"]')).toBeVisible();
  d = await design(page);
  const q = d.liquefaction!;
  const screened = q.byInterval.filter((r) => r.status === 'screened');
  expect(screened.length).toBeGreaterThan(0);
  for (const r of screened) {
    // Youd et al. (2001): rd = (1 - 0.4113 z^0.5 + 0.04052 z + 0.001753 z^1.5) /
    //   (1 - 0.4177 z^0.5 + 0.05729 z - 0.006205 z^1.5 + 0.001210 z^2); CSR = 0.65 amax (sv/sv') rd
    const z = r.midM;
    const rd =
      (1 - 0.4113 * z ** 0.5 + 0.04052 * z + 0.001753 * z ** 1.5) /
      (1 - 0.4177 * z ** 0.5 + 0.05729 * z - 0.006205 * z ** 1.5 + 0.00121 * z * z);
    const csr = 0.65 * 0.3 * (r.sigmaVKpa / r.sigmaVEffKpa) * rd;
    // Andrus & Stokoe (2000) (from memory): Vs1 = Vs (100/sv')^0.25; Vs1* = 215 - 0.5 (FC - 5) for 5-35 %
    const vs1 = r.vsMps * (100 / r.sigmaVEffKpa) ** 0.25;
    const star = r.soilType === 'silty-sand' ? 215 - 0.5 * (20 - 5) : 215 - 0.5 * (8 - 5);
    const crr = 0.022 * (vs1 / 100) ** 2 + 2.8 * (1 / (star - vs1) - 1 / star);
    // MSF (Youd et al. 2001, Idriss): 10^2.24 / 7.5^2.56
    const fs = (crr * (10 ** 2.24 / 7.5 ** 2.56)) / csr;
    expect(Math.abs((r.factorOfSafety as number) - fs) / fs).toBeLessThan(1e-9);
  }
  // The soft layer (Vs ~ 110 m/s) marked silty sand fails the screen at 0.3 g.
  expect(screened.some((r) => r.soilType === 'silty-sand' && (r.factorOfSafety as number) < 1)).toBe(true);
  const sand = d.layers[2];
  expect(sand.working?.strainPct).toBe(0.01);
  expect(sand.working!.gKpa! / sand.gmaxKpa!).toBeCloseTo(sand.working!.modulusRatio, 10);

  await page.locator('.design-pane').evaluate((el) => el.scrollTo(0, 0));
  await page.screenshot({ path: `${SCREENS}/60-design-curves-1366.png` });
  await page.locator('[data-plot="liquefaction-screen"]').scrollIntoViewIfNeeded();
  await page.screenshot({ path: `${SCREENS}/61-design-screen-1366.png` });

  await page.getByRole('button', { name: 'Export…' }).first().click();
  const [dl] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('button', { name: /^Liquefaction screen from Vs/ }).click(),
  ]);
  const csv = readFileSync((await dl.path())!, 'utf8');
  expect(csv.split('\n')[0]).toMatch(/^basis,depth_top_m,/);
  expect(csv).toMatch(/# CAUTION: Liquefaction triggering SCREEN from shear-wave velocity only: not for design/);
  const [dl2] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('button', { name: /^Modulus reduction and damping curves/ }).click(),
  ]);
  const curves = readFileSync((await dl2.path())!, 'utf8');
  expect(curves).toMatch(/,working,0\.01,/);
});
