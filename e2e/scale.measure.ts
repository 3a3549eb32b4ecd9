/**
 * A long campaign in the browser (figures, written to test-results/scale.json): 300 depths x 2 hits x
 * 6 channels (a two-receiver probe, three components each) x 8,192 samples, SEG-2 float32, opened as a
 * project archive. Records the time to picks and to the Profile drawn, the peak memory of the page and
 * its workers (renderer resident memory), and how the Trace board answers afterwards (a pick edit to
 * the Profile redrawn, a board redraw). Run by e2e/scale.config.ts.
 */
import { test, expect, type Browser, type Page } from '@playwright/test';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { synthesizeSurvey, toSeg2Input } from '../src/core/synth/synthesize';
import { demoEarthModel, demoPairOptions } from '../src/core/synth/demo';
import { writeSeg2 } from '../src/core/io/seg2';
import { newProjectDocument } from '../src/core';
import { strToU8, zipSync } from 'fflate';

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
      kb += Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${p.id}/status`, 'utf8'))?.[1] ?? 0);
    }
    return kb / 1024;
  } catch {
    return null;
  }
}

function sampler(browser: Browser, page: Page) {
  let peak = 0;
  let peakHeap = 0;
  let running = true;
  const loop = (async () => {
    const cdp = await page.context().newCDPSession(page);
    await cdp.send('Performance.enable');
    while (running) {
      peak = Math.max(peak, (await rendererRssMb(browser)) ?? 0);
      try {
        const m = await cdp.send('Performance.getMetrics');
        peakHeap = Math.max(peakHeap, (m.metrics.find((x) => x.name === 'JSHeapUsedSize')?.value ?? 0) / 1048576);
      } catch {
        // navigating
      }
      await new Promise((r) => setTimeout(r, 100));
    }
  })();
  return async () => {
    running = false;
    await loop;
    return { peakRendererRssMb: Math.round(peak), peakMainHeapMb: Math.round(peakHeap) };
  };
}

test('long campaign: 300 depths x 2 hits x 6 channels x 8192 samples', async ({ page, browser }) => {
  const t0 = Date.now();
  const upperDepthsM = Array.from({ length: 300 }, (_, i) => Math.round((0.5 + i * 0.1) * 1000) / 1000);
  const r = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole-pair', holeId: 'DH1', upperDepthsM, receiverSpacingM: 1, sourceOffsetM: 2 },
    { ...demoPairOptions(), samplesPerTrace: 8192, surveyName: 'Long campaign' },
  );
  const files = r.records.map((rec) => ({
    name: rec.fileName,
    bytes: writeSeg2(toSeg2Input(rec), { byteOrder: 'little', formatCode: 4 }),
  }));
  const traces = r.records.reduce((a, rec) => a + rec.traces.length, 0);
  // Stored without compression (float samples hardly compress; deflating 118 MB would only slow the set-up).
  const entries: Record<string, Uint8Array> = Object.fromEntries(files.map((f) => [f.name, f.bytes]));
  const doc = newProjectDocument(
    r.survey,
    files.map((f) => f.name),
  );
  entries['project.json'] = strToU8(JSON.stringify(doc));
  const zip = zipSync(entries, { level: 0 });
  mkdirSync('test-results', { recursive: true });
  const zipPath = 'test-results/long-campaign.zip';
  writeFileSync(zipPath, zip);
  const synthMs = Date.now() - t0;

  const stop = sampler(browser, page);
  await page.goto('/');
  await page.locator('[data-demo="downhole"]').waitFor();
  const tOpen = Date.now();
  await page.getByTestId('project-input').setInputFiles(zipPath);
  await expect(page.getByTestId('process-status')).toHaveAttribute('data-state', 'done', { timeout: 600_000 });
  const processedMs = Date.now() - tOpen;
  await expect.poll(() => page.locator('.board-foot').innerText(), { timeout: 120_000 }).toContain('traces');
  const profileMs = Date.now() - tOpen;
  // Responsiveness with the campaign loaded: a pick edit to the Profile redrawn, median of 5.
  await page.keyboard.press('ArrowDown');
  const edits: number[] = [];
  for (let i = 0; i < 5; i++) {
    edits.push(
      await page.evaluate(async () => {
        const div = document.querySelector('[data-plot="profile"]') as HTMLElement;
        const n0 = Number(div.dataset.drawn ?? '0');
        const s = performance.now();
        window.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight' }));
        await new Promise<void>((res) => {
          const poll = () => (Number(div.dataset.drawn ?? '0') > n0 ? res() : requestAnimationFrame(poll));
          poll();
        });
        const ms = performance.now() - s;
        await new Promise((res) => setTimeout(res, 300));
        return ms;
      }),
    );
  }
  const boardDrawMs = await page.evaluate(() =>
    Number((document.querySelector('[data-plot="trace-board"]') as HTMLElement).dataset.lastDrawMs ?? 'NaN'),
  );
  const foot = (await page.locator('.board-foot').innerText()).replace(/\s+/g, ' ');
  const mem = await stop();
  edits.sort((a, b) => a - b);
  const figures = {
    records: r.records.length,
    traces,
    samplesPerTrace: 8192,
    archiveMb: Math.round(zip.length / 1e5) / 10,
    synthesisInNodeMs: synthMs,
    openToProcessedMs: processedMs,
    openToBoardMs: profileMs,
    editToProfileMedianMs: Math.round(edits[2]),
    boardLastDrawMs: boardDrawMs,
    boardFooter: foot,
    ...mem,
  };
  writeFileSync('test-results/scale.json', JSON.stringify(figures, null, 2));
  console.log(`MEASURE long campaign: ${JSON.stringify(figures)}`);
  expect(foot).toContain('traces');
});
