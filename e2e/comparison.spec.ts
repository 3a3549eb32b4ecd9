/**
 * Comparison profile: a CSV of depth and Vs (or depth and Rayleigh-wave velocity) from another test,
 * overlaid on the Profile as a grey dashed step line, with its Vs30 and the difference per interval.
 *
 * References:
 * - Time-averaged Vs over 30 m: Vs30 = 30 / sum(h_i / Vs_i) (ASCE 7-22 eq. 20.4-1; EN 1998-1:2004 eq. 3.1).
 *   For 200 m/s over 0-10 m and 400 m/s over 10-30 m: 30 / (10/200 + 20/400) = 300 m/s exactly.
 * - Rayleigh to shear velocity: VR/VS = (0.87 + 1.12 nu)/(1 + nu) (Viktorov 1967, from memory). At nu = 0.25
 *   the ratio is 1.15/1.25 = 0.92, so VR 184 and 368 m/s are Vs 200 and 400 m/s: the same 300 m/s.
 * - Per-interval differences: the core (runPipeline with the same comparison) run here in Node.
 */
import { test, expect, type Page } from '@playwright/test';
import { makeDemoProject } from '../src/core/synth/demo';
import { readWaveFile } from '../src/core/io/readers';
import { runPipeline } from '../src/core/pipeline';
import { parseComparisonCsv } from '../src/core/site/comparison';
import type { WaveRecord } from '../src/core/model';
import { appState, SCREENS, waitProcessed } from './helpers';

const VS_CSV = 'depth_m,vs_mps\n0,200\n10,400\n';
const VR_CSV = 'depth_m,vr_mps\n0,184\n10,368\n';

async function loadCsv(page: Page, name: string, text: string): Promise<void> {
  await page.getByTestId('comparison-input').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(text) });
}

async function appComparison(
  page: Page,
): Promise<{ vs30: number | null; differences: { depthM: number; differencePct: number }[] } | null> {
  return page.evaluate(() => {
    const bw = (
      window as unknown as {
        __borewave: {
          derived: () => {
            comparison: {
              vs30: { vsMps: number } | null;
              differences: { depthM: number; differencePct: number }[];
            } | null;
          } | null;
        };
      }
    ).__borewave;
    const c = bw.derived()?.comparison;
    return c ? { vs30: c.vs30?.vsMps ?? null, differences: c.differences } : null;
  });
}

test('a comparison profile is overlaid with its Vs30 and differences; bad files are refused in plain words', async ({
  page,
}) => {
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await page.getByRole('button', { name: 'Compare with another profile…' }).click();

  // A bad row: the error names the row and the column; nothing is loaded.
  await loadCsv(page, 'bad.csv', 'depth_m,vs_mps\n0,200\n10,fast\n');
  const alert = page.getByTestId('comparison').getByRole('alert');
  await expect(alert).toContainText('row 3');
  await expect(alert).toContainText('velocity');
  expect((await appState(page)).survey).toBeTruthy();
  expect(await appComparison(page)).toBeNull();

  // Depth and Vs: Vs30 300 m/s (analytic, see the header).
  await loadCsv(page, 'masw.csv', VS_CSV);
  await expect(page.getByTestId('comparison-vs30')).toHaveText('300');
  const cmp = (await appComparison(page))!;
  expect(cmp.vs30).toBeCloseTo(300, 9);

  // Overlay: one grey dashed step line on the Vs axis.
  const overlay = await page.evaluate(() => {
    const div = document.querySelector('[data-plot="profile"]') as HTMLElement & {
      data: { name: string; x: number[]; y: number[]; line?: { dash?: string; color?: string }; xaxis?: string }[];
    };
    const t = div.data.find((d) => d.name.startsWith('compared'));
    return t ? { x: t.x, y: t.y, dash: t.line?.dash, color: t.line?.color, xaxis: t.xaxis ?? 'x' } : null;
  });
  expect(overlay).not.toBeNull();
  expect(overlay!.dash).toBe('dash');
  expect(overlay!.color).toBe('#7b8794');
  expect(overlay!.xaxis).toBe('x');
  expect(overlay!.x.slice(0, 4)).toEqual([200, 200, 400, 400]);
  expect(overlay!.y.slice(0, 3)).toEqual([0, 10, 10]);

  // Differences per interval: the core run in Node on the same files, survey, edits and comparison.
  const st = await appState(page);
  const demo = makeDemoProject('downhole');
  const records = new Map<string, WaveRecord>();
  for (const f of demo.files) {
    const r = readWaveFile(f.bytes, f.name);
    if (r.ok) records.set(f.name, { ...r.record, id: f.name });
  }
  const ref = runPipeline({
    survey: st.survey,
    records,
    settings: st.settings,
    edits: st.edits,
    comparison: parseComparisonCsv(VS_CSV, 'masw.csv', { kind: 'vs' }),
  });
  expect(ref.derived.comparison!.vs30!.vsMps).toBeCloseTo(cmp.vs30!, 9);
  expect(cmp.differences.length).toBe(ref.derived.comparison!.differences.length);
  const first = ref.derived.comparison!.differences[0];
  const row = page.locator('[data-testid="intervals-table"] tbody tr').first();
  await expect(row.locator('td[data-col="difference"]')).toHaveText(
    `${first.differencePct > 0 ? '+' : ''}${first.differencePct.toFixed(1)}`,
  );
  await expect(page.locator('[data-testid="intervals-table"] th', { hasText: 'Compared (m/s)' })).toBeVisible();
  await page.screenshot({ path: `${SCREENS}/40-comparison.png` });

  // One undo step: z takes it away, shift+z brings it back; remove takes it away.
  await page.keyboard.press('z');
  expect(await appComparison(page)).toBeNull();
  await page.keyboard.press('Shift+Z');
  await expect(page.getByTestId('comparison-vs30')).toHaveText('300');
  await page.getByTestId('comparison').getByRole('button', { name: 'remove' }).click();
  expect(await appComparison(page)).toBeNull();

  // Rayleigh-wave velocity converted with Viktorov's approximation at nu = 0.25: the same 300 m/s.
  await page.getByRole('button', { name: 'Compare with another profile…' }).click();
  await page.getByLabel('Comparison velocity kind').selectOption('rayleigh');
  await expect(page.getByTestId('comparison')).toContainText("Viktorov's approximation");
  await page.getByLabel("Poisson's ratio").fill('0.25');
  await loadCsv(page, 'rayleigh.csv', VR_CSV);
  await expect(page.getByTestId('comparison-vs30')).toHaveText('300');
  expect((await appComparison(page))!.vs30).toBeCloseTo(300, 6);
});
