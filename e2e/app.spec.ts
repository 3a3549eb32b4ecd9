/**
 * The app in a real browser: demo survey, a corrupt file beside good ones, auto-pick, a pick edited by
 * mouse and by keys, undo, the interval and profile following the edit, CSV exports checked against the
 * core run in this test process on the same inputs, and restore after a reload.
 *
 * Reference for the exports: the core pipeline itself (src/core/pipeline.ts runPipeline and
 * src/core/report/tables.ts), run here in Node on the same files, survey, settings and edits; the app
 * must only pass the core's text through (docs/conventions.md: "never format CSV in the UI").
 */
import { test, expect, type Page } from '@playwright/test';
import { readFileSync, mkdirSync } from 'node:fs';
import { makeDemoProject } from '../src/core/synth/demo';
import { readWaveFile } from '../src/core/io/readers';
import { readProjectArchive } from '../src/core/io/project';
import { runPipeline } from '../src/core/pipeline';
import { intervalsTable, picksTable, profileTable, toCsv } from '../src/core/report/tables';
import { intervalKey, pickEditKey, stationKey } from '../src/core/keys';
import { reported } from '../src/core/report/digits';
import { setSoftwareVersion } from '../src/core/version';
import type { WaveRecord } from '../src/core/model';
import { appState, boardPixel, derivedState, SCREENS, waitProcessed } from './helpers';

mkdirSync(SCREENS, { recursive: true });

const STATION = stationKey('r0', 10, 'H1');
const EDIT_KEY = pickEditKey(STATION, 'S', 'onset');
const INTERVAL_ABOVE = intervalKey('S', stationKey('r0', 9, 'H1'), STATION);

async function download(page: Page, button: RegExp): Promise<string> {
  const [dl] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: button }).click()]);
  return readFileSync((await dl.path())!, 'utf8');
}

function coreRun(state: Awaited<ReturnType<typeof appState>>) {
  const demo = makeDemoProject('downhole');
  const records = new Map<string, WaveRecord>();
  for (const f of demo.files) {
    const r = readWaveFile(f.bytes, f.name);
    if (r.ok) records.set(f.name, { ...r.record, id: f.name });
  }
  return runPipeline({ survey: state.survey, records, settings: state.settings, edits: state.edits });
}

