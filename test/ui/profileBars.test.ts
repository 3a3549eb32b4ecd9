/**
 * Vs bars of the Profile plot (src/ui/profileBars.ts): the arms of the 95% range as the core rows give it,
 * asymmetric where the low end is floored at 0, and +-1 sd only where a row has no range.
 * External references: 1 ft = 0.3048 m exactly (NIST SP 811); the arms are hand-worked differences.
 */
import { describe, expect, it } from 'vitest';
import { vsBars } from '../../src/ui/profileBars';

const row = (vsMps: number, vsSdMps: number, low: number | null, high: number | null, midM = 2.5) => ({
  midM,
  vsMps,
  vsSdMps,
  vsLow95Mps: low,
  vsHigh95Mps: high,
});

describe('Vs bars of the profile plot', () => {
  it('200 m/s with range 172.2-227.8 m/s: arms 27.8 either side, at the mid-depth', () => {
    const b = vsBars([row(200, 10, 172.2, 227.8)], 'SI');
    expect(b.range95.x).toEqual([200]);
    expect(b.range95.y).toEqual([2.5]);
    expect(b.range95.plus[0]).toBeCloseTo(27.8, 9);
    expect(b.range95.minus[0]).toBeCloseTo(27.8, 9);
    expect(b.sdOnly.x).toHaveLength(0);
  });

  it('a low end floored at 0 gives unequal arms: 30 m/s, range 0-70 m/s -> 40 up, 30 down', () => {
    const b = vsBars([row(30, 20, 0, 70)], 'SI');
    expect(b.range95.plus[0]).toBeCloseTo(40, 9);
    expect(b.range95.minus[0]).toBeCloseTo(30, 9);
  });

  it('a row without a range keeps +-1 sd, in its own trace', () => {
    const b = vsBars([row(200, 10, 172.2, 227.8), row(250, 12, null, null, 3.5)], 'SI');
    expect(b.range95.x).toEqual([200]);
    expect(b.sdOnly.x).toEqual([250]);
    expect(b.sdOnly.y).toEqual([3.5]);
    expect(b.sdOnly.plus).toEqual([12]);
    expect(b.sdOnly.minus).toEqual([12]);
  });

  it('US units: arms and depth in ft/s and ft with 0.3048 m/ft (NIST SP 811)', () => {
    const b = vsBars([row(200, 10, 172.2, 227.8, 3.048)], 'US');
    expect(b.range95.x[0]).toBeCloseTo(200 / 0.3048, 9);
    expect(b.range95.y[0]).toBeCloseTo(10, 9);
    expect(b.range95.plus[0]).toBeCloseTo(27.8 / 0.3048, 9);
    expect(b.range95.minus[0]).toBeCloseTo(27.8 / 0.3048, 9);
  });
});
