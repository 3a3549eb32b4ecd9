import { describe, expect, it } from 'vitest';
import {
  correctedTimeS,
  fitLine,
  intervalVelocityMps,
  intervalVelocitySdMps,
  slantDistanceM,
} from '../../src/core/velocity/formulas';
import { distanceM, positionAlongHole } from '../../src/core/survey/geometry';
import type { Borehole } from '../../src/core/model';

describe('downhole interval velocity (ASTM D7400/D7400M-19 formulas; worked numbers in docs/methods.md s.2 [calc])', () => {
  // Source at the surface, horizontal offset x = 1.5 m; receivers at z = 5 m and 6 m; picks 25.0 and 29.5 ms.
  const x = 1.5;
  const r1 = slantDistanceM(x, 0, 5); // sqrt(1.5^2 + 5^2) = sqrt(27.25) = 5.22015 m
  const r2 = slantDistanceM(x, 0, 6); // sqrt(1.5^2 + 6^2) = sqrt(38.25) = 6.18466 m
  it('slant distances R = sqrt(x^2 + (z - zs)^2)', () => {
    expect(r1).toBeCloseTo(5.2202, 4);
    expect(r2).toBeCloseTo(6.1847, 4);
  });
  it('interval V = (R2 - R1)/(t2 - t1) = 0.96451 m / 4.5 ms = 214.33 m/s', () => {
    expect(intervalVelocityMps(r1, r2, 0.0295 - 0.025)).toBeCloseTo(214.33, 2);
  });
  it('slant-corrected times tc = t z / R give V = 1 m / (28.6192 - 23.9457) ms = 213.97 m/s', () => {
    const tc1 = correctedTimeS(0.025, 0, 5, r1); // 25.0 * 5 / 5.22015 = 23.9457 ms
    const tc2 = correctedTimeS(0.0295, 0, 6, r2); // 29.5 * 6 / 6.18466 = 28.6192 ms
    expect(tc1 * 1000).toBeCloseTo(23.9457, 3);
    expect(tc2 * 1000).toBeCloseTo(28.6192, 3);
    expect(1 / (tc2 - tc1)).toBeCloseTo(213.97, 1);
  });
  it('pick error matters: Vs 200 m/s over 1 m (dt = 5 ms) with +-0.5 ms gives 182-222 m/s (docs/methods.md [calc])', () => {
    expect(intervalVelocityMps(0, 1, 0.0055)).toBeCloseTo(181.8, 1);
    expect(intervalVelocityMps(0, 1, 0.0045)).toBeCloseTo(222.2, 1);
  });
  it('non-positive time difference gives no velocity', () => {
    expect(intervalVelocityMps(5, 6, 0)).toBeNull();
    expect(intervalVelocityMps(5, 6, -0.001)).toBeNull();
  });
  it('first-order uncertainty: 1% path and 2% time errors combine to sqrt(5)% (independent errors)', () => {
    expect(intervalVelocitySdMps(200, 1, 0.01, 0.005, 0.0001)).toBeCloseTo(200 * Math.sqrt(0.0001 + 0.0004), 9);
  });
});

