/**
 * Interval values (velocity/intervals.ts): V = (L_b - L_a) / (t_b - t_a) (ASTM D7400 pseudo interval),
 * the fallback order when the chosen method has no value (common practice: whole-pulse measures
 * first, onset last), the "methods differ" flag against the median of the other waveform methods, and
 * excluded intervals. Paths 10 m and 20 m; dt 50 ms gives 200 m/s exactly.
 */
import { describe, expect, it } from 'vitest';
import { crossCheckSdS, intervalValues, type StationPair } from '../../src/core/velocity/intervals';
import { defaultSettings, emptyEdits, patchSettings } from '../../src/core/settings';
import { intervalKey, stationKey, type IntervalKey, type StationKey } from '../../src/core/keys';
import type { PairDelay, Pick, PickMethod } from '../../src/core/model';
import type { Station } from '../../src/core/survey/stations';

const A = stationKey('r0', 5, 'H1');
const B = stationKey('r0', 6, 'H1');
const K = intervalKey('S', A, B);
const st = (key: StationKey, pathM: number) => ({ key, straightPathM: pathM, flags: [] }) as unknown as Station;
const pair: StationPair = { key: K, wave: 'S', kind: 'pseudo', a: st(A, 10), b: st(B, 20), topM: 5, bottomM: 6 };
const pick = (k: StationKey, method: PickMethod, timeS: number): Pick => ({
  stationKey: k,
  wave: 'S',
  method,
  timeS,
  origin: 'auto',
  snr: 20,
  uncertaintyS: 1e-4,
  flags: [],
});
const delay = (key: IntervalKey, method: 'xcorr' | 'phase', delayS: number): PairDelay => ({
  pairKey: key,
  wave: 'S',
  method,
  delayS,
  coefficient: 0.95,
  uncertaintyS: 1e-4,
  flags: [],
});

function run(picks: Pick[], delays: PairDelay[], edits = emptyEdits()) {
  const byStation = new Map<StationKey, Pick[]>();
  for (const p of picks) byStation.set(p.stationKey, [...(byStation.get(p.stationKey) ?? []), p]);
  return intervalValues({
    pairs: [pair],
    picksByStation: byStation,
    delaysByPair: new Map([[K, delays]]),
    rayFit: new Map(),
    // The cross-correlation delay as the profile method (the catalogue's fallback order starts there;
    // the downhole default became the layer model, which a lone pair never has).
    settings: patchSettings(defaultSettings(), { intervals: { profileMethod: 'xcorr' } }),
    edits,
  });
}

