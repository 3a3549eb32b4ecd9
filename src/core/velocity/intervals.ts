/**
 * Pairs of stations and their interval velocities by every method.
 *
 * Pairing rules (ASTM D7400 downhole, D4428 crosshole; docs/methods.md), chosen by the test-kind
 * catalogue (src/core/catalogue/testKinds.ts, pairingRule):
 * - successive (one receiver: downhole, cone): successive depths of the same receiver -> pseudo interval;
 * - same-hit (two receivers: probe, cone): the upper and lower receiver of the same hit -> true interval;
 * - same-depth (crosshole): the near and far receiver holes at the same depth -> crosshole interval.
 * Interval V = (L_b - L_a)/(t_b - t_a), L the straight source-receiver distance (slant distance for a
 * surface source; 3-D distance between deviated positions for crosshole).
 */
import type { DelayRequest, PairDelay, Pick, Survey, TestKind, Wave } from '../model';
import type { Settings, UserEdits } from '../settings';
import type { Station } from '../survey/stations';
import type { IntervalFlag } from '../flags';
import { intervalKey, type IntervalKey, type StationKey } from '../keys';
import { pairingRule } from '../catalogue/testKinds';
import {
  DELAY_METHODS,
  FALLBACK_ORDER,
  PICK_INTERVAL_METHODS,
  methodInfo,
  pickIsMethod,
  profileMethodFor,
  type IntervalMethod,
} from '../catalogue/methods';
import { intervalVelocityMps, intervalVelocitySdMps } from './formulas';
import { intervalTimeSdS, pathModelShare } from './errorModel';
import { range95Mps, sdScale, tailFactor95 } from './sdCalibration';

export type IntervalKind = 'pseudo' | 'true' | 'crosshole';

export interface StationPair {
  key: IntervalKey;
  wave: Wave;
  kind: IntervalKind;
  a: Station;
  b: Station;
  /** Depth span the interval stands for, m. */
  topM: number;
  bottomM: number;
}

export interface IntervalValue {
  key: IntervalKey;
  wave: Wave;
  kind: IntervalKind;
  stationA: StationKey;
  stationB: StationKey;
  topM: number;
  bottomM: number;
  pathAM: number;
  pathBM: number;
  method: IntervalMethod;
  /** Travel-time difference used, s (null when the method gave none). */
  dtS: number | null;
  velocityMps: number | null;
  velocitySdMps: number | null;
  /**
   * The 95% range of the velocity, m/s: velocity -+ k95 x sd (velocity/sdCalibration.ts tailFactor95 for
   * the test kind and method; low end floored at 0); null without an sd. Set once the sd is final.
   */
  low95Mps: number | null;
  high95Mps: number | null;
  chosen: boolean;
  flags: IntervalFlag[];
}

/** Pairs for the survey's test kind (excluded stations already removed by the caller). */
export function pairStations(survey: Survey, stations: readonly Station[]): StationPair[] {
  const pairs: StationPair[] = [];
  const rule = pairingRule(survey);
  for (const wave of ['S', 'P'] as Wave[]) {
    const ws = stations.filter((s) => s.wave === wave);
    if (rule === 'successive') {
      const byReceiver = new Map<string, Station[]>();
      for (const s of ws) byReceiver.set(s.receiver, [...(byReceiver.get(s.receiver) ?? []), s]);
      for (const list of byReceiver.values()) {
        list.sort((x, y) => x.depthM - y.depthM);
        for (let i = 0; i + 1 < list.length; i++) {
          const [a, b] = [list[i], list[i + 1]];
          if (b.depthM - a.depthM < 1e-6) continue;
          pairs.push({
            key: intervalKey(wave, a.key, b.key),
            wave,
            kind: 'pseudo',
            a,
            b,
            topM: a.depthM,
            bottomM: b.depthM,
          });
        }
      }
    } else if (rule === 'same-hit') {
      for (const up of ws.filter((s) => s.receiver === 'r0')) {
        const low = ws.find((s) => s.receiver === 'r1' && Math.abs(s.loggedDepthM - up.loggedDepthM) < 1e-6);
        if (!low) continue;
        pairs.push({
          key: intervalKey(wave, up.key, low.key),
          wave,
          kind: 'true',
          a: up,
          b: low,
          topM: up.depthM,
          bottomM: low.depthM,
        });
      }
    } else {
      const near = ws.filter((s) => s.receiver === 'r0').sort((x, y) => x.depthM - y.depthM);
      const depths = near.map((s) => s.depthM);
      near.forEach((a, i) => {
        const b = ws.find((s) => s.receiver === 'r1' && Math.abs(s.depthM - a.depthM) < 1e-6);
        if (!b) return;
        // A crosshole test depth stands for the span halfway to its neighbours.
        const up =
          i > 0
            ? (depths[i - 1] + a.depthM) / 2
            : Math.max(0, a.depthM - (depths.length > 1 ? (depths[1] - depths[0]) / 2 : 0.5));
        const down =
          i + 1 < depths.length
            ? (depths[i + 1] + a.depthM) / 2
            : a.depthM + (depths.length > 1 ? (depths[i] - depths[i - 1]) / 2 : 0.5);
        pairs.push({ key: intervalKey(wave, a.key, b.key), wave, kind: 'crosshole', a, b, topM: up, bottomM: down });
      });
    }
  }
  return pairs;
}

