/**
 * Measurements (printed, not timed pass/fail): time from a pick edit to the redrawn Profile on a
 * 60-depth downhole survey, and the first draw of 300 traces x 4096 samples on the Trace board.
 * The surveys are synthesised here with the core's forward model (src/core/synth) and opened through
 * the project-archive input, like a user's file. Figures go to the console and to
 * test-results/measurements.json. The checks below only assert that the work happened (WebGL used for
 * the large board, the profile redrawn after each edit).
 */
import { test, expect, type Page } from '@playwright/test';
import { mkdirSync, writeFileSync } from 'node:fs';
import { synthesizeSurvey, toSeg2Input } from '../src/core/synth/synthesize';
import { demoDownholeOptions, demoEarthModel } from '../src/core/synth/demo';
import { writeSeg2 } from '../src/core/io/seg2';
import { newProjectDocument, writeProjectArchive } from '../src/core/io/project';
import { SCREENS, waitProcessed } from './helpers';

mkdirSync(SCREENS, { recursive: true });
const figures: Record<string, unknown> = {};

function surveyZip(depthsM: number[], name: string): Buffer {
  const r = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM, sourceOffsetM: 2 },
    { ...demoDownholeOptions(), samplesPerTrace: 4096, surveyName: name },
  );
  const files = r.records.map((rec) => ({
    name: rec.fileName,
    bytes: writeSeg2(toSeg2Input(rec), { byteOrder: 'little', formatCode: 4 }),
  }));
  const doc = newProjectDocument(
    r.survey,
    files.map((f) => f.name),
  );
  return Buffer.from(writeProjectArchive(doc, files));
}

