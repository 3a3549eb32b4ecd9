/**
 * The small SPD solver behind the layer and joint fits, against hand-worked cases (2 x 2 inverse by the
 * adjugate: [[a, b], [b, d]]^-1 = [[d, -b], [-b, a]] / (ad - b^2)).
 */
import { describe, expect, it } from 'vitest';
import { choleskyFactor, solveSpd } from '../../src/core/velocity/linalg';

describe('solveSpd', () => {
  it('[[4, 2], [2, 3]] x = [2, 1]: x = [0.5, 0], inverse [[3, -2], [-2, 4]] / 8', () => {
    const out = solveSpd(new Float64Array([4, 2, 2, 3]), new Float64Array([2, 1]), 2)!;
    expect([...out.x].map((v) => +v.toFixed(12))).toEqual([0.5, 0]);
    expect([...out.inv].map((v) => +v.toFixed(12))).toEqual([0.375, -0.25, -0.25, 0.5]);
  });

  it('Cholesky factor of [[4, 2], [2, 3]] is [[2, 0], [1, sqrt 2]]', () => {
    const l = choleskyFactor(new Float64Array([4, 2, 2, 3]), 2)!;
    expect(l[0]).toBeCloseTo(2, 12);
    expect(l[2]).toBeCloseTo(1, 12);
    expect(l[3]).toBeCloseTo(Math.SQRT2, 12);
    expect(l[1]).toBe(0);
  });

  it('a singular matrix [[1, 1], [1, 1]] (a layer no ray crosses) gives null, not a number', () => {
    expect(solveSpd(new Float64Array([1, 1, 1, 1]), new Float64Array([1, 1]), 2)).toBeNull();
  });
});
