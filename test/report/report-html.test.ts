import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cleanDownhole, runClean } from '../helpers/cleanSurvey';
import { makeReport, runReport } from '../../src/cli/report';
import { reportDataFrom } from '../../src/core/report/adapter';
import { decimateTrace, MAX_TRACES_PER_PANEL, thinTraces, TRACE_COLUMNS } from '../../src/core/report/figures';
import { reportHtml } from '../../src/core/report/html';
import { standaloneSvg } from '../../src/core/report/svg';
import { externalReferences } from '../helpers/external';
import { defaultSettings, emptyEdits } from '../../src/core/settings';

/** Every demo survey in sample-data (one folder per test kind, each with its project.zip). */
const DEMO_SURVEYS = readdirSync('sample-data').filter((d) => existsSync(`sample-data/${d}/project.zip`));

const CAUTION = /qualified professional[^<]*local codes/;

describe('CLI report of each demo survey (issue 17 checks)', () => {
  it('finds the demo surveys', () => {
    expect(DEMO_SURVEYS.length).toBeGreaterThanOrEqual(3);
  });
  for (const kind of DEMO_SURVEYS) {
    it(`${kind}: at least 3 SVG figures, the caution, no external references`, () => {
      const { html } = makeReport(`sample-data/${kind}/project.zip`, { madeAt: '2026-12-02T10:00:00.000Z' });
      expect((html.match(/<svg /g) ?? []).length).toBeGreaterThanOrEqual(3);
      for (const id of ['trace-board', 'travel-time', 'profile', 'stiffness'])
        expect(html).toContain(`data-figure="${id}"`);
      expect(html).toMatch(CAUTION);
      expect(externalReferences(html)).toEqual([]);
      expect(html).not.toMatch(/NaN|Infinity|undefined/);
      expect(html).toContain('@page { size: A4 portrait');
      expect(html).toMatch(/figure \{[^}]*break-inside: avoid/);
      expect(html.includes('<p class="big">Vs30 =')).toBe(true);
      // Decimated traces keep the file small enough to mail (common practice: a few MB at most).
      expect(html.length).toBeLessThan(2_500_000);
    });
  }
  it('--method sets the profile method the report states and uses', () => {
    const { html } = makeReport('sample-data/downhole/project.zip', { method: 'onset' });
    expect(html).toContain('<tr><th>Profile method</th><td>onset</td></tr>');
    expect(html).toMatch(/<td>S<\/td><td>onset<\/td>/);
  });
  it('the scanner itself finds each kind of external reference', () => {
    expect(externalReferences('<a href="https://x.org">')).toHaveLength(2);
    expect(externalReferences('<img src="a.png">')).toHaveLength(2);
    expect(externalReferences('<style>@import "a.css"; b{background:url(b.png)}</style>')).toHaveLength(2);
    expect(externalReferences('<g clip-path="url(#c)"/><i style="background:url(data:image/png;base64,AA)"/>')).toEqual(
      [],
    );
  });
  it('the command writes the file; Letter paper and US units on request; a missing project exits 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'bw-report-'));
    const out = join(dir, 'r.html');
    const lines: string[] = [];
    const io = { stdout: { write: (s: string) => lines.push(s) }, stderr: { write: (s: string) => lines.push(s) } };
    const code = await runReport(
      ['sample-data/downhole/project.zip', '--out', out, '--paper', 'Letter', '--units', 'US'],
      io as never,
    );
    expect(code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('@page { size: letter portrait');
    expect(html).toContain('Vs (ft/s)');
    expect(await runReport(['nowhere.zip', '--out', out], io as never)).toBe(2);
    expect(await runReport(['sample-data/downhole/project.zip', '--out', out, '--paper', 'A3'], io as never)).toBe(2);
  });
});

describe('report from a forward-model survey', () => {
  const res = cleanDownhole([1, 2, 3, 4, 5, 6, 7, 8], { seed: 11, holeId: 'DH9' });
  const settings = defaultSettings();
  const edits = emptyEdits();
  const out = runClean(res, settings, edits);
  const inputs = {
    survey: res.survey,
    settings,
    edits,
    prepared: out.prepared,
    derived: out.derived,
    units: 'SI' as const,
    softwareVersion: '0.0.0-test',
    madeAt: '2026-12-02T10:00:00.000Z',
  };
  it('the same data gives the same document (no clock or randomness inside)', () => {
    expect(reportHtml(reportDataFrom(inputs))).toBe(reportHtml(reportDataFrom(inputs)));
  });
  it('the title block names the project, hole, test kind, units and software version', () => {
    const html = reportHtml(reportDataFrom(inputs));
    expect(html).toContain('DH9');
    expect(html).toContain('ASTM D7400');
    expect(html).toContain('Borewave 0.0.0-test');
    expect(html).toContain('SI (m, m/s, MPa, kPa)');
  });
  it('profile values in the report follow the reporting rule (3 significant digits for Vs)', () => {
    const data = reportDataFrom(inputs);
    const html = reportHtml(data);
    const vs = data.profile[2].vsMps;
    const shown = Number(vs.toPrecision(3));
    expect(html).toContain(`<td class="n">${shown}</td>`);
  });
  it('the profile figure draws each Vs row over its 95% range, at least +-1.96 sd wide (normal table)', () => {
    const data = reportDataFrom(inputs);
    const withRange = data.profile.filter((r) => r.vsRange95Mps !== null);
    expect(withRange.length).toBeGreaterThan(5);
    for (const r of withRange) {
      const [low, high] = r.vsRange95Mps!;
      expect(low).toBeLessThan(r.vsMps);
      expect(high - r.vsMps).toBeGreaterThanOrEqual(1.96 * r.vsSdMps - 1e-9);
    }
    // the same range as the profile table (velocity/intervals.ts setRange95): one source for both
    const core = out.derived.profile.find((p) => p.topM === withRange[0].topM)!;
    expect(withRange[0].vsRange95Mps).toEqual([core.vsLow95Mps, core.vsHigh95Mps]);
    const html = reportHtml(data);
    expect(html).toContain('Vs: 95% range');
  });
  it('set-up problems replace Vs30 and the site class with "set-up incomplete" and the list', () => {
    const site = { ...out.derived.site, setupProblems: ['Hit direction missing for 4 records: set it in Geometry.'] };
    const derived = { ...out.derived, site };
    const data = reportDataFrom({ ...inputs, derived });
    expect(data.site.vs30Mps).toBeNull();
    const html = reportHtml(data);
    expect(html).toContain('Set-up incomplete');
    expect(html).toContain('Hit direction missing for 4 records');
    expect(html.includes('<p class="big">Vs30 =')).toBe(false);
    expect(/ASCE 7-16 \(Table 20.3-1\)<\/td><td>/.test(html)).toBe(false);
  });
  it('a stand-alone SVG figure carries the SVG namespace; inline figures do not need it', () => {
    const html = reportHtml(reportDataFrom(inputs));
    const inline = html.slice(html.indexOf('<svg '), html.indexOf('</svg>') + 6);
    expect(inline).not.toContain('xmlns');
    expect(standaloneSvg(inline)).toMatch(/^<\?xml[^>]*>\n<svg xmlns="http:\/\/www.w3.org\/2000\/svg" /);
  });
});

