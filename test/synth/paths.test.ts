/**
 * Travel-time geometry of the forward model: straight rays in a uniform half-space, the two-layer
 * refracted ray against Snell's law solved independently, the water-table rule for Vp, and crosshole
 * distances between deviated holes.
 */
import { describe, expect, it } from 'vitest';
import { downholePath, holePositionAt } from '../../src/core/synth/synthesize';
import { trueVpAt, trueVsAt, validateEarthModel, type EarthModel } from '../../src/core/synth/earth';
import { BorewaveError } from '../../src/core/errors';

function uniform(vsMps: number, vpMps: number): EarthModel {
  return {
    name: 'uniform',
    waterTableM: null,
    layers: [
      {
        name: 'half-space',
        topM: 0,
        thicknessM: Infinity,
        vsMps,
        vpMps,
        unitWeightKnM3: 19,
        qS: 20,
        qP: 30,
        behaviour: 'sand-like',
      },
    ],
  };
}

function twoLayer(): EarthModel {
  return {
    name: 'two layers',
    waterTableM: null,
    layers: [
      {
        name: 'upper',
        topM: 0,
        thicknessM: 5,
        vsMps: 150,
        vpMps: 400,
        unitWeightKnM3: 18,
        qS: 20,
        qP: 30,
        behaviour: 'clay-like',
      },
      {
        name: 'lower',
        topM: 5,
        thicknessM: Infinity,
        vsMps: 300,
        vpMps: 700,
        unitWeightKnM3: 20,
        qS: 30,
        qP: 40,
        behaviour: 'sand-like',
      },
    ],
  };
}

describe('straight rays in a uniform half-space (analytic: t = R / V, R the slant distance)', () => {
  it('source at the surface 3 m from the hole, receiver at 4 m: R = 5 m, t_S = 5/200 = 0.025 s, t_P = 5/400 = 0.0125 s', () => {
    const m = uniform(200, 400);
    const s = downholePath(m, 'S', 0, 4, 3);
    const p = downholePath(m, 'P', 0, 4, 3);
    expect(s.pathM).toBeCloseTo(5, 12);
    expect(s.timeS).toBeCloseTo(0.025, 12);
    expect(p.timeS).toBeCloseTo(0.0125, 12);
    // Ray direction at the receiver along the slant line (3-4-5 triangle; the source lies east).
    expect(s.directionAtReceiver[0]).toBeCloseTo(-0.6, 9);
    expect(s.directionAtReceiver[2]).toBeCloseTo(0.8, 9);
  });

  it('holds at every depth from 0.5 m to 40 m for a 2 m offset, to 1e-12 s', () => {
    const m = uniform(180, 1500);
    for (let z = 0.5; z <= 40; z += 0.5) {
      const r = Math.hypot(2, z);
      expect(Math.abs(downholePath(m, 'S', 0, z, 2).timeS - r / 180)).toBeLessThan(1e-12);
    }
  });
});