/** Delay requests for the picking engine: lag bounded by the path difference and the plausible velocities. */
export function delayRequests(pairs: readonly StationPair[], settings: Settings): DelayRequest[] {
  return pairs.map((p) => {
    const dL = Math.max(p.b.straightPathM - p.a.straightPathM, 1e-6);
    const range = p.wave === 'S' ? settings.picking.vsRangeMps : settings.picking.vpRangeMps;
    return { pairKey: p.key, wave: p.wave, a: p.a.key, b: p.b.key, minDelayS: dL / range[1], maxDelayS: dL / range[0] };
  });
}

export interface IntervalInputs {
  pairs: StationPair[];
  /** Effective picks (auto with user edits applied; excluded ones removed). */
  picksByStation: Map<StationKey, Pick[]>;
  delaysByPair: Map<IntervalKey, PairDelay[]>;
  /** Ray-fit interval velocities by pair key (downhole), when computed. */
  rayFit: Map<IntervalKey, { velocityMps: number; sdMps: number }>;
  /** Layered-model interval velocities by pair key (downhole kinds), when computed. */
  layerModel?: Map<IntervalKey, { velocityMps: number; sdMps: number }>;
  /** Joint-inversion interval velocities by pair key (velocity/joint.ts), when computed. */
  joint?: Map<IntervalKey, { velocityMps: number; sdMps: number }>;
  /** Test kind: the profile method falls back to the kind's default where the settings' one does not apply. */
  kind?: TestKind;
  settings: Settings;
  edits: UserEdits;
}

/** Flags that make an interval's own sd (pick or delay scatter) too narrow to describe it. */
export const SD_WIDENING_FLAGS = ['low correlation', 'at lag bound', 'outside lag bound', 'methods differ'];

/**
 * An interval flagged as doubtful gets an sd at least as wide as the spread between the methods
 * (half the range of every method's value), so a bad row cannot enter Vs30 with a pick-only +-2 m/s.
 */
export function widenFlaggedSd(chosen: IntervalValue, rows: readonly IntervalValue[]): void {
  if (chosen.velocityMps === null || !chosen.flags.some((f) => SD_WIDENING_FLAGS.includes(f))) return;
  // A model's value comes from all the times, and its sd already holds this interval's disagreement
  // with its own delay (layering.ts blendIntervals, the local misfit): the spread of the per-interval
  // picks (on a cone 10-50% for onsets and troughs) is not its error. Widening it made 44% of the cone's
  // layer-model sds 5-20 times too wide and the rest too narrow (docs/true-vs.md "Fifth round").
  if (methodInfo(chosen.method).kind === 'model') return;
  const vs = rows.filter((r) => r.velocityMps !== null).map((r) => r.velocityMps!);
  if (vs.length < 2) return;
  const halfRange = (Math.max(...vs) - Math.min(...vs)) / 2;
  if (halfRange > (chosen.velocitySdMps ?? 0)) {
    chosen.velocitySdMps = halfRange;
    chosen.flags.push('sd widened to the method spread');
  }
}