describe('a survey with nothing computed yet still gives a whole document', () => {
  it('four figures, the cautions, no NaN', () => {
    const html = reportHtml({
      title: {
        project: 'Empty',
        site: null,
        holes: [],
        testKind: 'Downhole',
        testDate: null,
        units: 'US',
        softwareVersion: 'x',
        madeAt: '2026-12-02T10:00:00.000Z',
      },
      settings: [],
      traces: [],
      travel: [],
      layerFits: [],
      intervals: [],
      profile: [],
      waterTableM: null,
      site: {
        setupProblems: [],
        vs30Mps: null,
        toDepthM: null,
        profileDepthM: null,
        extended: false,
        flags: [],
        spread: null,
        classes: [],
      },
      notes: [],
      cautions: ['Review by a qualified professional; local codes govern.'],
    });
    expect((html.match(/<svg /g) ?? []).length).toBe(4);
    expect(html).not.toMatch(/NaN|Infinity|undefined/);
    expect(html).toContain('No time-averaged velocity');
    expect(html).toMatch(CAUTION);
  });
});

describe('trace decimation for the trace board', () => {
  it('min-max decimation keeps the largest and smallest sample of each column (a one-sample spike survives)', () => {
    const n = 20000;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = 0.1 * Math.sin(i / 50);
    x[12345] = 5;
    x[7000] = -3;
    const d = decimateTrace(x, 1e-4, 0, 0, 2, TRACE_COLUMNS);
    expect(d.a.length).toBeLessThanOrEqual(2 * TRACE_COLUMNS);
    expect(Math.max(...d.a)).toBe(1); // scaled to the largest |sample|
    expect(Math.min(...d.a)).toBeCloseTo(-3 / 5, 12);
    expect(d.tS[d.a.indexOf(1)]).toBeCloseTo(1.2345, 9);
    for (let i = 1; i < d.tS.length; i++) expect(d.tS[i]).toBeGreaterThanOrEqual(d.tS[i - 1]);
  });
  it('short windows are kept sample by sample', () => {
    const d = decimateTrace([0, 1, -2, 1], 0.001, 0, 0, 1, TRACE_COLUMNS);
    expect(d.a).toEqual([0, 0.5, -1, 0.5]);
  });
  it('more traces than fit are thinned to every k-th, the deepest kept', () => {
    const list = Array.from({ length: 101 }, (_, i) => i);
    const { kept, every } = thinTraces(list, MAX_TRACES_PER_PANEL);
    expect(kept.length).toBeLessThanOrEqual(MAX_TRACES_PER_PANEL + 1);
    expect(every).toBe(3);
    expect(kept[kept.length - 1]).toBe(100);
  });
});

describe('field damping in the report, beside laboratory Dmin (Darendeli 2001)', () => {
  it('crosshole demo: a table of field D and Dmin per soil layer with the upper-bound caution (common practice)', () => {
    const { html } = makeReport('sample-data/crosshole/project.zip', { madeAt: '2026-12-02T10:00:00.000Z' });
    expect(html).toContain('id="field-damping"');
    expect(html).toContain('Laboratory Dmin (%)');
    // field D, its sd, the frequency and Dmin in each row
    expect(html).toMatch(
      /<td class="n">\d+\.\d\d<\/td><td class="n">\d+\.\d\d<\/td><td class="n">\d+<\/td><td class="n">\d+\.\d\d<\/td><\/tr>/,
    );
    expect(html).toMatch(/scattering and geometric effects that are not removed, so field D is an upper bound/);
  });
  it('one receiver per hit: no field D, and the report says why', () => {
    const { html } = makeReport('sample-data/downhole/project.zip', { madeAt: '2026-12-02T10:00:00.000Z' });
    expect(html).toContain('id="field-damping"');
    expect(html).toMatch(/No field damping for this survey: one receiver per hit/);
  });
});
