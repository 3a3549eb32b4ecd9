/**
 * The stated 95% range of interval Vs (src/core/velocity/sdCalibration.ts tailFactor95 / range95Mps,
 * carried through velocity/intervals.ts, stiffness/rows.ts and the exports in report/tables.ts).
 *
 * External references: the two-sided 95% point of the standard normal is 1.96, P(|Z| <= 1.96) = 0.9500
 * (any table of the normal distribution, e.g. Abramowitz & Stegun 1964, table 26.1); US units with the
 * exact 0.3048 m/ft (NIST SP 811); rounding of velocities to 3 significant digits (docs/significant-digits.md;
 * the expected cells are rounded here with JavaScript's own Number.prototype.toPrecision, ECMA-262).
 */
import { describe, expect, it } from 'vitest';
import { cleanDownhole, runClean } from '../helpers/cleanSurvey';
import { makeReport } from '../../src/cli/report';
import { mulberry32 } from '../../src/core/random';
import { intervalsTable, profileTable, siteJson, toCsv } from '../../src/core/report/tables';
import type { Derived } from '../../src/core/pipeline';
import { defaultSettings } from '../../src/core/settings';
import { setRange95, type IntervalValue } from '../../src/core/velocity/intervals';
import {
  GAUSSIAN_K95,
  range95Mps,
  TAIL_K95,
  tailFactor95,
  vsBarMps,
  withinShare,
} from '../../src/core/velocity/sdCalibration';

describe('k95 per test kind and method', () => {
  it('a method with no bench entry is taken as Gaussian: 1.96 (normal table, two-sided 95%)', () => {
    // crosshole has no layered model and no ray fit in the bench: no entry, so the Gaussian factor.
    expect(TAIL_K95.crosshole?.['layer-model']).toBeUndefined();
    expect(tailFactor95('crosshole', 'layer-model')).toBe(1.96);
    expect(tailFactor95('crosshole', 'ray-fit')).toBe(GAUSSIAN_K95);
  });

  it('1.96 sd holds 95% of Gaussian errors (normal table: 0.9500; +-0.4% at n = 20000)', () => {
    const rng = mulberry32(11);
    const rows = Array.from({ length: 20000 }, () => ({ errorMps: 7 * rng.normal(), sdMps: 7 }));
    expect(Math.abs(withinShare(rows, GAUSSIAN_K95)! - 0.95)).toBeLessThan(0.004);
  });

  it('an entry of the table is returned as it stands', () => {
    const k = TAIL_K95['downhole-pair']!.xcorr!;
    expect(tailFactor95('downhole-pair', 'xcorr')).toBe(k);
    for (const row of Object.values(TAIL_K95))
      for (const v of Object.values(row ?? {})) expect(Number.isFinite(v) && v! > 0).toBe(true);
  });
});

describe('range v -+ k sd (hand-worked)', () => {
  it('200 m/s, sd 10, k 2.28: 177.2 to 222.8 m/s', () => {
    const r = range95Mps(200, 10, 2.28)!;
    expect(r.lowMps).toBeCloseTo(177.2, 10);
    expect(r.highMps).toBeCloseTo(222.8, 10);
  });
  it('the low end is floored at 0: 30 m/s, sd 20, k 2 -> 0 to 70 m/s', () => {
    expect(range95Mps(30, 20, 2)).toEqual({ lowMps: 0, highMps: 70 });
  });
  it('no range without an sd or a value', () => {
    expect(range95Mps(200, null, 2)).toBeNull();
    expect(range95Mps(200, 0, 2)).toBeNull();
    expect(range95Mps(null, 5, 2)).toBeNull();
    expect(range95Mps(200, Number.NaN, 2)).toBeNull();
  });
  it('an interval row takes the factor of its kind and method', () => {
    const row = {
      method: 'xcorr',
      velocityMps: 250,
      velocitySdMps: 12,
      low95Mps: null,
      high95Mps: null,
    } as unknown as IntervalValue;
    setRange95(row, 'downhole-pair');
    const k = tailFactor95('downhole-pair', 'xcorr');
    expect(row.low95Mps).toBeCloseTo(250 - 12 * k, 10);
    expect(row.high95Mps).toBeCloseTo(250 + 12 * k, 10);
  });
});