async function openZip(page: Page, name: string, zip: Buffer): Promise<void> {
  await page.getByTestId('project-input').setInputFiles({ name, mimeType: 'application/zip', buffer: zip });
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

test('pick edit to updated profile, 60-depth survey', async ({ page }) => {
  const depths = Array.from({ length: 60 }, (_, i) => Math.round((0.5 + i * 0.5) * 1000) / 1000);
  await page.goto('/');
  await openZip(page, 'sixty.zip', surveyZip(depths, '60-depth measurement survey'));
  await waitProcessed(page, 120_000);
  await expect(page.locator('.board-foot')).toContainText('60 traces');
  await page.keyboard.press('ArrowDown');
  const times: number[] = [];
  const derive: number[] = [];
  const drawsPerPlot: Record<string, number>[] = [];
  for (let i = 0; i < 9; i++) {
    const r = await page.evaluate(async () => {
      const div = document.querySelector('[data-plot="profile"]') as HTMLElement;
      const n0 = Number(div.dataset.drawn ?? '0');
      const t0 = performance.now();
      window.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight' }));
      await new Promise<void>((res) => {
        const poll = () => (Number(div.dataset.drawn ?? '0') > n0 ? res() : requestAnimationFrame(poll));
        poll();
      });
      const ms = performance.now() - t0;
      const bw = (window as unknown as { __borewave: { deriveMs: () => number } }).__borewave;
      // Let the other panes finish and the idle spread arrive before the next edit.
      await new Promise((res) => setTimeout(res, 400));
      const draws: Record<string, number> = {};
      for (const el of document.querySelectorAll<HTMLElement>('[data-plot]'))
        draws[el.dataset.plot!] = Number(el.dataset.lastDrawMs ?? 'NaN');
      return { ms, deriveMs: bw.deriveMs(), draws };
    });
    times.push(r.ms);
    derive.push(r.deriveMs);
    drawsPerPlot.push(r.draws);
  }
  const spreadMs = await page.evaluate(() =>
    (window as unknown as { __borewave: { spreadMs: () => number } }).__borewave.spreadMs(),
  );
  figures.spreadMs = Math.round(spreadMs);
  figures.lastDrawMsPerPlot = Object.fromEntries(
    Object.keys(drawsPerPlot[0]).map((k) => [k, median(drawsPerPlot.map((d) => d[k]))]),
  );
  figures.editToProfileMs = { median: median(times), all: times.map((t) => Math.round(t)) };
  figures.deriveMs = { median: median(derive), all: derive.map((t) => Math.round(t)) };
  console.log(
    `MEASURE pick edit -> profile redrawn (60 depths): median ${median(times).toFixed(0)} ms (derive ${median(derive).toFixed(0)} ms)`,
  );
  // Every edit redrew the profile and ran derive: a time that is not a positive finite number means a
  // redraw or a derive that did not happen.
  for (const t of [...times, ...derive]) expect(Number.isFinite(t) && t > 0).toBe(true);
});

test('first draw of 300 traces x 4096 samples', async ({ page }) => {
  test.setTimeout(240_000);
  const depths = Array.from({ length: 300 }, (_, i) => Math.round((0.1 + i * 0.1) * 1000) / 1000);
  const zip = surveyZip(depths, '300-trace measurement survey');
  await page.goto('/');
  await page.evaluate(() => {
    const bw = (
      window as unknown as {
        __borewave: {
          useResults: { subscribe: (f: (s: { prepared: unknown }, p: { prepared: unknown }) => void) => void };
        };
      }
    ).__borewave;
    bw.useResults.subscribe((s, p) => {
      if (s.prepared && s.prepared !== p.prepared)
        (window as unknown as { __tResults: number }).__tResults = performance.now();
    });
  });
  const t0 = Date.now();
  await openZip(page, 'three-hundred.zip', zip);
  await waitProcessed(page, 200_000);
  const processMs = Date.now() - t0;
  const drawn = await page.evaluate(async () => {
    const w = window as unknown as { __tResults: number };
    await new Promise<void>((res) => {
      const poll = () =>
        Number((document.querySelector('[data-plot="trace-board"]') as HTMLElement | null)?.dataset.drawn ?? '0') > 0
          ? res()
          : requestAnimationFrame(poll);
      poll();
    });
    const div = document.querySelector('[data-plot="trace-board"]') as HTMLElement & {
      data: { type: string; name: string }[];
    };
    const boardMs = performance.now() - w.__tResults;
    // The frame that first showed the board (a Plotly draw promise can resolve later than its frame).
    await new Promise<void>((res) => {
      const poll = () => (Number(div.dataset.painted ?? '0') > 0 ? res() : requestAnimationFrame(poll));
      poll();
    });
    const paintedMs = Number(div.dataset.paintedAt) - w.__tResults;
    // Then every pane: the Profile's lines and the pick markers over the board.
    const points = (p: string) =>
      (
        (document.querySelector(`[data-plot="${p}"]`) as (HTMLElement & { data?: { x: unknown[] }[] }) | null)?.data ??
        []
      ).reduce((a, d) => a + (d.x?.length ?? 0), 0);
    await new Promise<void>((res) => {
      const poll = () =>
        points('profile') > 0 && points('trace-board-picks') > 0 && points('travel-time') > 0
          ? res()
          : requestAnimationFrame(poll);
      poll();
    });
    return {
      ms: boardMs,
      paintedMs,
      allPanesMs: performance.now() - w.__tResults,
      types: div.data.map((d) => `${d.name}:${d.type}`),
      // Where the time went: results -> the board's draw starts (React render incl. decimation), Plotly's synchronous part.
      startMs: Number(div.dataset.startedAt) - w.__tResults,
      plotlySyncMs: Number(div.dataset.syncMs),
      webglCheck: `${document.documentElement.dataset.webglCheck} (results at ${w.__tResults.toFixed(0)})`,
    };
  });
  const foot = await page.locator('.board-foot').innerText();
  figures.firstDraw300x4096Ms = Math.round(drawn.ms);
  figures.firstDraw300PaintedMs = Math.round(drawn.paintedMs);
  figures.firstDraw300AllPanesMs = Math.round(drawn.allPanesMs);
  figures.firstDraw300Parts = {
    untilDrawStartsMs: Math.round(drawn.startMs),
    plotlySyncMs: Math.round(drawn.plotlySyncMs),
    webglCheckAtPlusMs: drawn.webglCheck,
  };
  figures.firstDrawTraceTypes = drawn.types;
  figures.openReadPrepareAutoPick300Ms = processMs;
  figures.boardFooter = foot.replace(/\s+/g, ' ');
  console.log(
    `MEASURE first draw of 300 traces x 4096 samples (renderer auto: ${drawn.types.join(', ')}): ${drawn.ms.toFixed(0)} ms after the results arrived (board's first frame ${drawn.paintedMs.toFixed(0)} ms; every pane ${drawn.allPanesMs.toFixed(0)} ms); open+read+prepare+auto-pick ${processMs} ms`,
  );
  await expect(page.locator('.board-foot')).toContainText('300 traces');
  // The other panes follow the board: the Profile's Vs line and the pick markers are drawn.
  const drawnPoints = (plot: string) =>
    page.evaluate((p) => {
      const div = document.querySelector(`[data-plot="${p}"]`) as (HTMLElement & { data?: { x: unknown[] }[] }) | null;
      return (div?.data ?? []).reduce((a, d) => a + (d.x?.length ?? 0), 0);
    }, plot);
  await expect.poll(() => drawnPoints('profile'), { timeout: 10_000 }).toBeGreaterThan(500);
  await expect.poll(() => drawnPoints('trace-board-picks'), { timeout: 10_000 }).toBeGreaterThan(250);
  await page.screenshot({ path: `${SCREENS}/20-300-traces.png` });

  // The same board forced to WebGL (scattergl): the draw must happen with WebGL traces.
  const gl = await page.evaluate(async () => {
    const div = document.querySelector('[data-plot="trace-board"]') as HTMLElement & {
      data: { type: string; name: string }[];
    };
    const n0 = Number(div.dataset.drawn ?? '0');
    const t0 = performance.now();
    const bw = (
      window as unknown as { __borewave: { useApp: { setState: (f: (s: { view: object }) => object) => void } } }
    ).__borewave;
    bw.useApp.setState((s) => ({ view: { ...s.view, renderer: 'webgl' } }));
    await new Promise<void>((res) => {
      const poll = () => (Number(div.dataset.drawn ?? '0') > n0 ? res() : requestAnimationFrame(poll));
      poll();
    });
    return { ms: performance.now() - t0, types: div.data.map((d) => `${d.name}:${d.type}`) };
  });
  figures.firstDraw300x4096WebglMs = Math.round(gl.ms);
  console.log(`MEASURE same board drawn with WebGL (software rasteriser here): ${gl.ms.toFixed(0)} ms`);
  expect(gl.types).toContain('wiggles:scattergl');
  await expect(page.locator('.board-foot')).toContainText('300 traces (WebGL)');
  await page.screenshot({ path: `${SCREENS}/21-300-traces-webgl.png` });
});

test.afterAll(() => {
  writeFileSync('test-results/measurements.json', JSON.stringify(figures, null, 2));
});
