/**
 * Layer boundaries edited on the Travel time plot (issue 14, "the user adds, moves or removes
 * boundaries on the travel-time plot and the fit follows"; issue 16, look at 1366 x 768):
 * the automatic boundaries are drawn as handles marked "chosen from the travel times"; Delete on a
 * handle removes it, a drag moves it, a click on the depth axis adds one, arrows nudge one, "Add
 * boundary" splits the thickest layer, "Automatic boundaries" goes back. Every change is one undo step,
 * the core's layered fit follows (layer count, the profile's Vs), and the boundaries are saved with the
 * session. Expected figures come from the app's own core fit (derive()), read through the test handle.
 */
import { test, expect, type Page } from '@playwright/test';
import { appState, derivedState, SCREENS, waitProcessed } from './helpers';

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

/** Page y of a depth (m, SI view) on the Travel time plot, and the x of its depth axis. */
async function ttPixel(page: Page, depthM: number): Promise<{ axisX: number; y: number }> {
  return page.evaluate((z) => {
    const div = document.querySelector('[data-plot="travel-time"]') as HTMLDivElement & {
      _fullLayout: { xaxis: { _offset: number }; yaxis: { _offset: number; l2p: (v: number) => number } };
    };
    const box = div.getBoundingClientRect();
    const fl = div._fullLayout;
    return { axisX: box.left + fl.xaxis._offset - 30, y: box.top + fl.yaxis._offset + fl.yaxis.l2p(z) };
  }, depthM);
}

/** Vs of the profile row that spans topM-bottomM. */
async function profileVs(page: Page, topM: number, bottomM: number): Promise<number | null> {
  const d = await derivedState(page);
  const r = d.profile.find((p) => Math.abs(p.topM - topM) < 1e-6 && Math.abs(p.bottomM - bottomM) < 1e-6);
  return r?.vsMps ?? null;
}

const cm = (z: number) => Math.round(z * 100) / 100;

test('layer boundaries on the Travel time plot: remove, drag, undo, add, nudge, back to automatic, saved', async ({
  page,
}) => {
  test.setTimeout(150_000);
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  const tt = page.locator('section[aria-label="Travel time"]');
  const handles = tt.getByRole('slider');

  // Automatic: one handle per boundary of the core's fit, each saying where it comes from.
  const auto = await layering(page);
  expect(auto.reason).toBeNull();
  const autoB = auto.fit!.layers.slice(1).map((l) => l.topM);
  expect(autoB.length).toBeGreaterThanOrEqual(2);
  await expect(handles).toHaveCount(autoB.length);
  for (let i = 0; i < autoB.length; i++)
    await expect(handles.nth(i)).toHaveAttribute('aria-label', /chosen from the travel times/);
  await expect(tt.getByRole('button', { name: 'Automatic boundaries' })).toBeDisabled();
  await tt.screenshot({ path: `${SCREENS}/61-travel-time-boundaries-auto.png` });
  const past0 = (await appState(page)).past;

  // Delete on the shallowest handle: user mode with the other automatic boundaries (to the cm), one layer fewer.
  await handles.first().focus();
  await page.keyboard.press('Delete');
  await expect.poll(async () => (await appState(page)).settings.layering.mode).toBe('user');
  const kept = autoB.slice(1).map(cm);
  expect((await appState(page)).settings.layering.boundariesM).toEqual(kept);
  expect((await appState(page)).past).toBe(past0 + 1);
  await expect(handles).toHaveCount(kept.length);
  await expect(handles.first()).toHaveAttribute('aria-label', /set by you/);
  await expect.poll(async () => (await layering(page)).fit?.layers.length).toBe(kept.length + 1);

  // Drag the (new) first boundary down to about 10 m: the fit and the profile's Vs of 8-9 m follow.
  const vsBefore = (await profileVs(page, 8, 9))!;
  expect(vsBefore).toBeGreaterThan(0);
  const h = (await handles.first().boundingBox())!;
  const target = await ttPixel(page, 10);
  await page.mouse.move(h.x + h.width / 2, h.y + h.height / 2);
  await page.mouse.down();
  await page.mouse.move(h.x + h.width / 2, (h.y + target.y) / 2, { steps: 3 });
  await page.mouse.move(h.x + h.width / 2, target.y, { steps: 3 });
  await expect(tt.locator('.bnd-readout')).toBeVisible();
  await page.mouse.up();
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM[0]).toBeGreaterThan(kept[0] + 1);
  const moved = (await appState(page)).settings.layering.boundariesM;
  // within half a metre of 10 m (one pixel is about 0.3 m on this plot)
  expect(Math.abs(moved[0] - 10)).toBeLessThan(0.5);
  expect(moved.slice(1)).toEqual(kept.slice(1));
  expect((await appState(page)).past).toBe(past0 + 2);
  await expect.poll(async () => (await layering(page)).fit?.layers[1].topM).toBeCloseTo(moved[0], 6);
  const vsMoved = (await profileVs(page, 8, 9))!;
  // 8-9 m now lies in the top layer instead of the layer below the old boundary: its Vs changes by > 10 %.
  expect(Math.abs(vsMoved - vsBefore) / vsBefore).toBeGreaterThan(0.1);
  await tt.screenshot({ path: `${SCREENS}/62-travel-time-boundary-dragged.png` });

  // Undo restores the boundary, the fit and the profile exactly.
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual(kept);
  expect(await profileVs(page, 8, 9)).toBeCloseTo(vsBefore, 9);
  await page.getByRole('button', { name: 'Redo' }).click();
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual(moved);

  // A click on the depth axis at about 3 m adds a boundary there.
  const at3 = await ttPixel(page, 3);
  await page.mouse.click(at3.axisX, at3.y);
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM.length).toBe(moved.length + 1);
  const added = (await appState(page)).settings.layering.boundariesM;
  expect(Math.abs(added[0] - 3)).toBeLessThan(0.5);
  await expect.poll(async () => (await layering(page)).fit?.layers.length).toBe(added.length + 1);

  // Keyboard: arrow down moves it 0.1 m; shift + arrow up 1 m; the board's trace keys do not fire.
  const selected = await page.evaluate(
    () =>
      (
        window as unknown as { __borewave: { useApp: { getState: () => { view: { selectedStation: unknown } } } } }
      ).__borewave.useApp.getState().view.selectedStation,
  );
  await handles.first().focus();
  await page.keyboard.press('ArrowDown');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM[0]).toBeCloseTo(added[0] + 0.1, 6);
  await page.keyboard.press('Shift+ArrowUp');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM[0]).toBeCloseTo(added[0] - 0.9, 6);
  expect(
    await page.evaluate(
      () =>
        (
          window as unknown as { __borewave: { useApp: { getState: () => { view: { selectedStation: unknown } } } } }
        ).__borewave.useApp.getState().view.selectedStation,
    ),
  ).toEqual(selected);

  // "Add boundary" (keyboard reachable) splits the thickest layer.
  const n = (await appState(page)).settings.layering.boundariesM.length;
  await tt.getByRole('button', { name: 'Add boundary' }).click();
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM.length).toBe(n + 1);
  await tt.screenshot({ path: `${SCREENS}/63-travel-time-boundaries-user.png` });

  // Saved with the session: a reload restores the same boundaries.
  const saved = (await appState(page)).settings.layering;
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
  await page.goto('/');
  await page.getByRole('button', { name: 'Restore it' }).click();
  await waitProcessed(page);
  await expect.poll(async () => (await appState(page)).settings.layering).toEqual(saved);
  await expect(handles).toHaveCount(saved.boundariesM.length);

  // Back to automatic: the fit's own boundaries again, drawn as automatic.
  await tt.getByRole('button', { name: 'Automatic boundaries' }).click();
  await expect.poll(async () => (await appState(page)).settings.layering.mode).toBe('auto');
  await expect.poll(async () => (await layering(page)).fit?.layers.length).toBe(auto.fit!.layers.length);
  await expect(handles).toHaveCount(autoB.length);
  await expect(handles.first()).toHaveAttribute('aria-label', /chosen from the travel times/);
});