/**
 * Significance of the cross-check (crossCheckSdS), in combined sds: a difference up to 3 sd of the
 * two times is scatter both sds already describe (3 sigma, common practice for a significant
 * difference). Chosen on the bench's training seeds from 1, 2, 3 and 4 (docs/true-vs.md "Seventh
 * round"): at 1 every small steady offset of a pick (a first peak or trough that drifts against the
 * correlation delay under attenuation) became the pick's sd, so |error| / sd sat at 1 for most intervals
 * and nearly all fell within 2 sd (crosshole picks 98-99%); at 3 the tails are closest to the band.
 */
export const CROSS_CHECK_SIGNIFICANCE_SD = 3;

/**
 * The cross-check of a pick method's interval time against the correlation delay of the same pair, s:
 * both see the same two traces (the same trigger offsets), so a difference well beyond what both sds
 * explain is an error of one of them, most often a pick on the wrong cycle of the pulse (a first trough
 * or zero crossing one period late at one station). The pick method's sd takes the excess over
 * CROSS_CHECK_SIGNIFICANCE_SD combined sds (a method-of-moments estimate of its error, as in
 * velocity/layering.ts blendIntervals), so a skipped cycle cannot keep a pick's narrow sd. 0 when they
 * agree within that, or there is no delay.
 */
export function crossCheckSdS(dtS: number, dtSdS: number, delayS: number, delaySdS: number): number {
  if (!Number.isFinite(delayS) || !(delayS > 0)) return 0;
  const k = CROSS_CHECK_SIGNIFICANCE_SD;
  return Math.sqrt(Math.max(0, (dtS - delayS) ** 2 - k * k * (dtSdS ** 2 + delaySdS ** 2)));
}

/** An interval's 95% range from its final sd (after any widening): velocity -+ k95 x sd for its kind and method. */
export function setRange95(r: IntervalValue, kind: TestKind): void {
  const range = range95Mps(r.velocityMps, r.velocitySdMps, tailFactor95(kind, r.method));
  r.low95Mps = range?.lowMps ?? null;
  r.high95Mps = range?.highMps ?? null;
}