describe('two-layer refracted ray (Snell: sin(i1)/V1 = sin(i2)/V2)', () => {
  // Layer 1: 5 m at 150 m/s; layer 2 at 300 m/s; source at the surface 3 m from the hole; receiver at 10 m.
  // Independent solution: scipy.optimize.brentq (python3-scipy, Debian) on the ray parameter gave the
  // refraction point 0.9612191743798618 m from the source and t = 0.05194266553496275 s.
  const SCIPY_X1_M = 0.9612191743798618;
  const SCIPY_T_S = 0.05194266553496275;
  const timeVia = (x1M: number) => Math.hypot(5, x1M) / 150 + Math.hypot(5, 3 - x1M) / 300;

  it('Snell-law condition solved here by bisection on the refraction point matches the scipy figure', () => {
    // g(x1) = sin(i1)/V1 - sin(i2)/V2 rises monotonically from negative to positive over [0, 3].
    const g = (x1: number) => x1 / Math.hypot(5, x1) / 150 - (3 - x1) / Math.hypot(5, 3 - x1) / 300;
    let lo = 0;
    let hi = 3;
    for (let i = 0; i < 200; i++) {
      const mid = (lo + hi) / 2;
      if (g(mid) < 0) lo = mid;
      else hi = mid;
    }
    expect(lo).toBeCloseTo(SCIPY_X1_M, 9);
    expect(Math.abs(timeVia(lo) - SCIPY_T_S)).toBeLessThan(1e-12);
  });

  it('the forward model time equals the Snell-law time to 1e-9 s and its ray parameter gives the same refraction point', () => {
    const r = downholePath(twoLayer(), 'S', 0, 10, 3);
    expect(Math.abs(r.timeS - SCIPY_T_S)).toBeLessThan(1e-9);
    expect(r.pathM).toBeCloseTo(Math.hypot(5, SCIPY_X1_M) + Math.hypot(5, 3 - SCIPY_X1_M), 7);
  });

  it('a brute-force search over the refraction point (Fermat: least time) agrees to 1e-9 s', () => {
    let best = Infinity;
    for (let i = 0; i <= 300000; i++) best = Math.min(best, timeVia((3 * i) / 300000));
    expect(Math.abs(best - SCIPY_T_S)).toBeLessThan(1e-9);
    expect(Math.abs(downholePath(twoLayer(), 'S', 0, 10, 3).timeS - best)).toBeLessThan(1e-9);
  });

  it('the refracted time is shorter than the straight slant-line time through the same layers', () => {
    // Straight line from (3, 0) to (0, 10) spends half its length in each layer: 0.5 R/150 + 0.5 R/300.
    const rM = Math.hypot(3, 10);
    const straightS = (0.5 * rM) / 150 + (0.5 * rM) / 300;
    expect(downholePath(twoLayer(), 'S', 0, 10, 3).timeS).toBeLessThan(straightS);
  });
});

describe('model properties at depth', () => {
  const m: EarthModel = { ...twoLayer(), waterTableM: 2 };

  it('Vs of the layer holding the depth; a depth on an interface belongs to the layer below (common practice)', () => {
    expect(trueVsAt(m, 0)).toBe(150);
    expect(trueVsAt(m, 4.999)).toBe(150);
    expect(trueVsAt(m, 5)).toBe(300);
    expect(trueVsAt(m, 50)).toBe(300);
  });

  it('below the water table Vp is at least 1500 m/s (pore water, ASTM D7400 note on saturated soil)', () => {
    expect(trueVpAt(m, 1.9)).toBe(400);
    expect(trueVpAt(m, 2.0)).toBe(1500);
    expect(trueVpAt(m, 6)).toBe(1500);
    const fast: EarthModel = { ...m, layers: m.layers.map((l, j) => (j === 1 ? { ...l, vpMps: 1900 } : l)) };
    expect(trueVpAt(fast, 6)).toBe(1900);
  });

  it('P time through a water table follows the split layers: vertical ray 0-2 m at 400, 2-4 m at 1500 m/s', () => {
    const p = downholePath(m, 'P', 0, 4, 0);
    expect(p.timeS).toBeCloseTo(2 / 400 + 2 / 1500, 12);
  });

  it('rejects a model with a gap between layers, naming the layer and field', () => {
    const bad: EarthModel = { ...twoLayer(), layers: [twoLayer().layers[0], { ...twoLayer().layers[1], topM: 6 }] };
    expect(() => validateEarthModel(bad)).toThrowError(BorewaveError);
    try {
      validateEarthModel(bad);
    } catch (e) {
      expect((e as BorewaveError).field).toBe('layers[1] (lower).topM');
    }
  });
});

describe('deviated hole positions (straight pieces between survey stations)', () => {
  it('station at 10 m along hole, 0.3 m east and 0.4 m north: at 10 m the point is (0.3, 0.4, sqrt(100 - 0.25)) from the collar', () => {
    const hole = {
      id: 'B2',
      collarEastM: 3,
      collarNorthM: 0,
      deviation: [
        { depthAlongM: 0, eastM: 0, northM: 0 },
        { depthAlongM: 10, eastM: 0.3, northM: 0.4 },
      ],
    };
    const p = holePositionAt(hole, 10);
    expect(p[0]).toBeCloseTo(3.3, 12);
    expect(p[1]).toBeCloseTo(0.4, 12);
    expect(p[2]).toBeCloseTo(9.987492177719089, 12); // python3: math.sqrt(100 - 0.25)
    const half = holePositionAt(hole, 5);
    expect(half[0]).toBeCloseTo(3.15, 12);
    expect(half[2]).toBeCloseTo(9.987492177719089 / 2, 12);
  });
});