test('a boundary layout the fit cannot take: the plot says why', async ({ page }) => {
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  const tt = page.locator('section[aria-label="Travel time"]');
  // Only a boundary outside the receivers: the core ignores it and says so; the handle is marked unused.
  await page.getByRole('tab', { name: 'Geometry' }).click();
  const field = page.getByLabel('Layer boundaries', { exact: true });
  await field.fill('5, 45');
  await field.press('Enter');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual([5, 45]);
  await expect(tt.getByTestId('layered-model-note')).toContainText('ignored');
  await expect(tt.getByRole('slider').nth(1)).toHaveAttribute('aria-label', /not used by the fit/);
  await tt.screenshot({ path: `${SCREENS}/64-travel-time-boundary-unused.png` });
  // A boundary in every gap between receivers (1.5, 2.5 ... 29.5 m): more unknowns than travel times,
  // so no fit can be made (30 times, 30 layers and a trigger offset); the plot itself says why.
  const everyGap = Array.from({ length: 29 }, (_, i) => i + 1.5);
  await field.fill(everyGap.join(', '));
  await field.press('Enter');
  await expect.poll(async () => (await appState(page)).settings.layering.boundariesM).toEqual(everyGap);
  await expect.poll(async () => (await layering(page)).fit).toBeNull();
  const reason = (await layering(page)).reason!;
  expect(reason).toMatch(/unknowns/);
  const onPlot = () =>
    page.evaluate(() =>
      (
        document.querySelector('[data-plot="travel-time"]') as HTMLElement & {
          layout: { annotations: { text: string }[] };
        }
      ).layout.annotations.map((a) => a.text.replace(/<br>/g, ' ')),
    );
  await expect.poll(async () => (await onPlot()).some((t) => t === `No layered model: ${reason}`)).toBe(true);
  await expect(tt.getByTestId('layered-model-note')).toContainText('No layered model');
  await tt.screenshot({ path: `${SCREENS}/65-travel-time-no-fit.png` });
});
