/**
 * End to end, files to CSV: the forward model writes SEG-2 files and a project archive, `cli profile`
 * reads them back, and the profile must recover the model's layer Vs. The model is the reference here
 * (an analytic forward calculation with refracted rays): within 3% median over the intervals that do
 * not straddle a layer boundary, for every test kind (issue acceptance figure).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { runProfile } from '../../src/cli/profile';
import { prepare } from '../../src/core/pipeline';
import { defaultSettings } from '../../src/core/settings';
import { newProjectDocument, writeProjectArchive } from '../../src/core/io/project';
import { writeSeg2 } from '../../src/core/io/seg2';
import {
  demoCrossholeGeometry,
  demoCrossholeOptions,
  demoDownholeGeometry,
  demoDownholeOptions,
  demoEarthModel,
  demoPairGeometry,
  demoPairOptions,
  synthesizeSurvey,
  toSeg2Input,
  trueVsAt,
  type SynthResult,
} from '../../src/core/synth';

const model = demoEarthModel();
const boundaries = model.layers.map((l) => l.topM);

function archiveOf(res: SynthResult): Uint8Array {
  const files = res.records.map((r) => ({
    name: r.fileName,
    bytes: writeSeg2(toSeg2Input(r), { byteOrder: 'little', formatCode: 4 }),
  }));
  return writeProjectArchive(newProjectDocument(res.survey), files);
}

async function profileRows(
  zip: Uint8Array,
  extra: string[] = [],
): Promise<{ rows: Record<string, string>[]; stderr: string; code: number; dir: string }> {
  const dir = mkdtempSync(join(tmpdir(), 'bw-'));
  writeFileSync(join(dir, 'p.zip'), zip);
  let stderr = '';
  const code = await runProfile([join(dir, 'p.zip'), '--out', join(dir, 'out'), ...extra], {
    stdout: { write: () => true },
    stderr: { write: (s: string) => (stderr += s) },
  });
  const csv = readFileSync(join(dir, 'out', 'profile.csv'), 'utf8');
  const rows = Papa.parse<Record<string, string>>(csv, { header: true, comments: '#', skipEmptyLines: true }).data;
  return { rows, stderr, code, dir };
}

function medianRelErrorOffBoundaries(rows: Record<string, string>[]): { median: number; n: number } {
  const errs: number[] = [];
  for (const r of rows) {
    const top = Number(r.depth_top_m);
    const bottom = Number(r.depth_bottom_m);
    if (boundaries.some((b) => b > top + 1e-6 && b < bottom - 1e-6)) continue;
    const truth = trueVsAt(model, (top + bottom) / 2);
    errs.push(Math.abs(Number(r.vs_mps) - truth) / truth);
  }
  errs.sort((a, b) => a - b);
  return { median: errs[Math.floor(errs.length / 2)], n: errs.length };
}

describe('cli profile on the demo surveys recovers the forward model (within 3% median, off boundaries)', () => {
  const cases: [string, () => SynthResult][] = [
    ['downhole', () => synthesizeSurvey(model, demoDownholeGeometry(), demoDownholeOptions())],
    ['two-receiver downhole', () => synthesizeSurvey(model, demoPairGeometry(), demoPairOptions())],
    ['crosshole', () => synthesizeSurvey(model, demoCrossholeGeometry(), demoCrossholeOptions())],
  ];
  for (const [name, make] of cases) {
    it(name, async () => {
      const { rows, code } = await profileRows(archiveOf(make()));
      expect(code).toBe(0);
      const { median, n } = medianRelErrorOffBoundaries(rows);
      expect(n).toBeGreaterThan(10);
      expect(median).toBeLessThan(0.03);
    });
  }
});

describe('refracted-ray layer model of the downhole demo (layers.csv) recovers every layer within 3%', () => {
  it('downhole', async () => {
    const { dir } = await profileRows(
      archiveOf(synthesizeSurvey(model, demoDownholeGeometry(), demoDownholeOptions())),
    );
    const rows = Papa.parse<Record<string, string>>(readFileSync(join(dir, 'out', 'layers.csv'), 'utf8'), {
      header: true,
      comments: '#',
      skipEmptyLines: true,
    }).data.filter((r) => r.method.startsWith('refracted'));
    expect(rows.length).toBe(model.layers.length);
    for (const r of rows) {
      const truth = trueVsAt(model, (Number(r.depth_top_m) + Number(r.depth_bottom_m)) / 2);
      expect(Math.abs(Number(r.velocity_mps) - truth) / truth).toBeLessThan(0.03);
    }
  });
});

describe('bad input is named and the rest still computes', () => {
  it('a missing file and a record with no depth are reported; the profile is still written', async () => {
    const res = synthesizeSurvey(model, demoDownholeGeometry(), demoDownholeOptions());
    res.survey.records[4] = { ...res.survey.records[4], depthM: null };
    const files = res.records
      .slice(1)
      .map((r) => ({ name: r.fileName, bytes: writeSeg2(toSeg2Input(r), { byteOrder: 'big', formatCode: 2 }) }));
    const doc = newProjectDocument(res.survey, []);
    const zip = writeProjectArchive({ ...doc }, files);
    // project.json lists only the files it stores, so name the first file as missing by hand:
    const { unzipSync, zipSync, strFromU8, strToU8 } = await import('fflate');
    const entries = unzipSync(zip);
    const pj = JSON.parse(strFromU8(entries['project.json']));
    pj.files = [{ path: res.records[0].fileName, role: 'wave' }, ...pj.files];
    entries['project.json'] = strToU8(JSON.stringify(pj));
    const { rows, stderr, code } = await profileRows(zipSync(entries));
    expect(code).toBe(0);
    expect(stderr).toContain(res.records[0].fileName);
    expect(stderr).toContain('PROJECT_FILE_MISSING');
    expect(stderr).toContain(res.survey.records[4].recordId);
    expect(stderr).toContain('RECORD_NO_DEPTH');
    expect(rows.length).toBeGreaterThan(20);
  });
  it('a record with no channel for the shear wave is named, not silently left out (common practice)', () => {
    const res = synthesizeSurvey(model, demoDownholeGeometry(), demoDownholeOptions());
    const survey = { ...res.survey, records: res.survey.records.map((r, i) => (i === 3 ? { ...r, channels: [] } : r)) };
    const prep = prepare(survey, new Map(res.records.map((r) => [r.id, r])), defaultSettings());
    const named = prep.issues.filter((p) => p.code === 'RECORD_NO_CHANNEL');
    expect(named).toHaveLength(1);
    expect(named[0].file).toBe(survey.records[3].recordId);
    expect(named[0].message).toContain('no channels assigned at all');
    // the other records still make their stations
    expect(prep.stations.length).toBeGreaterThan(20);
  });
  it('an unreadable project exits 2 with a one-line reason', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'bw-'));
    writeFileSync(join(dir, 'bad.zip'), 'not a zip at all');
    let err = '';
    const code = await runProfile([join(dir, 'bad.zip'), '--out', join(dir, 'o')], {
      stdout: { write: () => true },
      stderr: { write: (s: string) => (err += s) },
    });
    expect(code).toBe(2);
    expect(err.trim().split('\n')).toHaveLength(1);
    expect(err).toContain('not a zip');
  });
});
