/**
 * The 'layer-model' interval method: every S interval of a downhole survey (one receiver, two
 * receivers, seismic cone) takes its Vs from the layered refracted-ray model of all travel times
 * (velocity/layering.ts), with an sd, beside the per-interval methods.
 *
 * Travel times used (chosen on the training seeds of the bench's bank of random earths, bench/tune.ts):
 * - one receiver per hit (downhole, cone): absolute times = the first onset plus the cumulative
 *   cross-correlation delays. Each hit's trigger offset is not identifiable from its own data: the
 *   model ABSORBS their mean as a fitted common intercept and takes their scatter as a PRIOR sd per
 *   time (settings.triggerOffsetSdS; uniform 0-0.5 ms gives 0.5/sqrt(12) = 0.14 ms).
 * - two receivers per hit: the cross-correlation delay between the receivers of each hit (no trigger
 *   offset in a difference).
 * Interval sd: the fit's covariance, the spread of a boundary inside its gap, and a model error (how far
 * true intervals depart from their layer's value) estimated from the intervals' own delays, with a floor
 * (velocity/layering.ts blendIntervals); then one scale per test kind tuned on the training seeds so that
 * about 68% of intervals lie within one sd (held-out figures in `npm run bench`).
 */
import { horizontalDistanceM } from '../survey/geometry';
import type { Station } from '../survey/stations';
import type { IntervalKey } from '../keys';
import type { PairDelay, Pick, TestKind } from '../model';
import type { StationPair } from './intervals';
import { blendIntervals, fitLayering, type LayeredFit, layerIntervalVs, type TimeObservation } from './layering';

export interface LayerMethodSettings {
  mode: 'auto' | 'user';
  boundariesM: readonly number[];
  minThicknessM: number;
  triggerOffsetSdS: number;
}

/** Floor on the sd of one time or delay, s (pick and delay sds can be optimistic). Tuned on training seeds. */
const TIME_SD_FLOOR_S = 5e-5;
/** Floor of the model error, share of the layer slowness. Tuned on training seeds. */
const MODEL_SD_SHARE = 0.06;
/** Sd scale per test kind from the training seeds (bench: 0.68 quantile of |error| / sd). */
export const LAYER_MODEL_SD_SCALE: Partial<Record<TestKind, number>> = {
  downhole: 0.26,
  'downhole-pair': 0.15,
  'seismic-cone': 0.34,
};

export interface LayerMethodResult {
  fit: LayeredFit | null;
  /** Why there is no layered model (null when there is one). */
  reason: string | null;
  byPair: Map<IntervalKey, { velocityMps: number; sdMps: number }>;
}

const KINDS = new Set<TestKind>(['downhole', 'downhole-pair', 'seismic-cone']);

/** Observations for the layered fit from the S stations, pairs, onset picks and xcorr delays. */
export function layerObservations(
  kind: TestKind,
  pairs: readonly StationPair[],
  onsetPicks: ReadonlyMap<string, Pick>,
  xcorrByPair: ReadonlyMap<IntervalKey, PairDelay>,
  triggerOffsetSdS: number,
): TimeObservation[] {
  const sPairs = pairs.filter((p) => p.wave === 'S');
  const offsetOf = (s: Station) => horizontalDistanceM(s.receiverPos, s.sourcePos);
  if (kind === 'downhole-pair') {
    const obs: TimeObservation[] = [];
    for (const p of sPairs) {
      const d = xcorrByPair.get(p.key);
      if (!d) continue;
      obs.push({
        depthAM: p.a.receiverPos[2],
        depthBM: p.b.receiverPos[2],
        offsetM: offsetOf(p.b),
        timeS: d.delayS,
        sdS: Math.hypot(d.uncertaintyS, TIME_SD_FLOOR_S),
      });
    }
    return obs;
  }
  // successive depths of one receiver: first onset + cumulative delays, in depth order
  const chain = [...sPairs].sort((x, y) => x.a.receiverPos[2] - y.a.receiverPos[2]);
  if (!chain.length) return [];
  const first = onsetPicks.get(chain[0].a.key);
  if (!first) return [];
  const sd = Math.hypot(triggerOffsetSdS, TIME_SD_FLOOR_S);
  const obs: TimeObservation[] = [
    { depthAM: null, depthBM: chain[0].a.receiverPos[2], offsetM: offsetOf(chain[0].a), timeS: first.timeS, sdS: sd },
  ];
  let t = first.timeS;
  for (const p of chain) {
    const d = xcorrByPair.get(p.key);
    if (!d) break; // a gap in the chain: later times would carry an unknown offset
    t += d.delayS;
    obs.push({ depthAM: null, depthBM: p.b.receiverPos[2], offsetM: offsetOf(p.b), timeS: t, sdS: sd });
  }
  return obs;
}

