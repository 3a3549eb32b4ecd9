import { describe, expect, it } from 'vitest';
import { reversedDifference, reversedSum, stackTraces } from '../../src/core/signal/stack';
import { BorewaveError } from '../../src/core/errors';
import { gaussianNoise, onsetPulse } from '../picking/helpers';

describe('stackTraces', () => {
  it('is the sample-by-sample mean (definition of a vertical stack)', () => {
    const s = stackTraces([[1, 2, 3], [3, 2, 1], Float32Array.from([2, 5, 8])]);
    expect(Array.from(s)).toEqual([2, 3, 4]);
  });

  it('cuts uncorrelated noise RMS by sqrt(n): 16 hits -> 1/4, within 10% (statistics of a mean)', () => {
    const hits = Array.from({ length: 16 }, (_, k) => gaussianNoise(4000, 1, 100 + k));
    const s = stackTraces(hits);
    const rmsValue = Math.sqrt(s.reduce((a, v) => a + v * v, 0) / s.length);
    expect(rmsValue).toBeGreaterThan(0.25 * 0.9);
    expect(rmsValue).toBeLessThan(0.25 * 1.1);
  });

  it('throws BorewaveError on unequal lengths or nothing to stack', () => {
    expect(() =>
      stackTraces([
        [1, 2],
        [1, 2, 3],
      ]),
    ).toThrow(BorewaveError);
    expect(() =>
      stackTraces([
        [1, 2],
        [1, 2, 3],
      ]),
    ).toThrow(/trace 2 holds 3 samples/);
    expect(() => stackTraces([])).toThrow(BorewaveError);
  });
});

describe('reversed hits (common practice: S reverses with the hit, P and common noise do not)', () => {
  // Left hit: P + S + noise; right hit: P - S + the same noise. Difference keeps S, sum keeps P exactly.
  const n = 800;
  const dt = 1e-4;
  const p = onsetPulse(n, dt, 400, 0.01, 0.3);
  const s = onsetPulse(n, dt, 100, 0.03, 1);
  const noise = gaussianNoise(n, 0.05, 3);
  const left = p.map((v, i) => v + s[i] + noise[i]);
  const right = p.map((v, i) => v - s[i] + noise[i]);

  it('(L - R)/2 recovers the shear pulse to rounding', () => {
    const d = reversedDifference(left, right);
    for (let i = 0; i < n; i++) expect(d[i]).toBeCloseTo(s[i], 12);
  });

  it('(L + R)/2 recovers P plus the common noise to rounding', () => {
    const m = reversedSum(left, right);
    for (let i = 0; i < n; i++) expect(m[i]).toBeCloseTo(p[i] + noise[i], 12);
  });

  it('throws BorewaveError on unequal lengths', () => {
    expect(() => reversedDifference([1, 2], [1])).toThrow(BorewaveError);
    expect(() => reversedSum([1], [1, 2])).toThrow(/must be equal/);
  });
});
