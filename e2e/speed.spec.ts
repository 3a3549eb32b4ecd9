/**
 * Speed figures of the app (printed and written to test-results/speed.json; figures, not timed
 * pass/fail): first paint of a cold page, demo click to the Profile drawn with the final data, 60 unseen
 * SEG-2 files (3 channels x 4,096 samples) dropped to the Profile drawn, and peak memory of the page and
 * its workers. `npm run bench -- --json` runs this spec (bench/browser.ts) and reports these figures.
 *
 * SPEED_SCALE=1 adds the long campaign (300 depths x 2 hits x 6 channels x 8,192 samples) opened from a
 * project archive: time to picks, peak memory, and a trace-board redraw while it is loaded.
 *
 * Memory: the resident memory of the browser's renderer processes (a page's dedicated workers are
 * threads of its renderer), sampled every 50 ms from /proc through the process ids Chromium reports
 * (CDP SystemInfo.getProcessInfo); the main thread's JavaScript heap from CDP Performance.getMetrics.
 * The checks only assert that the work happened (the profile drawn, the records read).
 */
import { test, expect, type Browser, type Page } from '@playwright/test';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { synthesizeSurvey, toSeg2Input } from '../src/core/synth/synthesize';
import { demoDownholeOptions, demoEarthModel } from '../src/core/synth/demo';
import { writeSeg2 } from '../src/core/io/seg2';

const figures: Record<string, unknown> = {};

/** Marks in the page: when the app's first controls appear, results arrive, the Profile draws. */
function installMarks(): void {
  const w = window as unknown as { __marks: Record<string, number> };
  w.__marks = {};
  const mo = new MutationObserver(() => {
    if (!w.__marks.appShownMs && document.querySelector('[data-demo]')) {
      w.__marks.appShownMs = performance.now();
      mo.disconnect();
    }
  });
  mo.observe(document, { childList: true, subtree: true });
}

/** Resident memory (MB) of the renderer processes of this browser, from /proc (Linux). */
async function rendererRssMb(browser: Browser): Promise<number | null> {
  try {
    const cdp = await browser.newBrowserCDPSession();
    const info = (await cdp.send('SystemInfo.getProcessInfo' as never)) as unknown as {
      processInfo: { type: string; id: number }[];
    };
    await cdp.detach();
    let kb = 0;
    for (const p of info.processInfo) {
      if (p.type !== 'renderer') continue;
      const status = readFileSync(`/proc/${p.id}/status`, 'utf8');
      kb += Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0);
    }
    return kb / 1024;
  } catch {
    return null;
  }
}

/** CPU time (ms) the renderer processes (page and workers) have used so far, from CDP; null where unknown. */
async function rendererCpuMs(browser: Browser): Promise<number | null> {
  try {
    const cdp = await browser.newBrowserCDPSession();
    const info = (await cdp.send('SystemInfo.getProcessInfo' as never)) as unknown as {
      processInfo: { type: string; cpuTime: number }[];
    };
    await cdp.detach();
    return info.processInfo.filter((p) => p.type === 'renderer').reduce((a, p) => a + p.cpuTime * 1000, 0);
  } catch {
    return null;
  }
}

/** Samples memory until stopped; returns the peaks (renderer RSS, main-thread JS heap), MB. */
function memorySampler(browser: Browser, page: Page) {
  let peakRss = 0;
  let peakHeap = 0;
  let running = true;
  let rssAvailable = true;
  const loop = (async () => {
    const cdp = await page.context().newCDPSession(page);
    await cdp.send('Performance.enable');
    while (running) {
      const rss = await rendererRssMb(browser);
      if (rss === null) rssAvailable = false;
      else peakRss = Math.max(peakRss, rss);
      try {
        const m = await cdp.send('Performance.getMetrics');
        const heap = m.metrics.find((x) => x.name === 'JSHeapUsedSize')?.value ?? 0;
        peakHeap = Math.max(peakHeap, heap / 1048576);
      } catch {
        // the page is navigating
      }
      await new Promise((r) => setTimeout(r, 50));
    }
    await cdp.detach().catch(() => undefined);
  })();
  return async () => {
    running = false;
    await loop;
    return { peakRendererRssMb: rssAvailable ? Math.round(peakRss) : null, peakMainHeapMb: Math.round(peakHeap) };
  };
}

/**
 * In the page: from `start` (performance.now() of the user's action) to the Profile drawn with the final
 * data: results 'done', derived, and the Profile's next finished draw after that. Also when the records
 * were read (filesRevision), when processing started and when its results arrived.
 */
const waitProfileScript = `(async () => {
  const bw = window.__borewave;
  const marks = {};
  const div = () => document.querySelector('[data-plot="profile"]');
  let n0 = -1;
  await new Promise((res) => {
    const check = (s) => {
      if (s.status.state === 'running' && marks.processStartMs === undefined) marks.processStartMs = performance.now();
      if (s.status.state === 'done' && s.prepared) {
        marks.resultsMs = performance.now();
        n0 = Number(div()?.dataset.drawn ?? '0');
        un();
        res();
      }
    };
    const un = bw.useResults.subscribe(check);
    check(bw.useResults.getState());
  });
  await new Promise((res) => {
    const poll = () => (Number(div()?.dataset.drawn ?? '0') > n0 ? res() : requestAnimationFrame(poll));
    poll();
  });
  marks.profileMs = performance.now();
  // The Trace board's wiggles (drawn the frame after the Profile when they first appear).
  await new Promise((res) => {
    const board = () => document.querySelector('[data-plot="trace-board"]');
    const poll = () => (Number(board()?.dataset.drawn ?? '0') > 0 ? res() : requestAnimationFrame(poll));
    poll();
  });
  marks.boardMs = performance.now();
  return marks;
})()`;

