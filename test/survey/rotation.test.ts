import { describe, expect, it } from 'vitest';
import { accumulateCov, burstWindow, principalAxis, rotateHorizontals, zeroCov } from '../../src/core/survey/rotation';

// Analytic cases: linear motion along an azimuth a gives the covariance [[c^2, cs], [cs, s^2]] E, whose
// larger eigenvector is (cos a, sin a) (eigen-decomposition of a rank-one 2x2 matrix, any linear-algebra text).
function pulse(n: number): Float64Array {
  return Float64Array.from(
    { length: n },
    (_, i) => Math.sin((2 * Math.PI * i) / 40) * Math.exp(-(((i - 100) / 30) ** 2)),
  );
}

describe('horizontal rotation (analytic)', () => {
  it.each([0, 30, 89, -45, 120])('linear motion at %d deg: axis found modulo 180 deg to 1e-9, linearity 1', (deg) => {
    const a = (deg * Math.PI) / 180;
    const w = pulse(200);
    const h1 = w.map((x) => x * Math.cos(a));
    const h2 = w.map((x) => x * Math.sin(a));
    const { azimuthRad, linearity } = principalAxis(accumulateCov(zeroCov(), h1, h2, 0, 200));
    const diff = Math.abs(Math.sin(azimuthRad - a)); // zero when equal modulo 180 deg
    expect(diff).toBeLessThan(1e-9);
    expect(linearity).toBeCloseTo(1, 9);
    // Rotating to the axis recovers the motion (up to sign); the cross axis holds nothing.
    const on = rotateHorizontals(h1, h2, azimuthRad);
    const across = rotateHorizontals(h1, h2, azimuthRad + Math.PI / 2);
    expect(Math.abs(Math.abs(on[100]) - Math.abs(w[100]))).toBeLessThan(1e-12);
    expect(Math.max(...across.map(Math.abs))).toBeLessThan(1e-12);
  });

  it('circular motion (equal energy on both axes, uncorrelated): linearity 0', () => {
    const n = 400;
    const h1 = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * i) / 40));
    const h2 = Float64Array.from({ length: n }, (_, i) => Math.sin((2 * Math.PI * i) / 40));
    expect(principalAxis(accumulateCov(zeroCov(), h1, h2, 0, n)).linearity).toBeLessThan(1e-9);
  });

  it('burst window: grows from the peak while above 5% of it (a box of 20 samples gives 20 + 2 x 5 padding)', () => {
    const env = new Float64Array(100);
    for (let i = 40; i < 60; i++) env[i] = 1;
    expect(burstWindow(env, 0, 100)).toEqual({ fromIdx: 35, toIdx: 65, peakIdx: 40 });
  });
});