export function layerMethod(
  kind: TestKind,
  sourceDepthM: number,
  pairs: readonly StationPair[],
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  s: LayerMethodSettings,
  isOnset: (p: Pick) => boolean,
): LayerMethodResult {
  const byPair = new Map<IntervalKey, { velocityMps: number; sdMps: number }>();
  if (!KINDS.has(kind)) return { fit: null, reason: 'not a downhole survey', byPair };
  const onsets = new Map<string, Pick>();
  for (const p of picks) if (p.wave === 'S' && p.origin !== 'excluded' && isOnset(p)) onsets.set(p.stationKey, p);
  const xcorr = new Map<IntervalKey, PairDelay>();
  for (const d of delays) if (d.wave === 'S' && d.method === 'xcorr') xcorr.set(d.pairKey as IntervalKey, d);
  const obs = layerObservations(kind, pairs, onsets, xcorr, s.triggerOffsetSdS);
  if (obs.length < 3)
    return {
      fit: null,
      reason: `only ${obs.length} S travel times (a first onset and correlation delays are needed; 3 or more)`,
      byPair,
    };
  const r = fitLayering(obs, {
    sourceDepthM,
    mode: s.mode,
    boundariesM: [...s.boundariesM],
    minThicknessM: s.minThicknessM,
    intercept: kind !== 'downhole-pair',
  });
  if (!r.ok) return { fit: null, reason: r.reason, byPair };
  const sPairs = pairs.filter((p) => p.wave === 'S');
  const pseudo = kind !== 'downhole-pair';
  const lm = sPairs.map((p) => layerIntervalVs(r.fit, p.a.receiverPos[2], p.b.receiverPos[2]));
  const own = sPairs.map((p) => {
    const d = xcorr.get(p.key);
    const len = p.b.straightPathM - p.a.straightPathM;
    if (!d || !(d.delayS > 0) || !(len > 0)) return { v: null, sd: null };
    const v = len / d.delayS;
    const dtSd = Math.hypot(d.uncertaintyS, pseudo ? Math.SQRT2 * s.triggerOffsetSdS : 0, TIME_SD_FLOOR_S);
    return { v, sd: (v * v * dtSd) / len };
  });
  const blend = blendIntervals(
    sPairs.map((p, i) => ({
      topM: p.topM,
      bottomM: p.bottomM,
      layerVsMps: lm[i].vsMps,
      layerSdMps: lm[i].vsSdMps,
      ownVsMps: own[i].v,
      ownSdMps: own[i].sd,
    })),
    { modelSdShare: MODEL_SD_SHARE },
  );
  const scale = LAYER_MODEL_SD_SCALE[kind] ?? 1;
  sPairs.forEach((p, i) => {
    if (Number.isFinite(lm[i].vsMps) && lm[i].vsMps > 0)
      byPair.set(p.key, { velocityMps: lm[i].vsMps, sdMps: blend[i].layerWithModelSdMps * scale });
  });
  return { fit: r.fit, reason: null, byPair };
}