async function goCold(page: Page): Promise<void> {
  await page.addInitScript(installMarks);
  await page.goto('/');
  await page.locator('[data-demo="downhole"]').waitFor();
}

/**
 * A page at rest, as a user finds it after reading it for a moment: what loads after the first paint
 * (Plotly, the workers) has loaded, so the action alone is timed.
 */
async function settle(page: Page): Promise<void> {
  await page.evaluate(`window.__borewave.plotlyLoaded()`);
  await page.waitForTimeout(1000);
}

test('first paint, demo click to profile', async ({ page, browser }) => {
  test.setTimeout(120_000);
  const stop = memorySampler(browser, page);
  await goCold(page);
  const paint = await page.evaluate(() => {
    const fcp = performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? NaN;
    const w = window as unknown as { __marks: Record<string, number> };
    return { fcp, appShown: w.__marks.appShownMs };
  });
  await settle(page);
  const cpu0 = await rendererCpuMs(browser);
  const marks = (await page.evaluate(`(async () => {
    const start = performance.now();
    const done = ${waitProfileScript};
    let filesAt;
    const un = window.__borewave.useApp.subscribe((s, p) => {
      if (filesAt === undefined && s.filesRevision !== p.filesRevision) filesAt = performance.now();
    });
    document.querySelector('[data-demo="downhole"]').click();
    const m = await done;
    un();
    return { ...m, filesMs: filesAt, start };
  })()`)) as Record<string, number>;
  const cpu1 = await rendererCpuMs(browser);
  const mem = await stop();
  const rel = (k: string) => Math.round(marks[k] - marks.start);
  figures.demoToProfileCpuMs = cpu0 !== null && cpu1 !== null ? Math.round(cpu1 - cpu0) : null;
  figures.firstPaintMs = Math.round(paint.fcp);
  figures.appShownMs = Math.round(paint.appShown);
  figures.demoToProfileMs = rel('profileMs');
  figures.demoParts = {
    openedMs: rel('filesMs'),
    processStartMs: rel('processStartMs'),
    resultsMs: rel('resultsMs'),
    profileMs: rel('profileMs'),
    boardMs: rel('boardMs'),
  };
  figures.demoMemory = mem;
  console.log(
    `MEASURE first contentful paint ${paint.fcp.toFixed(0)} ms, app controls ${paint.appShown.toFixed(0)} ms; demo click -> profile ${rel('profileMs')} ms, renderer CPU ${figures.demoToProfileCpuMs} ms (${JSON.stringify(figures.demoParts)}); memory ${JSON.stringify(mem)}`,
  );
  await expect(page.locator('[data-plot="profile"]')).toBeVisible();
});

function sixtyFiles(samples: number, depths: number, channels: 3 | 6 = 3) {
  const depthsM = Array.from({ length: depths }, (_, i) => 1 + i);
  const r = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM, sourceOffsetM: 2 },
    { ...demoDownholeOptions(), samplesPerTrace: samples },
  );
  if (channels !== 3) throw new Error('three-component records only');
  return r.records.map((rec) => ({
    name: rec.fileName,
    mimeType: 'application/octet-stream',
    buffer: Buffer.from(writeSeg2(toSeg2Input(rec), { byteOrder: 'little', formatCode: 4 })),
  }));
}

test('60 unseen files dropped to profile', async ({ page, browser }) => {
  test.setTimeout(120_000);
  const files = sixtyFiles(4096, 30);
  expect(files).toHaveLength(60);
  const stop = memorySampler(browser, page);
  await goCold(page);
  await settle(page);
  await page.evaluate(`(() => {
    const w = window;
    w.__dropMarks = ${waitProfileScript}.then((m) => m);
    const input = document.querySelector('[data-testid="file-input"]');
    input.addEventListener('change', () => { w.__dropStart = performance.now(); }, { capture: true, once: true });
    const un = w.__borewave.useApp.subscribe((s, p) => {
      if (s.filesRevision !== p.filesRevision) { w.__filesAt = performance.now(); un(); }
    });
  })()`);
  const cpu0 = await rendererCpuMs(browser);
  await page.getByTestId('file-input').setInputFiles(files);
  const marks = (await page.evaluate(
    `window.__dropMarks.then((m) => ({ ...m, start: window.__dropStart, filesMs: window.__filesAt }))`,
  )) as Record<string, number>;
  const cpu1 = await rendererCpuMs(browser);
  const mem = await stop();
  figures.dropToProfileCpuMs = cpu0 !== null && cpu1 !== null ? Math.round(cpu1 - cpu0) : null;
  const rel = (k: string) => Math.round(marks[k] - marks.start);
  figures.dropToProfileMs = rel('profileMs');
  figures.dropParts = {
    readMs: rel('filesMs'),
    processStartMs: rel('processStartMs'),
    resultsMs: rel('resultsMs'),
    profileMs: rel('profileMs'),
    boardMs: rel('boardMs'),
  };
  figures.dropMemory = mem;
  console.log(
    `MEASURE 60 files x 3 channels x 4096 samples dropped -> profile ${rel('profileMs')} ms, renderer CPU ${figures.dropToProfileCpuMs} ms (${JSON.stringify(figures.dropParts)}); memory ${JSON.stringify(mem)}`,
  );
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
});

test.afterAll(() => {
  mkdirSync('test-results', { recursive: true });
  writeFileSync('test-results/speed.json', JSON.stringify(figures, null, 2));
});
