/**
 * cli profile writes curves.csv always and liquefaction.csv when the shaking is given (options or project),
 * on our demo downhole survey (forward model, invented site).
 */
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { runProfile } from '../../src/cli/profile';
import { newProjectDocument, writeProjectArchive } from '../../src/core/io/project';
import { writeSeg2 } from '../../src/core/io/seg2';
import {
  demoDownholeGeometry,
  demoDownholeOptions,
  demoEarthModel,
  synthesizeSurvey,
  toSeg2Input,
} from '../../src/core/synth';

let zipPath = '';

beforeAll(() => {
  const res = synthesizeSurvey(demoEarthModel(), demoDownholeGeometry(), demoDownholeOptions());
  const files = res.records.map((r) => ({
    name: r.fileName,
    bytes: writeSeg2(toSeg2Input(r), { byteOrder: 'little', formatCode: 4 }),
  }));
  const dir = mkdtempSync(join(tmpdir(), 'bw-design-'));
  zipPath = join(dir, 'p.zip');
  writeFileSync(zipPath, writeProjectArchive(newProjectDocument(res.survey), files));
}, 60_000);

async function run(extra: string[]) {
  const out = mkdtempSync(join(tmpdir(), 'bw-out-'));
  let stderr = '';
  const code = await runProfile([zipPath, '--out', out, ...extra], {
    stdout: { write: () => true },
    stderr: { write: (s: string) => (stderr += s) },
  });
  return { code, out, stderr };
}

function parse(path: string) {
  const text = readFileSync(path, 'utf8');
  const rows = Papa.parse<Record<string, string>>(text, { header: true, comments: '#', skipEmptyLines: true });
  return { text, rows: rows.data, fields: rows.meta.fields ?? [] };
}

describe('cli profile: curves.csv and liquefaction.csv', () => {
  it('without shaking: curves.csv with units, model and source columns, no liquefaction.csv', async () => {
    const { code, out } = await run([]);
    expect(code).toBe(0);
    expect(existsSync(join(out, 'liquefaction.csv'))).toBe(false);
    const { text, rows, fields } = parse(join(out, 'curves.csv'));
    for (const c of ['depth_top_m', 'strain_pct', 'g_over_gmax', 'damping_pct', 'gmax_mpa', 'g_mpa', 'model', 'source'])
      expect(fields).toContain(c);
    expect(text).toMatch(/^# CAUTION: .*qualified professional/m);
    expect(text).toMatch(/^# CAUTION: Field damping columns are empty/m);
    // demo column: 6 layers x 2 models x 41 strains
    const curve = rows.filter((r) => r.point === 'curve');
    expect(curve.length).toBe(6 * 2 * 41);
    const strains = curve
      .filter((r) => r.layer === curve[0].layer && r.model === curve[0].model)
      .map((r) => Number(r.strain_pct));
    expect(strains[0]).toBeCloseTo(0.0001, 8);
    expect(strains[strains.length - 1]).toBeCloseTo(1, 8);
    for (const r of curve) {
      const g = Number(r.g_over_gmax);
      expect(g).toBeGreaterThan(0);
      expect(g).toBeLessThanOrEqual(1);
    }
  }, 60_000);
  it('--pga-g 0.3 --magnitude 7.5: liquefaction.csv per interval and per layer, labelled a screening', async () => {
    const { code, out } = await run(['--pga-g', '0.3', '--magnitude', '7.5']);
    expect(code).toBe(0);
    const { text, rows, fields } = parse(join(out, 'liquefaction.csv'));
    for (const c of [
      'basis',
      'depth_mid_m',
      'vs1_mps_n0.25_pa100kpa',
      'csr',
      'crr_m7_5',
      'msf',
      'factor_of_safety',
      'method',
      'source',
    ])
      expect(fields).toContain(c);
    expect(text).toMatch(/^# CAUTION: Liquefaction triggering SCREEN/m);
    expect(rows.some((r) => r.basis === 'layer')).toBe(true);
    // only sand below the 2.1 m water table is screened in the demo (fill is gravel, clay, rock are not)
    for (const r of rows) {
      if (r.status === 'screened') {
        expect(r.soil_type).toBe('sand');
        expect(Number(r.depth_mid_m)).toBeGreaterThan(2.1);
        expect(Number(r.factor_of_safety)).toBeGreaterThan(0);
      } else expect(r.factor_of_safety).toBe('');
    }
    expect(rows.some((r) => r.status === 'screened' || r.status === 'vs1-above-limit')).toBe(true);
  }, 60_000);
  it('only one of --pga-g and --magnitude, or an out-of-range value, exits 2 with a reason', async () => {
    const a = await run(['--pga-g', '0.3']);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/both --pga-g and --magnitude/);
    const b = await run(['--pga-g', '0', '--magnitude', '7.5']);
    expect(b.code).toBe(2);
    const c = await run(['--pga-g', '0.3', '--magnitude', 'big']);
    expect(c.code).toBe(2);
  }, 60_000);
});