describe('the range through the pipeline and the exports', () => {
  const res = cleanDownhole([2, 3, 4, 5, 6, 7], { seed: 3 });
  const out = runClean(res);
  const d = out.derived;

  it('every interval row with an sd carries v -+ k95 sd of its method; rows without one carry none', () => {
    expect(d.intervals.some((r) => r.low95Mps !== null)).toBe(true);
    for (const r of d.intervals) {
      if (r.velocityMps === null || !(r.velocitySdMps! > 0)) {
        expect(r.low95Mps).toBeNull();
        expect(r.high95Mps).toBeNull();
        continue;
      }
      const k = tailFactor95('downhole', r.method);
      expect(r.low95Mps).toBeCloseTo(Math.max(0, r.velocityMps - k * r.velocitySdMps!), 9);
      expect(r.high95Mps).toBeCloseTo(r.velocityMps + k * r.velocitySdMps!, 9);
    }
  });

  it('profile rows take the range of the chosen S interval', () => {
    expect(d.profile.length).toBeGreaterThan(0);
    for (const p of d.profile) {
      const iv = d.intervals.find((r) => r.key === p.intervalKey && r.chosen)!;
      expect(p.vsLow95Mps).toBe(iv.low95Mps);
      expect(p.vsHigh95Mps).toBe(iv.high95Mps);
    }
  });

  const halfUnit3 = (x: number) => 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(x))) - 2) + 1e-9;

  it('profile.csv in SI: vs_low95_mps and vs_high95_mps right after vs_sd_mps, 3 significant digits', () => {
    const t = profileTable(d, 'SI');
    const i = t.columns.indexOf('vs_sd_mps');
    expect(t.columns.slice(i, i + 4)).toEqual(['vs_sd_mps', 'vs_low95_mps', 'vs_high95_mps', 'vp_mps']);
    d.profile.forEach((p, j) => {
      const lo = t.rows[j][i + 1] as number;
      const hi = t.rows[j][i + 2] as number;
      expect(Math.abs(lo - p.vsLow95Mps!)).toBeLessThanOrEqual(halfUnit3(p.vsLow95Mps!));
      expect(Math.abs(hi - p.vsHigh95Mps!)).toBeLessThanOrEqual(halfUnit3(p.vsHigh95Mps!));
    });
    expect(toCsv(t).split('\n')[0]).toContain('vs_mps,vs_sd_mps,vs_low95_mps,vs_high95_mps,vp_mps');
  });

  it('profile.csv in US units: vs_low95_ftps and vs_high95_ftps, converted with 0.3048 m/ft (NIST SP 811)', () => {
    const t = profileTable(d, 'US');
    const i = t.columns.indexOf('vs_sd_ftps');
    expect(t.columns.slice(i, i + 3)).toEqual(['vs_sd_ftps', 'vs_low95_ftps', 'vs_high95_ftps']);
    d.profile.forEach((p, j) => {
      const loFt = p.vsLow95Mps! / 0.3048;
      const hiFt = p.vsHigh95Mps! / 0.3048;
      expect(Math.abs((t.rows[j][i + 1] as number) - loFt)).toBeLessThanOrEqual(halfUnit3(loFt));
      expect(Math.abs((t.rows[j][i + 2] as number) - hiFt)).toBeLessThanOrEqual(halfUnit3(hiFt));
    });
  });

  it('site.json lists each profile interval with its 95% range', () => {
    const j = siteJson(d, defaultSettings()) as { intervals: Record<string, unknown>[] };
    expect(j.intervals).toHaveLength(d.profile.length);
    const p = d.profile[0];
    expect(j.intervals[0]).toMatchObject({ method: p.method });
    expect(Math.abs((j.intervals[0].vsLow95Mps as number) - p.vsLow95Mps!)).toBeLessThanOrEqual(
      halfUnit3(p.vsLow95Mps!),
    );
    expect(Math.abs((j.intervals[0].vsHigh95Mps as number) - p.vsHigh95Mps!)).toBeLessThanOrEqual(
      halfUnit3(p.vsHigh95Mps!),
    );
  });
});

describe('HTML report interval table', () => {
  it('has one "95% range" column with low–high per interval', () => {
    const { html } = makeReport('sample-data/downhole/project.zip', { madeAt: '2026-12-02T10:00:00.000Z' });
    expect(html).toContain('<th class="n">95% range (m/s)</th>');
    expect(html).toMatch(/<td class="n">\d+(\.\d+)?–\d+(\.\d+)?<\/td>/);
  });
});