describe('crosshole interval velocity from deviated holes (ASTM D4428/D4428M-14: V = (D2 - D1)/(t2 - t1) with 3-D distances)', () => {
  // Hand-worked example. Collars: source S (0,0), near R1 (3,0), far R2 (6,0). Each hole surveyed at 0 and
  // 10 m along hole; at 10 m the offsets from the collar are S (+0.10 E, +0.05 N), R1 (-0.15, 0), R2 (+0.20, -0.10).
  // True vertical depth at 10 m along hole: sqrt(10^2 - dh^2): S 9.999375, R1 9.998875, R2 9.997500 m.
  // D1 = |(2.85, 0, 9.998875) - (0.10, 0.05, 9.999375)| = sqrt(2.75^2 + 0.05^2 + 0.0005^2) = 2.750455 m
  // D2 = |(6.20, -0.10, 9.997500) - (0.10, 0.05, 9.999375)| = sqrt(6.10^2 + 0.15^2 + 0.001875^2) = 6.101844 m
  // Picks t1 = 12.0 ms, t2 = 28.5 ms -> V = 3.351389 m / 16.5 ms = 203.11 m/s.
  const hole = (id: string, e0: number, de: number, dn: number): Borehole => ({
    id,
    collarEastM: e0,
    collarNorthM: 0,
    deviation: [
      { depthAlongM: 0, eastM: 0, northM: 0 },
      { depthAlongM: 10, eastM: de, northM: dn },
    ],
  });
  const s = positionAlongHole(hole('S', 0, 0.1, 0.05), 10).pos;
  const r1 = positionAlongHole(hole('R1', 3, -0.15, 0), 10).pos;
  const r2 = positionAlongHole(hole('R2', 6, 0.2, -0.1), 10).pos;
  it('positions from the deviation survey', () => {
    expect(s[2]).toBeCloseTo(9.999375, 6);
    expect(r1[0]).toBeCloseTo(2.85, 12);
    expect(r2[2]).toBeCloseTo(9.9975, 6);
  });
  it('3-D distances and the interval velocity', () => {
    expect(distanceM(s, r1)).toBeCloseTo(2.750455, 6);
    expect(distanceM(s, r2)).toBeCloseTo(6.101844, 6);
    expect(intervalVelocityMps(distanceM(s, r1), distanceM(s, r2), 0.0285 - 0.012)).toBeCloseTo(203.11, 2);
  });
  it('a 0.3 m drift over 3 m is a 10% distance error (common practice, docs/methods.md)', () => {
    const straight = 3;
    const drifted = distanceM([0, 0, 10], [3.3, 0, 10]);
    expect((drifted - straight) / straight).toBeCloseTo(0.1, 12);
  });
});

describe('deviation interpolation rules (ours, documented in survey/geometry.ts)', () => {
  const h: Borehole = {
    id: 'B',
    collarEastM: 100,
    collarNorthM: 200,
    deviation: [
      { depthAlongM: 0, eastM: 0, northM: 0 },
      { depthAlongM: 5, eastM: 0.3, northM: 0 },
      { depthAlongM: 10, eastM: 0.6, northM: 0.4 },
    ],
  };
  it('linear offsets between stations', () => {
    const p = positionAlongHole(h, 7.5).pos;
    expect(p[0]).toBeCloseTo(100.45, 12);
    expect(p[1]).toBeCloseTo(200.2, 12);
    expect(positionAlongHole(h, 7.5).beyondSurvey).toBe(false);
  });
  it('beyond the last station: continues along the last segment and is flagged', () => {
    const p = positionAlongHole(h, 15);
    expect(p.pos[0]).toBeCloseTo(100.9, 12);
    expect(p.pos[1]).toBeCloseTo(200.8, 12);
    expect(p.beyondSurvey).toBe(true);
  });
  it('a vertical hole without a survey keeps depth = depth along hole', () => {
    expect(positionAlongHole({ id: 'V', collarEastM: 0, collarNorthM: 0, deviation: [] }, 12.5).pos).toEqual([
      0, 0, 12.5,
    ]);
  });
});

describe('least-squares line (any statistics text; checked against a hand example)', () => {
  it('y = 1 + 2x exactly', () => {
    const f = fitLine([0, 1, 2, 3], [1, 3, 5, 7])!;
    expect(f.slope).toBeCloseTo(2, 12);
    expect(f.intercept).toBeCloseTo(1, 12);
    expect(f.slopeSe).toBeCloseTo(0, 12);
  });
  it('standard error of the slope: x = 0,1,2,3; y = 0,1,1,3 -> b = 0.9, se = sqrt(0.7/2/5) = 0.26458', () => {
    // residuals: y - (-0.1 + 0.9x) = 0.1, 0.2, -0.7, 0.4 -> SSE = 0.7; Sxx = 5
    const f = fitLine([0, 1, 2, 3], [0, 1, 1, 3])!;
    expect(f.slope).toBeCloseTo(0.9, 12);
    expect(f.slopeSe).toBeCloseTo(Math.sqrt(0.7 / 2 / 5), 12);
  });
});
