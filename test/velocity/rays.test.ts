import { describe, expect, it } from 'vitest';
import { layeredRay, segmentsBetween, traceRay } from '../../src/core/survey/rays';
import { fitLayersWithRays } from '../../src/core/velocity/rayfit';

describe("refracted rays (Snell's law) through flat layers", () => {
  it('uniform half-space: time = straight slant distance / V (analytic)', () => {
    const r = layeredRay([{ topM: 0, velocityMps: 250 }], 0, 12, 3);
    expect(r.timeS).toBeCloseTo(Math.hypot(3, 12) / 250, 12);
    expect(r.pathLengthM).toBeCloseTo(Math.hypot(3, 12), 9);
  });
  it('two layers: 5 m at 150 m/s over 300 m/s, source at surface, offset 3 m, receiver at 10 m', () => {
    // By hand (Snell): p solves 5 p 150 / sqrt(1 - (150p)^2) + 5 p 300 / sqrt(1 - (300p)^2) = 3.
    // Solved independently (SciPy brentq, Debian python3-scipy): p = 0.00125857947 s/m, T = 0.0519426655 s.
    const r = layeredRay([{ topM: 0, velocityMps: 150 }, { topM: 5, velocityMps: 300 }], 0, 10, 3);
    expect(r.rayParameterSpM).toBeCloseTo(0.00125857947, 10);
    expect(r.timeS).toBeCloseTo(0.0519426655, 9);
    // Snell's law holds at the interface: sin(i1)/V1 = sin(i2)/V2 = p
    const sin1 = (r.rayParameterSpM * 150);
    const sin2 = (r.rayParameterSpM * 300);
    expect(sin1 / 150).toBeCloseTo(sin2 / 300, 15);
  });
  it('two layers: agrees with a brute-force search over the refraction point (Fermat: least time)', () => {
    // Refraction point at horizontal distance a on the interface (depth 5): T(a) = hypot(a,5)/150 + hypot(3-a,5)/300.
    let best = Infinity;
    for (let i = 0; i <= 300000; i++) {
      const a = (3 * i) / 300000;
      best = Math.min(best, Math.hypot(a, 5) / 150 + Math.hypot(3 - a, 5) / 300);
    }
    const r = layeredRay([{ topM: 0, velocityMps: 150 }, { topM: 5, velocityMps: 300 }], 0, 10, 3);
    expect(Math.abs(r.timeS - best)).toBeLessThan(1e-9);
  });
  it('segments between depths cut the model at the layer tops', () => {
    expect(segmentsBetween([{ topM: 0, velocityMps: 100 }, { topM: 2, velocityMps: 200 }, { topM: 5, velocityMps: 400 }], 1, 6)).toEqual([
      { thicknessM: 1, velocityMps: 100 }, { thicknessM: 3, velocityMps: 200 }, { thicknessM: 1, velocityMps: 400 },
    ]);
  });
  it('zero offset is the vertical ray', () => {
    const r = traceRay([{ thicknessM: 4, velocityMps: 200 }, { thicknessM: 2, velocityMps: 400 }], 0);
    expect(r.timeS).toBeCloseTo(4 / 200 + 2 / 400, 15);
  });
});

describe('layer fit of downhole direct times with refracted rays (Kim, Bang & Kim 2004 ray-path approach)', () => {
  it('recovers a three-layer model from exact ray times (analytic forward model, offset 3 m)', () => {
    const model = [{ topM: 0, velocityMps: 140 }, { topM: 4, velocityMps: 320 }, { topM: 8, velocityMps: 600 }];
    const depthsM = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
    const timesS = depthsM.map((z) => layeredRay(model, 0, z, 3).timeS);
    const fit = fitLayersWithRays({ depthsM, timesS, offsetsM: depthsM.map(() => 3), sourceDepthM: 0 })!;
    expect(fit.converged).toBe(true);
    expect(fit.rmsMisfitS).toBeLessThan(1e-7);
    const expected = [140, 140, 140, 140, 320, 320, 320, 320, 600, 600, 600, 600];
    fit.layers.forEach((l, j) => expect(Math.abs(l.velocityMps - expected[j]) / expected[j]).toBeLessThan(1e-3));
  });
});
