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
    const r = layeredRay(
      [
        { topM: 0, velocityMps: 150 },
        { topM: 5, velocityMps: 300 },
      ],
      0,
      10,
      3,
    );
    expect(r.rayParameterSpM).toBeCloseTo(0.00125857947, 10);
    expect(r.timeS).toBeCloseTo(0.0519426655, 9);
    // Snell's law holds at the interface: sin(i1)/V1 = sin(i2)/V2 = p
    const sin1 = r.rayParameterSpM * 150;
    const sin2 = r.rayParameterSpM * 300;
    expect(sin1 / 150).toBeCloseTo(sin2 / 300, 15);
  });
  it('two layers: agrees with a brute-force search over the refraction point (Fermat: least time)', () => {
    // Refraction point at horizontal distance a on the interface (depth 5): T(a) = hypot(a,5)/150 + hypot(3-a,5)/300.
    let best = Infinity;
    for (let i = 0; i <= 300000; i++) {
      const a = (3 * i) / 300000;
      best = Math.min(best, Math.hypot(a, 5) / 150 + Math.hypot(3 - a, 5) / 300);
    }
    const r = layeredRay(
      [
        { topM: 0, velocityMps: 150 },
        { topM: 5, velocityMps: 300 },
      ],
      0,
      10,
      3,
    );
    expect(Math.abs(r.timeS - best)).toBeLessThan(1e-9);
  });
  it('segments between depths cut the model at the layer tops', () => {
    expect(
      segmentsBetween(
        [
          { topM: 0, velocityMps: 100 },
          { topM: 2, velocityMps: 200 },
          { topM: 5, velocityMps: 400 },
        ],
        1,
        6,
      ),
    ).toEqual([
      { thicknessM: 1, velocityMps: 100 },
      { thicknessM: 3, velocityMps: 200 },
      { thicknessM: 1, velocityMps: 400 },
    ]);
  });
  it('zero offset is the vertical ray', () => {
    const r = traceRay(
      [
        { thicknessM: 4, velocityMps: 200 },
        { thicknessM: 2, velocityMps: 400 },
      ],
      0,
    );
    expect(r.timeS).toBeCloseTo(4 / 200 + 2 / 400, 15);
  });
});

describe('layer fit of downhole direct times with refracted rays (Kim, Bang & Kim 2004 ray-path approach)', () => {
  it('recovers a three-layer model from exact ray times (analytic forward model, offset 3 m)', () => {
    const model = [
      { topM: 0, velocityMps: 140 },
      { topM: 4, velocityMps: 320 },
      { topM: 8, velocityMps: 600 },
    ];
    const depthsM = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
    const timesS = depthsM.map((z) => layeredRay(model, 0, z, 3).timeS);
    const fit = fitLayersWithRays({ depthsM, timesS, offsetsM: depthsM.map(() => 3), sourceDepthM: 0 })!;
    expect(fit.converged).toBe(true);
    expect(fit.rmsMisfitS).toBeLessThan(1e-7);
    const expected = [140, 140, 140, 140, 320, 320, 320, 320, 600, 600, 600, 600];
    fit.layers.forEach((l, j) => expect(Math.abs(l.velocityMps - expected[j]) / expected[j]).toBeLessThan(1e-3));
  });
});

import { fitLayerModel } from '../../src/core/velocity/rayfit';
import { mulberry32 } from '../../src/core/random';

describe('layer model over chosen layers (least squares with refracted rays, iterated)', () => {
  const model = [
    { topM: 0, velocityMps: 140 },
    { topM: 4, velocityMps: 320 },
    { topM: 8, velocityMps: 600 },
  ];
  const depthsM = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const exact = depthsM.map((z) => layeredRay(model, 0, z, 3).timeS);
  it('exact ray times (analytic forward model) give the layer velocities back and zero misfit', () => {
    const fit = fitLayerModel({ depthsM, timesS: exact, offsetsM: depthsM.map(() => 3), sourceDepthM: 0 }, [4, 8])!;
    expect(fit.converged).toBe(true);
    expect(fit.layers.map((l) => l.velocityMps)).toEqual([
      expect.closeTo(140, 3),
      expect.closeTo(320, 3),
      expect.closeTo(600, 3),
    ]);
    expect(fit.rmsMisfitS).toBeLessThan(1e-8);
  });
  it('with 0.1 ms pick noise the misfit is about the noise and the stated sd covers the error (3 sigma)', () => {
    const g = mulberry32(42);
    const noisy = exact.map((t) => t + 1e-4 * g.normal());
    const fit = fitLayerModel({ depthsM, timesS: noisy, offsetsM: depthsM.map(() => 3), sourceDepthM: 0 }, [4, 8])!;
    expect(fit.rmsMisfitS).toBeGreaterThan(3e-5);
    expect(fit.rmsMisfitS).toBeLessThan(2e-4);
    fit.layers.forEach((l, j) =>
      expect(Math.abs(l.velocityMps - model[j].velocityMps)).toBeLessThan(3 * l.velocitySdMps!),
    );
  });
  it('straight slant-line regression is biased near a strong contrast; the refracted fit is not (Kim, Bang & Kim 2004)', () => {
    const fit = fitLayerModel({ depthsM, timesS: exact, offsetsM: depthsM.map(() => 3), sourceDepthM: 0 }, [4, 8])!;
    // straight-ray least squares of t against slant distance over the 320 m/s layer (5-8 m)
    const xs = [5, 6, 7, 8].map((z) => Math.hypot(3, z));
    const ts = [5, 6, 7, 8].map((z) => layeredRay(model, 0, z, 3).timeS);
    const mx = xs.reduce((a, b) => a + b) / 4;
    const mt = ts.reduce((a, b) => a + b) / 4;
    const slope = xs.reduce((s, x, i) => s + (x - mx) * (ts[i] - mt), 0) / xs.reduce((s, x) => s + (x - mx) ** 2, 0);
    expect(Math.abs(1 / slope - 320) / 320).toBeGreaterThan(0.01);
    expect(Math.abs(fit.layers[1].velocityMps - 320) / 320).toBeLessThan(1e-3);
  });
});