test('demo survey, corrupt file, pick edits by mouse and keys, undo, exports, restore', async ({ page }) => {
  const problems: string[] = [];
  page.on('pageerror', (e) => problems.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error' && !/favicon/i.test(m.text())) problems.push(m.text());
  });
  await page.goto('/');
  await expect(page.getByRole('heading', { name: 'Records' })).toBeVisible();

  // Open the demo survey: 30 depths x 2 hits = 60 files, all read.
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
  await expect(page.locator('[data-plot="trace-board"] .main-svg').first()).toBeVisible();
  await expect(page.locator('.board-foot')).toContainText('30 traces');

  // A corrupt file shows its own error; the 60 good files stay loaded.
  const corrupt = Buffer.from([
    0x55, 0x3a, 0x01, 0x00, 0x10, 0x00, 0x40, 0x00, 0x01, 0x00, 0x00, 0x01, 0x0a, 0x00, 0x00, 0x00, 0xff, 0xff,
  ]);
  await page
    .getByTestId('file-input')
    .setInputFiles({ name: 'broken.sg2', mimeType: 'application/octet-stream', buffer: corrupt });
  const bad = page.locator('li.file[data-file="broken.sg2"]');
  await expect(bad).toHaveAttribute('data-status', 'error');
  await expect(bad.locator('.file-error')).toContainText('broken.sg2');
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
  await page.screenshot({ path: `${SCREENS}/01-demo-with-corrupt-file.png` });

  // Auto-pick again on request.
  await page.getByRole('button', { name: 'Auto-pick' }).click();
  await waitProcessed(page);

  const before = await derivedState(page);
  const autoPick = before.picks.find(
    (p) => p.stationKey === STATION && p.wave === 'S' && (p.method === 'aic' || p.method === 'stalta'),
  )!;
  expect(autoPick, 'an automatic onset pick at 10 m').toBeTruthy();
  const chosenBefore = before.intervals.find((r) => r.key === INTERVAL_ABOVE && r.chosen)!;
  expect(chosenBefore.method).toBe('layer-model');
  const vs30Before = before.vs30;

  // Mouse: click 2 ms after the automatic onset on the 10 m trace.
  const targetMs = autoPick.timeS * 1000 + 2;
  const at = await boardPixel(page, targetMs, 10);
  await page.mouse.click(at.x, at.y);
  let st = await appState(page);
  const mouseS = st.edits.picks[EDIT_KEY];
  // Tolerance: one screen pixel of the time axis (< 0.3 ms on this board).
  expect(Math.abs(mouseS * 1000 - targetMs)).toBeLessThan(0.3);
  expect(st.edits.chosenMethod[INTERVAL_ABOVE]).toBe('onset');
  await expect(page.locator('.board-foot .notice')).toContainText('Interval now uses your picks');

  let after = await derivedState(page);
  const chosenAfter = after.intervals.find((r) => r.key === INTERVAL_ABOVE && r.chosen)!;
  expect(chosenAfter.method).toBe('onset');
  const profileRow = after.profile.find((r) => r.intervalKey === INTERVAL_ABOVE)!;
  expect(profileRow.vsMps).toBeCloseTo(chosenAfter.velocityMps!, 9);
  expect(profileRow.vsMps).not.toBeCloseTo(chosenBefore.velocityMps!, 3);
  expect(after.vs30).not.toBe(vs30Before);
  const row = page.locator(`[data-testid="intervals-table"] tr[data-key="${INTERVAL_ABOVE}"]`);
  await expect(row.locator('td[data-method="onset"]')).toHaveClass(/chosen/);

  // Keys: two samples later (demo sample interval 0.05 ms), exact.
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('ArrowRight');
  st = await appState(page);
  expect(st.edits.picks[EDIT_KEY]).toBeCloseTo(mouseS + 2 * 5e-5, 12);
  await page.screenshot({ path: `${SCREENS}/02-pick-edited.png` });

  // Undo the two nudges and the click: back to no edit, the default (layered model) chosen again.
  await page.keyboard.press('z');
  await page.keyboard.press('z');
  st = await appState(page);
  expect(st.edits.picks[EDIT_KEY]).toBeCloseTo(mouseS, 12);
  await page.keyboard.press('Control+z');
  st = await appState(page);
  expect(st.edits.picks[EDIT_KEY]).toBeUndefined();
  after = await derivedState(page);
  expect(after.intervals.find((r) => r.key === INTERVAL_ABOVE && r.chosen)!.method).toBe('layer-model');
  expect(after.vs30).toBe(vs30Before);
  // Redo brings the click back.
  await page.keyboard.press('Shift+Z');
  st = await appState(page);
  expect(st.edits.picks[EDIT_KEY]).toBeCloseTo(mouseS, 12);

  // Drag the pick 40 px later: one undo step for the whole gesture.
  const from = await boardPixel(page, mouseS * 1000, 10);
  const pastBefore = st.past;
  await page.mouse.move(from.x, from.y);
  await page.mouse.down();
  for (let k = 1; k <= 4; k++) await page.mouse.move(from.x + 10 * k, from.y);
  await page.mouse.up();
  st = await appState(page);
  expect(st.past).toBe(pastBefore + 1);
  expect(st.edits.picks[EDIT_KEY]).toBeGreaterThan(mouseS + 0.001);
  await page.keyboard.press('z');
  st = await appState(page);
  expect(st.edits.picks[EDIT_KEY]).toBeCloseTo(mouseS, 12);

  // Snap: editing first peaks (key 2) with snap on (key s), a click 0.4 ms after the automatic peak of
  // the 12 m trace lands on that peak. Reference: the core's characteristicPoints (the auto-pick), to
  // within 0.05 ms (a tenth of the 0.5 ms a pick may be off; docs/methods.md s.2).
  const peak12 = before.picks.find(
    (p) => p.stationKey === stationKey('r0', 12, 'H1') && p.wave === 'S' && p.method === 'peak',
  )!;
  expect(peak12, 'an automatic first-peak pick at 12 m').toBeTruthy();
  await page.keyboard.press('2');
  await page.keyboard.press('s');
  const near = await boardPixel(page, peak12.timeS * 1000 + 0.4, 12);
  await page.mouse.click(near.x, near.y);
  st = await appState(page);
  expect(Math.abs(st.edits.picks[pickEditKey(stationKey('r0', 12, 'H1'), 'S', 'peak')] - peak12.timeS)).toBeLessThan(
    5e-5,
  );
  await page.keyboard.press('z');
  await page.keyboard.press('s');
  await page.keyboard.press('1');
  await page.keyboard.press('ArrowUp');
  await page.keyboard.press('ArrowUp');

  // Exclude the station with x, then exports.
  await page.keyboard.press('x');
  st = await appState(page);
  expect(st.edits.excludedStations).toContain(`${STATION}|S`);

  await page.getByRole('button', { name: 'Export…' }).first().click();
  await page.screenshot({ path: `${SCREENS}/03-export-sheet.png` });
  const picksCsv = await download(page, /^Picks \(CSV\)/);
  const intervalsCsv = await download(page, /^Intervals, every method/);
  const profileCsv = await download(page, /^Profile with stiffness/);
  const siteJsonText = await download(page, /^Site summary/);
  // The app's exports name the build that made them; the core run here names the same build.
  const appVersion = /^# SOFTWARE: Borewave (.+)$/m.exec(intervalsCsv)?.[1];
  expect(appVersion).toMatch(/^\d+\.\d+\.\d+/);
  setSoftwareVersion(appVersion!);
  const ref = coreRun(st);
  expect(intervalsCsv).toBe(toCsv(intervalsTable(ref.derived)));
  expect(picksCsv).toBe(toCsv(picksTable(ref.prepared.stations, ref.derived)));
  expect(profileCsv).toBe(toCsv(profileTable(ref.derived)));
  expect(intervalsCsv.split('\n')[0]).toContain('depth_top_m');
  expect(intervalsCsv).toContain('# CAUTION');
  const site = JSON.parse(siteJsonText) as { vs30Mps: number; cautions: string[] };
  // Rounded by the reporting rule (3 significant digits; docs/significant-digits.md).
  expect(site.vs30Mps).toBe(reported('velocity', ref.derived.site.vs30!.vsMps));
  expect(site.cautions.length).toBeGreaterThan(0);
  // Plots as images (Plotly.downloadImage): PNG signature bytes 89 50 4E 47 (PNG specification), SVG text.
  const profilePlotRow = page.locator('.sheet table.screen-plots tr', { hasText: 'Profile' });
  const [png] = await Promise.all([
    page.waitForEvent('download'),
    profilePlotRow.getByRole('button', { name: 'PNG' }).click(),
  ]);
  expect(png.suggestedFilename()).toMatch(/profile\.png$/);
  expect([...readFileSync((await png.path())!).subarray(0, 4)]).toEqual([0x89, 0x50, 0x4e, 0x47]);
  const [svg] = await Promise.all([
    page.waitForEvent('download'),
    page
      .locator('.sheet table.screen-plots tr', { hasText: 'Trace board' })
      .getByRole('button', { name: 'SVG' })
      .click(),
  ]);
  expect(readFileSync((await svg.path())!, 'utf8')).toContain('<svg');
  // The project archive holds the 60 files unchanged and the current edits (read back with the core).
  const [zip] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('button', { name: /^Project archive/ }).click(),
  ]);
  const opened = readProjectArchive(new Uint8Array(readFileSync((await zip.path())!)), 'download.zip');
  expect(opened.files).toHaveLength(60);
  expect(opened.missing).toEqual([]);
  expect(opened.doc.edits).toEqual(st.edits);
  const demoFile = makeDemoProject('downhole').files[7];
  expect(
    Buffer.from(opened.files.find((f) => f.name === demoFile.name)!.bytes).equals(Buffer.from(demoFile.bytes)),
  ).toBe(true);
  await page.getByRole('button', { name: 'Close' }).click();

  // Printable summary: the print stylesheet shows only the summary.
  await page.emulateMedia({ media: 'print' });
  await expect(page.locator('.print-summary')).toBeVisible();
  await expect(page.locator('.print-summary')).toContainText('qualified professional');
  // Each profile row shows its Vs 95% range (the core's low-high, to the nearest m/s as on screen).
  await expect(page.locator('.print-summary th', { hasText: '95% range (m/s)' })).toBeVisible();
  const p0 = ref.derived.profile[0];
  await expect(page.locator('.print-summary td[data-col="range95"]').first()).toHaveText(
    `${p0.vsLow95Mps!.toFixed(0)}–${p0.vsHigh95Mps!.toFixed(0)}`,
  );
  await page.screenshot({ path: `${SCREENS}/06-print-summary.png`, fullPage: true });
  await page.emulateMedia({ media: 'screen' });

  // Site sheet.
  await page.getByRole('button', { name: 'Site…' }).click();
  await expect(page.getByTestId('site-vs30')).toContainText('Vs30');
  await expect(page.locator('.sheet')).toContainText('qualified professional');
  await page.screenshot({ path: `${SCREENS}/04-site-sheet.png` });
  await page.getByRole('button', { name: 'Close' }).click();

  // Autosave, then reload and restore: files, survey and edits come back.
  await expect(page.getByTestId('autosave-status')).toContainText('saved', { timeout: 10_000 });
  await page.waitForTimeout(1200);
  const saved = await appState(page);
  await page.reload();
  await expect(page.getByTestId('restore-banner')).toBeVisible();
  await page.screenshot({ path: `${SCREENS}/05-restore-offer.png` });
  await page.getByRole('button', { name: 'Restore it' }).click();
  await waitProcessed(page);
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
  const restored = await appState(page);
  expect(restored.edits).toEqual(saved.edits);
  expect(restored.survey).toEqual(saved.survey);
  expect(problems, problems.join('\n')).toEqual([]);
});

