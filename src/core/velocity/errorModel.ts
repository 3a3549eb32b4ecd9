/**
 * The error model of an interval travel time beyond the scatter a pick or a delay reports itself
 * (docs/true-vs.md "Error model"). Each term is independent and adds in quadrature:
 *
 * - trigger: one receiver per hit (successive depths of a one-receiver probe or a cone) puts two hits'
 *   trigger offsets in every interval time. A station whose working trace combines n hits carries the
 *   mean of n offsets, so the interval gets sd_trig * sqrt(1/nA + 1/nB) (uniform 0-0.5 ms gives
 *   sd_trig = 0.5/sqrt 12 = 0.14 ms). Same-hit intervals (two receivers, crosshole) have none.
 * - floor: a delay is never known better than a share of a sample and of the dominant period (pulse
 *   shape changes between stations under attenuation are not in a white-noise bound): max(dt/2, T/200).
 * - path model: per-interval methods take the straight source-receiver path. With a surface source at
 *   an offset the true refracted ray lies between the straight and the vertical path, so the straight
 *   path difference dL and the vertical one dz bound the path error: relative sd |1 - dL/dz|.
 *
 * Then one scale per test kind and method (velocity/sdCalibration.ts), tuned on training seeds.
 */
import { dominantPeriodS } from '../picking/features';
import type { Station } from '../survey/stations';
import type { IntervalKind } from './intervals';

/** Share of the sample interval and of the dominant period below which no delay sd goes. */
export const FLOOR_SAMPLE_SHARE = 0.5;
export const FLOOR_PERIOD_SHARE = 1 / 200;

/** Distinct hits (records) behind a station's working trace, at least 1. */
export function hitCount(s: Station): number {
  return Math.max(1, new Set((s.hits ?? []).map((h) => h.recordId)).size);
}

/** Trigger-offset sd of an interval time, s: only where the two ends come from different hits. */
export function triggerTermS(kind: IntervalKind, a: Station, b: Station, triggerOffsetSdS: number): number {
  if (kind !== 'pseudo' || !(triggerOffsetSdS > 0)) return 0;
  return triggerOffsetSdS * Math.sqrt(1 / hitCount(a) + 1 / hitCount(b));
}

const periodCache = new WeakMap<Station, number | null>();

/** Dominant period of a station's working trace in its arrival search window, s (null when none). */
export function stationPeriodS(s: Station): number | null {
  if (periodCache.has(s)) return periodCache.get(s)!;
  const w = s.working;
  if (!w) return null;
  const dt = w.sampleIntervalS;
  const n = w.samples.length;
  const i0 = Math.max(0, Math.min(n - 2, Math.floor((w.searchStartS - w.delayS) / dt)));
  const i1 = Math.max(i0 + 2, Math.min(n, Math.ceil((w.searchEndS - w.delayS) / dt)));
  let p: number | null = null;
  try {
    p = dominantPeriodS(w.samples, i0, i1, dt);
  } catch {
    p = null;
  }
  periodCache.set(s, p);
  return p;
}

/** Floor on the sd of an interval time from the two stations' sampling and pulse period, s. */
export function floorTermS(a: Station, b: Station): number {
  const dt = Math.max(a.working?.sampleIntervalS ?? 0, b.working?.sampleIntervalS ?? 0);
  const pa = stationPeriodS(a) ?? 0;
  const pb = stationPeriodS(b) ?? 0;
  return Math.max(FLOOR_SAMPLE_SHARE * dt, FLOOR_PERIOD_SHARE * Math.max(pa, pb));
}

/**
 * Relative sd of a straight-path interval velocity from the path model: |1 - dL/dz| for a source away
 * from the hole (0 for crosshole, where source and receivers share the depth).
 */
export function pathModelShare(kind: IntervalKind, a: Station, b: Station): number {
  if (kind === 'crosshole' || !a.receiverPos || !b.receiverPos) return 0;
  const dz = Math.abs(b.receiverPos[2] - a.receiverPos[2]);
  const dL = b.straightPathM - a.straightPathM;
  if (!(dz > 0) || !(dL > 0)) return 0;
  return Math.abs(1 - dL / dz);
}

/** The interval time sd with the trigger and floor terms, s. */
export function intervalTimeSdS(
  measuredSdS: number,
  kind: IntervalKind,
  a: Station,
  b: Station,
  triggerOffsetSdS: number,
): number {
  return Math.hypot(measuredSdS, triggerTermS(kind, a, b, triggerOffsetSdS), floorTermS(a, b));
}