describe('intervals.csv: the 95% range of every interval row', () => {
  /** One interval row as the core makes it, its range set by setRange95 for its kind and method. */
  const row = (wave: 'S' | 'P', velocityMps: number, sdMps: number | null): IntervalValue => {
    const r = {
      key: `DH1:${wave}:2-3`,
      wave,
      kind: 'pseudo',
      stationA: 'a',
      stationB: 'b',
      topM: 2,
      bottomM: 3,
      pathAM: 2.83,
      pathBM: 3.61,
      method: 'layer-model',
      dtS: 0.004,
      velocityMps,
      velocitySdMps: sdMps,
      low95Mps: null,
      high95Mps: null,
      chosen: true,
      flags: [],
    } as unknown as IntervalValue;
    setRange95(r, 'downhole');
    return r;
  };
  const derivedOf = (rows: IntervalValue[]) => ({ intervals: rows }) as unknown as Derived;
  /** Header and first data row of the CSV text, as maps from column name to cell text. */
  const cellsOf = (csv: string) => {
    const [head, ...lines] = csv.split('\n').filter((l) => l && !l.startsWith('#'));
    const names = head.split(',');
    return lines.map((l) => new Map(l.split(',').map((c, i) => [names[i], c])));
  };
  // 3 significant digits (docs/significant-digits.md), by the language's own rounding (ECMA-262 toPrecision).
  const sig3 = (x: number) => String(Number(x.toPrecision(3)));
  const k = tailFactor95('downhole', 'layer-model');

  it('SI: 200 m/s, sd 11 m/s -> vs_low95_mps = 200 - k95 x 11, vs_high95_mps = 200 + k95 x 11', () => {
    // sd 11, not 10: k95 x 10 can land on a rounding tie (174.5) that the two roundings may split
    const csv = toCsv(intervalsTable(derivedOf([row('S', 200, 11)]), 'SI'));
    expect(csv.split('\n')[0]).toContain(
      'vs_mps,vs_sd_mps,vs_low95_mps,vs_high95_mps,vp_mps,vp_sd_mps,vp_low95_mps,vp_high95_mps,flags',
    );
    const [c] = cellsOf(csv);
    expect(c.get('vs_low95_mps')).toBe(sig3(200 - k * 11));
    expect(c.get('vs_high95_mps')).toBe(sig3(200 + k * 11));
    // An S row leaves the P columns empty.
    expect(c.get('vp_low95_mps')).toBe('');
    expect(c.get('vp_high95_mps')).toBe('');
  });

  it('US: the same row in ft/s, 1 ft = 0.3048 m exactly (NIST SP 811)', () => {
    const csv = toCsv(intervalsTable(derivedOf([row('S', 200, 11)]), 'US'));
    expect(csv.split('\n')[0]).toContain('vs_ftps,vs_sd_ftps,vs_low95_ftps,vs_high95_ftps,vp_ftps');
    const [c] = cellsOf(csv);
    expect(c.get('vs_low95_ftps')).toBe(sig3((200 - k * 11) / 0.3048));
    expect(c.get('vs_high95_ftps')).toBe(sig3((200 + k * 11) / 0.3048));
  });

  it('a P row fills the vp range columns; a row without an sd leaves its range empty', () => {
    const csv = toCsv(intervalsTable(derivedOf([row('P', 1500, 40), row('S', 200, null)]), 'SI'));
    const [p, s] = cellsOf(csv);
    expect(p.get('vp_low95_mps')).toBe(sig3(1500 - k * 40));
    expect(p.get('vp_high95_mps')).toBe(sig3(1500 + k * 40));
    expect(p.get('vs_low95_mps')).toBe('');
    expect(s.get('vs_mps')).toBe('200');
    expect(s.get('vs_low95_mps')).toBe('');
    expect(s.get('vs_high95_mps')).toBe('');
  });

  it('through the pipeline: each row shows its own low95Mps / high95Mps to 3 significant digits', () => {
    const d = runClean(cleanDownhole([2, 3, 4, 5, 6], { seed: 3 })).derived;
    const t = intervalsTable(d, 'SI');
    const col = (name: string) => t.columns.indexOf(name);
    const halfUnit3 = (x: number) => 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(x))) - 2) + 1e-9;
    expect(d.intervals.some((r) => r.low95Mps !== null)).toBe(true);
    d.intervals.forEach((r, j) => {
      const w = r.wave === 'S' ? 'vs' : 'vp';
      const lo = t.rows[j][col(`${w}_low95_mps`)];
      const hi = t.rows[j][col(`${w}_high95_mps`)];
      if (r.low95Mps === null || r.high95Mps === null) {
        expect(lo).toBeNull();
        expect(hi).toBeNull();
        return;
      }
      expect(Math.abs((lo as number) - r.low95Mps)).toBeLessThanOrEqual(halfUnit3(r.low95Mps));
      expect(Math.abs((hi as number) - r.high95Mps)).toBeLessThanOrEqual(halfUnit3(r.high95Mps));
    });
  });
});

describe('the extent of a Vs bar in the plots (vsBarMps; one rule for the Profile plot and the report)', () => {
  it('the 95% range where there is one, asymmetric when its low end was floored at 0', () => {
    expect(vsBarMps(100, 60, 0, 220)).toEqual({ lowMps: 0, highMps: 220, isRange95: true });
  });
  it('v -+ 1 sd without a range: 250 +- 12 m/s gives 238-262', () => {
    expect(vsBarMps(250, 12, null, null)).toEqual({ lowMps: 238, highMps: 262, isRange95: false });
  });
  it('no width without an sd', () => {
    expect(vsBarMps(250, null, null, null)).toEqual({ lowMps: 250, highMps: 250, isRange95: false });
  });
});