test('geometry, US units, keyboard help and the bottom strip render; Start fresh empties the session', async ({
  page,
}) => {
  await page.goto('/');
  await page.locator('button[data-demo="crosshole"]').click();
  await waitProcessed(page);
  await page.screenshot({ path: `${SCREENS}/10-crosshole.png` });
  await page.getByRole('button', { name: 'US' }).click();
  await expect(page.locator('[data-testid="intervals-table"] th').first()).toContainText('ft');
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await expect(page.getByRole('heading', { name: 'Boreholes' })).toBeVisible();
  await expect(page.locator('.geometry-pane')).toContainText('B1_deviation.csv');
  await page.screenshot({ path: `${SCREENS}/11-geometry-us.png`, fullPage: true });

  // A spreadsheet paste moves the first record to 2.5 ft... in the displayed unit (ft).
  const first = (await appState(page)).survey.records[0];
  await page.getByTestId('geometry-records').evaluate((el, id) => {
    const dt = new DataTransfer();
    dt.setData('text/plain', `${id}\t10\tup\n`);
    el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: dt, bubbles: true, cancelable: true }));
  }, first.recordId);
  const st = await appState(page);
  const moved = st.survey.records.find((r) => r.recordId === first.recordId)!;
  // 10 ft = 3.048 m exactly (international foot, 1959).
  expect(moved.depthM).toBeCloseTo(3.048, 9);
  expect(moved.hit).toBe('up');
  await page.keyboard.press('z');
  expect((await appState(page)).survey.records.find((r) => r.recordId === first.recordId)!.depthM).toBe(first.depthM);

  await page.getByRole('tab', { name: 'Trace board' }).click();
  // Hovering an interval row lights the same depth band on the Trace board, Travel time and Profile.
  const row = page.locator('[data-testid="intervals-table"] tbody tr').nth(3);
  const key = await row.getAttribute('data-key');
  await row.hover();
  const bands = await page.evaluate(() =>
    ['trace-board', 'travel-time', 'profile'].map((n) => {
      const div = document.querySelector(`[data-plot="${n}"]`) as HTMLElement & {
        layout: { shapes?: { fillcolor?: string; y0: number; y1: number }[] };
      };
      return (div.layout.shapes ?? [])
        .filter((sh) => sh.fillcolor === 'rgba(253, 224, 71, 0.32)')
        .map((sh) => [sh.y0, sh.y1]);
    }),
  );
  const hovered = (await derivedState(page)).intervals.find((r) => r.key === key)!;
  // US units on screen: band edges in feet (1 ft = 0.3048 m).
  for (const b of bands)
    expect(b).toEqual(
      [[hovered.topM / 0.3048, hovered.bottomM / 0.3048]].map((p) => p.map((v) => expect.closeTo(v, 6))),
    );
  await page.screenshot({ path: `${SCREENS}/13-hovered-interval.png` });

  // The Profile's Vs bars are each profile row's 95% range from the core (arms high - v and v - low, in
  // ft/s here: 1 ft = 0.3048 m, NIST SP 811), and the legend says so.
  await expect(page.getByTestId('profile-bars-legend')).toContainText('Vs bars 95% range');
  const vsBar = await page.evaluate(() => {
    const div = document.querySelector('[data-plot="profile"]') as unknown as {
      data: { name: string; x: number[]; error_x?: { symmetric?: boolean; array: number[]; arrayminus?: number[] } }[];
    };
    return div.data.find((t) => t.name === 'Vs 95% range')!;
  });
  const ranged = (await derivedState(page)).profile
    .filter((r) => r.vsLow95Mps !== null && r.vsHigh95Mps !== null)
    .sort((a, b) => a.topM - b.topM);
  expect(ranged.length).toBeGreaterThan(0);
  expect(vsBar.error_x?.symmetric).toBe(false);
  expect(vsBar.x).toEqual(ranged.map((r) => expect.closeTo(r.vsMps / 0.3048, 6)));
  expect(vsBar.error_x?.array).toEqual(ranged.map((r) => expect.closeTo((r.vsHigh95Mps! - r.vsMps) / 0.3048, 6)));
  expect(vsBar.error_x?.arrayminus).toEqual(ranged.map((r) => expect.closeTo((r.vsMps - r.vsLow95Mps!) / 0.3048, 6)));
  await page.getByRole('button', { name: 'Keyboard help' }).click();
  await expect(page.getByRole('dialog', { name: 'Keyboard' })).toBeVisible();
  await page.screenshot({ path: `${SCREENS}/12-keyboard-help.png` });
  await page.keyboard.press('Escape');

  page.once('dialog', (d) => void d.accept());
  await page.getByRole('button', { name: 'Start fresh' }).click();
  await expect(page.locator('li.file')).toHaveCount(0);
  await expect(page.locator('.board .empty')).toBeVisible();

  // Loose waveform files (not an archive): placed from their headers / the default file-name pattern,
  // then processed to a profile. The demo's files carry depth and hit in their names (dh_d12.0_L.sg2).
  // Start fresh keeps the test kind (crosshole here); downhole files need the downhole kind: the set-up
  // no longer forces one receiver's channels onto two crosshole receivers to make a profile.
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await page.getByLabel('Test kind').selectOption('downhole');
  await page.getByRole('tab', { name: 'Trace board' }).click();
  const demo = makeDemoProject('downhole');
  await page
    .getByTestId('file-input')
    .setInputFiles(
      demo.files.map((f) => ({ name: f.name, mimeType: 'application/octet-stream', buffer: Buffer.from(f.bytes) })),
    );
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
  await waitProcessed(page);
  const placed = (await appState(page)).survey.records;
  expect(placed).toHaveLength(60);
  for (const r of placed) {
    const m = /d(\d+(?:\.\d+)?)_([LR])\./.exec(r.recordId)!;
    expect(r.depthM).toBeCloseTo(Number(m[1]), 9);
    expect(r.hit).toBe(m[2] === 'L' ? 'left' : 'right');
  }
  await expect(page.getByTestId('vs30-line')).toContainText('Vs30 =');
});
