/**
 * The pick edit action (core: picking/edits.ts applyPickEdit): the hand time is stored under the
 * station's pick edit key, snapped to the feature when asked, and every interval using the station
 * switches to the edited method in the same step.
 */
import { describe, expect, it } from 'vitest';
import { applyPickEdit } from '../../src/core/picking/edits';
import { snapTimeS } from '../../src/core/picking/snap';
import { emptyEdits } from '../../src/core/settings';
import { intervalKey, pickEditKey, stationKey } from '../../src/core/keys';
import type { WorkingTrace } from '../../src/core/model';

const A = stationKey('r0', 1, 'H1');
const B = stationKey('r0', 2, 'H1');
const C = stationKey('r0', 3, 'H1');
const pairs = [
  { key: intervalKey('S', A, B), wave: 'S' as const, a: { key: A }, b: { key: B } },
  { key: intervalKey('S', B, C), wave: 'S' as const, a: { key: B }, b: { key: C } },
  { key: intervalKey('P', A, B), wave: 'P' as const, a: { key: A }, b: { key: B } },
];

describe('pick edit action', () => {
  it("stores the time and switches only the station's intervals of that wave to the edited method", () => {
    const out = applyPickEdit(emptyEdits(), pairs, { key: A, wave: 'S' }, 'peak', 0.0123);
    expect(out.picks[pickEditKey(A, 'S', 'peak')]).toBe(0.0123);
    expect(out.chosenMethod).toEqual({ [intervalKey('S', A, B)]: 'peak' });
  });
  it('snaps to the first peak of a Ricker wavelet when snap is on (analytic peak at t0)', () => {
    // Ricker wavelet (1 - 2a) exp(-a), a = (pi f (t - t0))^2: its maximum is at t0 (closed form).
    const dt = 5e-5;
    const f = 100;
    const t0 = 0.03;
    const samples = Float64Array.from({ length: 2000 }, (_, i) => {
      const a = (Math.PI * f * (i * dt - t0)) ** 2;
      return (1 - 2 * a) * Math.exp(-a);
    });
    const working: WorkingTrace = {
      stationKey: B,
      wave: 'S',
      samples,
      sampleIntervalS: dt,
      delayS: 0,
      searchStartS: 0,
      searchEndS: 0.09,
    };
    const out = applyPickEdit(emptyEdits(), pairs, { key: B, wave: 'S', working }, 'peak', t0 + 0.0008, true);
    const t = out.picks[pickEditKey(B, 'S', 'peak')];
    expect(t).toBe(snapTimeS(working, 'peak', t0 + 0.0008));
    expect(Math.abs(t - t0)).toBeLessThan(dt);
    expect(Object.keys(out.chosenMethod).sort()).toEqual([intervalKey('S', A, B), intervalKey('S', B, C)].sort());
  });
});