/** Every interval by every method, with the chosen one marked and flags set. */
export function intervalValues(inp: IntervalInputs): IntervalValue[] {
  const out: IntervalValue[] = [];
  const { settings, edits } = inp;
  const pathSdM = Math.SQRT2 * settings.intervals.positionSdM;
  for (const pair of inp.pairs) {
    const base = {
      key: pair.key,
      wave: pair.wave,
      kind: pair.kind,
      stationA: pair.a.key,
      stationB: pair.b.key,
      topM: pair.topM,
      bottomM: pair.bottomM,
      pathAM: pair.a.straightPathM,
      pathBM: pair.b.straightPathM,
    };
    const dL = pair.b.straightPathM - pair.a.straightPathM;
    const rows: IntervalValue[] = [];
    const range = pair.wave === 'S' ? settings.picking.vsRangeMps : settings.picking.vpRangeMps;
    const stationFlags: IntervalFlag[] = [...new Set([...pair.a.flags, ...pair.b.flags])];
    // the same pair's correlation delay: the cross-check of the pick methods (crossCheckSdS)
    const xcorr = (inp.delaysByPair.get(pair.key) ?? []).find((x) => x.method === 'xcorr') ?? null;
    const finish = (
      method: IntervalMethod,
      dtS: number | null,
      dtSdS: number,
      extraFlags: IntervalFlag[],
      crossCheck = false,
    ) => {
      const flags: IntervalFlag[] = [...new Set([...stationFlags, ...extraFlags])];
      let v: number | null = null;
      let sd: number | null = null;
      if (dtS !== null) {
        if (!(dtS > 0)) flags.push('non-positive delay');
        else if (!(dL > 0)) flags.push('no path difference');
        else {
          v = intervalVelocityMps(pair.a.straightPathM, pair.b.straightPathM, dtS);
          if (v !== null) {
            // error model (velocity/errorModel.ts): trigger offsets, a floor, the straight-path model; then the kind's scale
            const timeSdS = Math.hypot(
              intervalTimeSdS(dtSdS, pair.kind, pair.a, pair.b, settings.intervals.triggerOffsetSdS),
              crossCheck && xcorr ? crossCheckSdS(dtS, dtSdS, xcorr.delayS, xcorr.uncertaintyS) : 0,
            );
            sd = Math.hypot(
              intervalVelocitySdMps(v, dL, pathSdM, dtS, timeSdS),
              v * pathModelShare(pair.kind, pair.a, pair.b),
            );
            sd *= sdScale(inp.kind ?? 'downhole', method);
            if (v < range[0]) flags.push('slow?');
            if (v > range[1]) flags.push('fast?');
          }
        }
      }
      rows.push({
        ...base,
        method,
        dtS,
        velocityMps: v,
        velocitySdMps: sd,
        low95Mps: null,
        high95Mps: null,
        chosen: false,
        flags,
      });
    };
    const pa = inp.picksByStation.get(pair.a.key) ?? [];
    const pb = inp.picksByStation.get(pair.b.key) ?? [];
    for (const m of PICK_INTERVAL_METHODS) {
      const a = pa.find((p) => pickIsMethod(p, m));
      const b = pb.find((p) => pickIsMethod(p, m));
      if (!a || !b) {
        finish(m, null, 0, ['no pick']);
        continue;
      }
      const flags: IntervalFlag[] = [...new Set([...a.flags, ...b.flags])].filter((f) => f !== 'edited');
      if (a.origin === 'edited' || b.origin === 'edited') flags.push('edited');
      finish(m, b.timeS - a.timeS, Math.hypot(a.uncertaintyS, b.uncertaintyS), flags, true);
    }
    for (const m of DELAY_METHODS) {
      const d = (inp.delaysByPair.get(pair.key) ?? []).find((x) => x.method === m);
      if (!d) {
        if (m === 'xcorr' || settings.picking.phaseBandHz) finish(m, null, 0, ['no delay']);
        continue;
      }
      finish(m, d.delayS, d.uncertaintyS, d.flags);
    }
    for (const [method, table] of [
      ['ray-fit', inp.rayFit],
      ['layer-model', inp.layerModel ?? new Map<IntervalKey, { velocityMps: number; sdMps: number }>()],
      ['joint', inp.joint ?? new Map<IntervalKey, { velocityMps: number; sdMps: number }>()],
    ] as const) {
      const rf = table.get(pair.key);
      if (!rf) continue;
      const flags: IntervalFlag[] = [];
      if (rf.velocityMps < range[0]) flags.push('slow?');
      if (rf.velocityMps > range[1]) flags.push('fast?');
      rows.push({
        ...base,
        method,
        dtS: null,
        velocityMps: rf.velocityMps,
        velocitySdMps: rf.sdMps * sdScale(inp.kind ?? 'downhole', method),
        low95Mps: null,
        high95Mps: null,
        chosen: false,
        flags: [...stationFlags, ...flags],
      });
    }
    // The chosen value: the user's choice for this interval, else the settings' method, else the fallback order.
    const wanted =
      edits.chosenMethod[pair.key] ?? profileMethodFor(settings.intervals.profileMethod, inp.kind ?? 'downhole');
    const valid = (r: IntervalValue) => r.velocityMps !== null;
    let chosen = rows.find((r) => r.method === wanted && valid(r));
    if (!chosen) {
      chosen = FALLBACK_ORDER.map((m) => rows.find((r) => r.method === m && valid(r))).find(Boolean);
      if (chosen) chosen.flags.push(`fallback from ${wanted}`);
    }
    if (chosen && !edits.excludedIntervals.includes(pair.key)) {
      chosen.chosen = true;
      // Compared with the median of the other waveform methods, so one noisy pick does not raise the flag.
      const others = rows
        .filter((r) => r !== chosen && methodInfo(r.method).inDisagreementCheck && valid(r))
        .map((r) => r.velocityMps!);
      if (others.length) {
        others.sort((x, y) => x - y);
        const mid =
          others.length % 2
            ? others[(others.length - 1) / 2]
            : (others[others.length / 2 - 1] + others[others.length / 2]) / 2;
        if (Math.abs(mid - chosen.velocityMps!) > settings.intervals.methodDisagreementShare * chosen.velocityMps!)
          chosen.flags.push('methods differ');
      }
      widenFlaggedSd(chosen, rows);
    }
    for (const r of rows) setRange95(r, inp.kind ?? 'downhole');
    out.push(...rows);
  }
  return out;
}
