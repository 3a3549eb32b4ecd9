import { describe, expect, it } from 'vitest';
import { compareProfiles, parseComparisonCsv, rayleighToShear, viktorovRatio } from '../../src/core/site/comparison';
import { BorewaveError } from '../../src/core/errors';

/**
 * Exact Rayleigh root (Rayleigh 1885; any seismology text, e.g. Lay & Wallace, Modern Global Seismology, ch. 4,
 * from memory): xi = c/beta solves (2 - xi^2)^2 = 4 sqrt(1 - xi^2) sqrt(1 - xi^2 beta^2/alpha^2), with
 * beta^2/alpha^2 = (1 - 2 nu) / (2 (1 - nu)). Solved here by bisection on (0, 1), independent of the code.
 */
function rayleighRootExact(nu: number): number {
  const k2 = (1 - 2 * nu) / (2 * (1 - nu));
  const f = (x: number) => (2 - x * x) ** 2 - 4 * Math.sqrt(1 - x * x) * Math.sqrt(1 - x * x * k2);
  let lo = 0.5,
    hi = 1; // f(0.5) < 0 < f(1) for 0 <= nu < 0.5
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

describe('Rayleigh to shear velocity (Viktorov 1967 approximation)', () => {
  it('Poisson solid nu = 0.25: exact VR/VS = sqrt(2 - 2/sqrt 3) = 0.919402 (Rayleigh 1885); the approximation (0.92) agrees within 0.1 %', () => {
    const exact = Math.sqrt(2 - 2 / Math.sqrt(3));
    expect(rayleighRootExact(0.25)).toBeCloseTo(exact, 10);
    expect(Math.abs(viktorovRatio(0.25) / exact - 1)).toBeLessThan(0.001);
    expect(rayleighToShear(0.919402 * 200, 0.25)).toBeCloseTo((200 * 0.919402) / 0.92, 8);
  });
  it('within 0.5 % of the exact root for nu from 0 to 0.49 (approximation error, from memory: about 0.5 % at nu = 0)', () => {
    for (let nu = 0; nu <= 0.49; nu += 0.01) {
      expect(Math.abs(viktorovRatio(nu) / rayleighRootExact(nu) - 1)).toBeLessThan(0.005);
    }
  });
  it('nu outside [0, 0.5) throws', () => {
    expect(() => rayleighToShear(200, 0.5)).toThrow(BorewaveError);
  });
});

describe('reading a comparison profile', () => {
  it('header in ft and ft/s: converted with 0.3048 m/ft exactly, sorted by depth', () => {
    const p = parseComparisonCsv('Depth (ft),Vs (ft/s)\n10,800\n0,500\n', 'masw-2024.csv');
    expect(p.name).toBe('masw-2024');
    expect(p.source).toBe('vs');
    expect(p.points).toEqual([
      { depthM: 0, vsMps: 500 * 0.3048 },
      { depthM: 10 * 0.3048, vsMps: 800 * 0.3048 },
    ]);
    expect(p.notes).toEqual([]);
  });
  it('semicolons, a VR column in m/s and nu = 0.25: Vs = VR / 0.92 (Viktorov approximation)', () => {
    const p = parseComparisonCsv('depth_m;vr_mps\n0;184\n4;276\n', 'sw.txt', { poissonRatio: 0.25 });
    expect(p.source).toBe('rayleigh');
    expect(p.poissonRatio).toBe(0.25);
    expect(p.points[0].vsMps).toBeCloseTo(200, 10);
    expect(p.points[1].vsMps).toBeCloseTo(300, 10);
  });
  it('no header: first columns are depth (m) and Vs (m/s), noted', () => {
    const p = parseComparisonCsv('0,150\n5,250\n', 'plain.csv');
    expect(p.points).toEqual([
      { depthM: 0, vsMps: 150 },
      { depthM: 5, vsMps: 250 },
    ]);
    expect(p.notes?.[0]).toMatch(/no header/);
  });
  it('a bad cell names the file, row and column', () => {
    try {
      parseComparisonCsv('depth_m,vs_mps\n0,150\n5,abc\n', 'bad.csv');
      expect.unreachable();
    } catch (e) {
      const err = e as BorewaveError;
      expect(err.code).toBe('COMPARISON_ROW');
      expect(err.file).toBe('bad.csv');
      expect(err.field).toBe('vs_mps');
      expect(err.message).toMatch(/row 3/);
    }
  });
  it('repeated depth and missing velocity column are errors', () => {
    expect(() => parseComparisonCsv('depth_m,vs_mps\n1,150\n1,160\n', 'rep.csv')).toThrow(/appears twice/);
    expect(() => parseComparisonCsv('depth_m,qc_mpa\n1,5\n', 'cpt.csv')).toThrow(BorewaveError);
  });
});

describe('comparing with the measured intervals (step profile, travel-time average)', () => {
  const cmp = {
    name: 'c',
    source: 'vs' as const,
    points: [
      { depthM: 0, vsMps: 100 },
      { depthM: 5, vsMps: 200 },
    ],
  };
  it('interval inside one step: difference = 100 (200 - 180)/180 = 11.11 %', () => {
    const [r] = compareProfiles([{ topM: 6, bottomM: 8, vsMps: 180 }], cmp);
    expect(r.depthM).toBe(7);
    expect(r.comparisonVsMps).toBe(200);
    expect(r.differencePct).toBeCloseTo((100 * 20) / 180, 10);
  });
  it('interval across a step 4-6 m: comparison = 2 / (1/100 + 1/200) = 133.33 m/s (hand calculation)', () => {
    const [r] = compareProfiles([{ topM: 4, bottomM: 6, vsMps: 150 }], cmp);
    expect(r.comparisonVsMps).toBeCloseTo(2 / (1 / 100 + 1 / 200), 10);
  });
  it('intervals above the first point are left out; the last step continues downwards', () => {
    const c2 = { ...cmp, points: [{ depthM: 3, vsMps: 100 }] };
    const rows = compareProfiles(
      [
        { topM: 0, bottomM: 2, vsMps: 90 },
        { topM: 50, bottomM: 52, vsMps: 90 },
      ],
      c2,
    );
    expect(rows).toHaveLength(1);
    expect(rows[0].comparisonVsMps).toBe(100);
  });
});
