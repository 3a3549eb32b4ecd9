/**
 * The report in a real browser (issue 17): "Report…" opens the same document the core makes for the
 * same survey, settings and edits (the command line's module, run here in Node); page.pdf() gives the
 * same pages; each demo survey's command-line report prints to at least 2 pages with no external
 * references; an exported profile PNG is at least 2,000 px wide.
 */
import { expect, test, type Page } from '@playwright/test';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { makeReport } from '../src/cli/report';
import { cliSoftwareVersion } from '../src/cli/version';
import type { WaveRecord } from '../src/core/model';
import { readWaveFile } from '../src/core/io/readers';
import { runPipeline } from '../src/core/pipeline';
import { reportDataFrom } from '../src/core/report/adapter';
import { reportHtml } from '../src/core/report/html';
import { makeDemoProject } from '../src/core/synth/demo';
import { externalReferences } from '../test/helpers/external';
import { appState, SCREENS, waitProcessed } from './helpers';

// The app's build and the command line read one version source: package.json's version and the commit.
const version = cliSoftwareVersion();

/** Every demo survey in sample-data (one folder per test kind, each with its project.zip). */
const DEMO_SURVEYS = readdirSync('sample-data').filter((d) => existsSync(`sample-data/${d}/project.zip`));

/** Pages in a PDF made by Chromium (one /Type /Page object per page). */
function pdfPages(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
}

/** Text of the report without the line that differs between two runs (when it was made). */
async function reportText(p: Page): Promise<string> {
  const text = await p.evaluate(() => document.body.textContent ?? '');
  return text.replace(/Report made\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/, 'Report made');
}

async function pdfOf(p: Page): Promise<Buffer> {
  await p.emulateMedia({ media: 'print' });
  return p.pdf({ preferCSSPageSize: true, printBackground: true });
}

test('"Report…" opens the core report; its PDF has the same pages; the profile PNG is print-sized', async ({
  page,
  context,
}) => {
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await page.getByRole('button', { name: 'Save project…' }).click();

  const [popup] = await Promise.all([page.waitForEvent('popup'), page.getByTestId('open-report').click()]);
  await popup.waitForLoadState('load');
  const html = await popup.content();
  expect(await popup.locator('svg[data-figure]').count()).toBeGreaterThanOrEqual(3);
  await expect(popup.locator('body')).toContainText('qualified professional');
  await expect(popup.locator('body')).toContainText('local codes');
  expect(externalReferences(html)).toEqual([]);

  // The same report from the core in Node, on the app's survey, settings and edits.
  const st = await appState(page);
  const demo = makeDemoProject('downhole');
  const records = new Map<string, WaveRecord>();
  for (const f of demo.files) {
    const r = readWaveFile(f.bytes, f.name);
    if (r.ok) records.set(f.name, { ...r.record, id: f.name });
  }
  const run = runPipeline({ survey: st.survey, records, settings: st.settings, edits: st.edits });
  const coreHtml = reportHtml(
    reportDataFrom({
      survey: st.survey,
      settings: st.settings,
      edits: st.edits,
      prepared: run.prepared,
      derived: run.derived,
      units: 'SI',
      softwareVersion: version,
      madeAt: '2026-12-02T10:00:00.000Z',
    }),
  );
  const core = await context.newPage();
  await core.setContent(coreHtml);
  expect(await reportText(popup)).toBe(await reportText(core));

  const popupPdf = await pdfOf(popup);
  const corePdf = await pdfOf(core);
  expect(pdfPages(popupPdf)).toBeGreaterThanOrEqual(2);
  expect(pdfPages(popupPdf)).toBe(pdfPages(corePdf));
  await popup.close();
  await core.close();

  // The profile figure alone as PNG, rasterised in the browser.
  const [dl] = await Promise.all([page.waitForEvent('download'), page.getByTestId('figure-png-profile').click()]);
  expect(dl.suggestedFilename()).toMatch(/profile\.png$/);
  const png = readFileSync((await dl.path())!);
  mkdirSync(SCREENS, { recursive: true });
  writeFileSync(`${SCREENS}/report-profile.png`, png);
  expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
  const width = png.readUInt32BE(16);
  const height = png.readUInt32BE(20);
  expect(width).toBeGreaterThanOrEqual(2000);
  expect(height).toBeGreaterThan(1000);
  const [svg] = await Promise.all([page.waitForEvent('download'), page.getByTestId('figure-svg-profile').click()]);
  const svgText = readFileSync((await svg.path())!, 'utf8');
  expect(svgText).toContain('Vs and Vp profile');
  expect(svgText).toContain('Velocity (m/s)');
});

test('each demo survey: the command-line report prints to at least 2 pages (A4 and Letter)', async ({ page }) => {
  for (const kind of DEMO_SURVEYS) {
    for (const paper of ['A4', 'Letter'] as const) {
      const { html } = makeReport(`sample-data/${kind}/project.zip`, { paper });
      expect(externalReferences(html)).toEqual([]);
      await page.setContent(html);
      expect(await page.locator('svg[data-figure]').count()).toBeGreaterThanOrEqual(3);
      const pdf = await pdfOf(page);
      expect(pdfPages(pdf), `${kind} ${paper}`).toBeGreaterThanOrEqual(2);
    }
  }
});