describe('interval values', () => {
  it('xcorr chosen when it is the profile method: 10 m more path in 50 ms is 200 m/s', () => {
    const rows = run([pick(A, 'aic', 0.1), pick(B, 'aic', 0.15)], [delay(K, 'xcorr', 0.05)]);
    const chosen = rows.find((r) => r.chosen)!;
    expect(chosen.method).toBe('xcorr');
    expect(chosen.velocityMps).toBeCloseTo(200, 9);
    expect(chosen.flags).not.toContain('methods differ');
  });
  it('falls back in catalogue order: no xcorr -> zero crossing before peak, trough and onset', () => {
    const picks = [
      pick(A, 'aic', 0.1),
      pick(B, 'aic', 0.15),
      pick(A, 'peak', 0.11),
      pick(B, 'peak', 0.16),
      pick(A, 'zero-crossing', 0.12),
      pick(B, 'zero-crossing', 0.17),
    ];
    const chosen = run(picks, []).find((r) => r.chosen)!;
    expect(chosen.method).toBe('zero-crossing');
    expect(chosen.flags).toContain('fallback from xcorr');
    const onlyOnset = run([pick(A, 'stalta', 0.1), pick(B, 'manual', 0.15)], []).find((r) => r.chosen)!;
    expect(onlyOnset.method).toBe('onset');
  });
  it('flags "methods differ" when the chosen value is more than 10% from the median of the others', () => {
    // Onset and peak say 200 m/s (50 ms); xcorr says 40 ms -> 250 m/s, 25% off.
    const picks = [pick(A, 'aic', 0.1), pick(B, 'aic', 0.15), pick(A, 'peak', 0.11), pick(B, 'peak', 0.16)];
    const chosen = run(picks, [delay(K, 'xcorr', 0.04)]).find((r) => r.chosen)!;
    expect(chosen.velocityMps).toBeCloseTo(250, 9);
    expect(chosen.flags).toContain('methods differ');
    // The phase delay is not in the median: a wild phase value alone raises nothing.
    const quiet = run([], [delay(K, 'xcorr', 0.05), delay(K, 'phase', 0.02)]).find((r) => r.chosen)!;
    expect(quiet.flags).not.toContain('methods differ');
  });
  it("an excluded interval keeps its values but none is chosen; the user's method wins over the default", () => {
    const picks = [pick(A, 'aic', 0.1), pick(B, 'aic', 0.15)];
    const excluded = run(picks, [delay(K, 'xcorr', 0.05)], { ...emptyEdits(), excludedIntervals: [K] });
    expect(excluded.some((r) => r.chosen)).toBe(false);
    expect(excluded.find((r) => r.method === 'xcorr')!.velocityMps).toBeCloseTo(200, 9);
    const own = run(picks, [delay(K, 'xcorr', 0.04)], { ...emptyEdits(), chosenMethod: { [K]: 'onset' } });
    expect(own.find((r) => r.chosen)!.method).toBe('onset');
  });
  it('a non-positive delay gives no velocity and says why', () => {
    const row = run([], [delay(K, 'xcorr', -0.001)]).find((r) => r.method === 'xcorr')!;
    expect(row.velocityMps).toBeNull();
    expect(row.flags).toContain('non-positive delay');
  });
  it('cross-check against the correlation delay: a zero crossing one period (10 ms) late at one station', () => {
    // hand-worked: dt 60 ms against a 50 ms delay, sds 0.1414 ms (two picks of 0.1 ms) and 0.1 ms, beyond
    // 3 combined sds: excess sqrt(10^2 - 9 (0.1414^2 + 0.1^2)) ms = sqrt(100 - 0.27) = 9.98649 ms
    expect(crossCheckSdS(0.06, Math.hypot(1e-4, 1e-4), 0.05, 1e-4)).toBeCloseTo(0.00998649, 7);
    // within 3 combined sds (0.1 ms apart, 3 x 0.2236 ms = 0.67 ms): scatter, 0; just beyond: the excess
    expect(crossCheckSdS(0.0501, 2e-4, 0.05, 1e-4)).toBe(0);
    expect(crossCheckSdS(0.0506, 2e-4, 0.05, 1e-4)).toBe(0);
    expect(crossCheckSdS(0.0508, 2e-4, 0.05, 1e-4)).toBeCloseTo(Math.sqrt(0.8e-3 ** 2 - 9 * 5e-8), 9);
    expect(crossCheckSdS(0.06, 1e-4, Number.NaN, 1e-4)).toBe(0);
    const skipped = [pick(A, 'zero-crossing', 0.12), pick(B, 'zero-crossing', 0.18)];
    const rows = run(skipped, [delay(K, 'xcorr', 0.05)]);
    const zc = rows.find((r) => r.method === 'zero-crossing')!;
    // 10 m / 60 ms = 166.7 m/s against 200 m/s by correlation: the sd (after the kind's scale, 0.5-1) takes a large part of the 33 m/s gap
    expect(zc.velocityMps).toBeCloseTo(166.67, 1);
    expect(zc.velocitySdMps!).toBeGreaterThan(0.4 * (200 - 166.67));
    const agreeing = run([pick(A, 'zero-crossing', 0.12), pick(B, 'zero-crossing', 0.17)], [delay(K, 'xcorr', 0.05)]);
    expect(agreeing.find((r) => r.method === 'zero-crossing')!.velocitySdMps!).toBeLessThan(2);
  });
});
