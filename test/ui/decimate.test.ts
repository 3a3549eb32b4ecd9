/**
 * Display decimation (view shaping only). Checked against direct computation: every pixel column keeps
 * its true minimum and maximum, and thinning flat runs never moves the drawn line by more than 2 tol.
 */
import { describe, expect, it } from 'vitest';
import { decimateMinMax, dropFlatRuns } from '../../src/ui/decimate';
import { mulberry32 } from '../../src/core/random';

describe('min/max decimation per pixel column', () => {
  it('keeps each column extreme of a noisy 4,096-sample trace (direct scan as reference)', () => {
    const g = mulberry32(5);
    const x = Float64Array.from({ length: 4096 }, (_, i) => Math.sin(i / 40) + 0.3 * g.normal());
    const dt = 1e-4;
    const d = decimateMinMax(x, 0, dt, 0, 4095 * dt, 400);
    expect(d.length).toBe(800);
    const per = 4096 / 400;
    for (let c = 0; c < 400; c++) {
      const a = Math.floor(c * per);
      const b = Math.floor((c + 1) * per) - 1;
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = a; i <= b; i++) {
        lo = Math.min(lo, x[i]);
        hi = Math.max(hi, x[i]);
      }
      expect(Math.min(d.v[2 * c], d.v[2 * c + 1])).toBe(lo);
      expect(Math.max(d.v[2 * c], d.v[2 * c + 1])).toBe(hi);
      expect(d.t[2 * c]).toBeLessThanOrEqual(d.t[2 * c + 1]);
    }
  });
  it('keeps every sample when there are fewer than three per column', () => {
    const d = decimateMinMax(Float64Array.from([1, 2, 3, 4, 5]), 0.01, 0.001, 0, 1, 100);
    expect(Array.from(d.v)).toEqual([1, 2, 3, 4, 5]);
    expect(d.t[0]).toBeCloseTo(0.01, 15);
  });
});

describe('dropping the inner points of flat runs', () => {
  it('a constant run collapses to its two ends', () => {
    const t = Float64Array.from({ length: 10 }, (_, i) => i);
    const y = new Float64Array(10).fill(2);
    const n = dropFlatRuns(t, y, 10, 0.01);
    expect(n).toBe(2);
    expect([t[0], t[1]]).toEqual([0, 9]);
  });
  it('no dropped point lies more than 2 tol from the polyline through the kept points', () => {
    const g = mulberry32(9);
    const N = 2000;
    const t0 = Float64Array.from({ length: N }, (_, i) => i);
    const y0 = Float64Array.from({ length: N }, (_, i) => (i % 500 < 250 ? 0.001 * g.normal() : Math.sin(i / 7)));
    const t = t0.slice();
    const y = y0.slice();
    const tol = 0.01;
    const n = dropFlatRuns(t, y, N, tol);
    expect(n).toBeLessThan(N * 0.7);
    let k = 0;
    for (let i = 0; i < N; i++) {
      while (k + 1 < n && t[k + 1] < t0[i]) k++;
      const a = k;
      const b = Math.min(k + 1, n - 1);
      const f = t[b] === t[a] ? 0 : (t0[i] - t[a]) / (t[b] - t[a]);
      const line = y[a] + f * (y[b] - y[a]);
      expect(Math.abs(line - y0[i])).toBeLessThanOrEqual(2 * tol);
    }
  });
});
