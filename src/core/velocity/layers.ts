/**
 * Layer velocities from the direct times: straight-line fits of travel time against path length per
 * layer, the refracted-ray layer model of the S onsets, and the ray fit of successive direct times.
 */
import type { PairDelay, Pick, Survey, Wave } from '../model';
import { userBoundariesM, type Settings } from '../settings';
import type { Station } from '../survey/stations';
import type { IntervalKey } from '../keys';
import {
  editableMethodOf,
  isOnsetPick,
  methodApplies,
  methodInfo,
  type EditablePickMethod,
  type IntervalMethod,
} from '../catalogue/methods';
import { FIT_SLOT, hasDepthTimeFits, hasSuccessiveDepths } from '../catalogue/testKinds';
import { horizontalDistanceM } from '../survey/geometry';
import { fitLine } from './formulas';
import { fitLayerModel, fitLayersWithRays, type LayerModelFit, type RayFitResult } from './rayfit';
import type { StationPair } from './intervals';
import { intervalTimeSdS } from './errorModel';
import { withLayerFloor } from './layerMethod';
import type { TravelTimeRow } from './direct';

export interface LayerFit {
  wave: Wave;
  topM: number;
  bottomM: number;
  method: EditablePickMethod;
  velocityMps: number;
  velocitySdMps: number | null;
  /** The fitted line: time = interceptS + pathM / velocityMps. */
  interceptS: number;
  stations: number;
  rmsResidualS: number;
}

/**
 * Layer boundaries for fits: the user's, else the soil column's layer tops and bottom. The user's list
 * is closed by the surface and the deepest station, so "5, 10" gives 0-5, 5-10 and 10-bottom layers.
 */
export function layerBoundaries(survey: Survey, settings: Settings, deepestM: number): number[] {
  const inner = userBoundariesM(settings).length
    ? userBoundariesM(settings)
    : survey.soil.layers
        .map((l) => l.topM)
        .concat(survey.soil.layers.length ? [survey.soil.layers[survey.soil.layers.length - 1].bottomM] : []);
  const top = Math.min(0, ...inner);
  const bottom = Math.max(deepestM, ...inner);
  return [...new Set([top, ...inner, bottom])].sort((a, b) => a - b);
}

/** Refracted-ray layer model of the downhole S onset times over the chosen layers. */
export function layerModelFor(
  survey: Survey,
  stations: readonly Station[],
  picks: readonly Pick[],
  settings: Settings,
): LayerModelFit | null {
  if (!hasDepthTimeFits(survey.kind)) return null;
  const onset = new Map(
    picks
      .filter((p) => p.wave === 'S' && p.origin !== 'excluded' && isOnsetPick(p))
      .map((p) => [p.stationKey, p.timeS]),
  );
  const pts = stations
    .filter((s) => s.wave === 'S' && onset.has(s.key))
    .map((s) => ({ z: s.receiverPos[2], t: onset.get(s.key)!, x: horizontalDistanceM(s.receiverPos, s.sourcePos) }))
    .sort((a, b) => a.z - b.z);
  if (pts.length < 3) return null;
  const fit = fitLayerModel(
    {
      depthsM: pts.map((p) => p.z),
      timesS: pts.map((p) => p.t),
      offsetsM: pts.map((p) => p.x),
      sourceDepthM: survey.sourceDepthM,
    },
    layerBoundaries(survey, settings, pts[pts.length - 1].z),
  );
  if (!fit) return null;
  return {
    ...fit,
    layers: fit.layers.map((l) => ({
      ...l,
      velocitySdMps: l.velocitySdMps === null ? null : withLayerFloor(l.velocitySdMps, l.velocityMps, survey.kind),
    })),
  };
}

/** Travel time against path length, fitted per layer (user boundaries, else the soil layers). */
export function layerFits(
  survey: Survey,
  rows: readonly TravelTimeRow[],
  settings: Settings,
  method: EditablePickMethod,
): LayerFit[] {
  if (!hasDepthTimeFits(survey.kind)) return [];
  const bounds = layerBoundaries(survey, settings, Math.max(0, ...rows.map((r) => r.depthM)));
  const fits: LayerFit[] = [];
  for (const wave of ['S', 'P'] as Wave[]) {
    const ws = rows.filter((r) => r.wave === wave && r.receiver === FIT_SLOT && r.times[method]);
    for (let i = 0; i + 1 < bounds.length; i++) {
      const inLayer = ws.filter((r) => r.depthM >= bounds[i] - 1e-9 && r.depthM <= bounds[i + 1] + 1e-9);
      const fit = fitLine(
        inLayer.map((r) => r.pathM),
        inLayer.map((r) => r.times[method]!.timeS),
      );
      if (!fit || !(fit.slope > 0)) continue;
      fits.push({
        wave,
        topM: bounds[i],
        bottomM: bounds[i + 1],
        method,
        velocityMps: 1 / fit.slope,
        velocitySdMps: Number.isFinite(fit.slopeSe)
          ? withLayerFloor(fit.slopeSe / (fit.slope * fit.slope), 1 / fit.slope, survey.kind)
          : null,
        interceptS: fit.intercept,
        stations: fit.n,
        rmsResidualS: fit.rmsResidual,
      });
    }
  }
  return fits;
}

/** Direct times of one receiver for the given method: pick times, or (delay methods) the first onset plus cumulative delays. */
/** Direct times of receiver stations in depth order, with the one-sigma uncertainty of each time difference from the station above. */
export function directTimesFor(
  stations: readonly Station[],
  pairs: readonly StationPair[],
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  method: IntervalMethod,
): { station: Station; timeS: number; timeSdS: number }[] {
  const list = stations.filter((s) => s.wave === 'S').sort((a, b) => a.depthM - b.depthM);
  const pickIndex = new Map<string, Pick>();
  for (const p of picks) {
    const m = editableMethodOf(p);
    if (p.wave === 'S' && p.origin !== 'excluded' && m && !pickIndex.has(`${p.stationKey}|${m}`))
      pickIndex.set(`${p.stationKey}|${m}`, p);
  }
  const pickOf = (s: Station, m: EditablePickMethod) => pickIndex.get(`${s.key}|${m}`);
  const pairInto = new Map(pairs.filter((q) => q.wave === 'S').map((q) => [q.b.key, q]));
  const delayOf = new Map(delays.filter((x) => x.method === method).map((x) => [x.pairKey, x]));
  if (methodInfo(method).kind === 'delay') {
    const out: { station: Station; timeS: number; timeSdS: number }[] = [];
    let t: number | null = null;
    for (const s of list) {
      let sd = 0;
      if (t === null) {
        const p = pickOf(s, 'onset');
        if (p) {
          t = p.timeS;
          sd = p.uncertaintyS;
        }
      } else {
        const pr = pairInto.get(s.key);
        const d = pr && delayOf.get(pr.key);
        if (!d) break;
        t += d.delayS;
        sd = d.uncertaintyS;
      }
      if (t !== null) out.push({ station: s, timeS: t, timeSdS: sd });
    }
    return out;
  }
  const m: EditablePickMethod = methodInfo(method).editable ? (method as EditablePickMethod) : 'onset';
  const withPicks = list
    .map((s) => ({ station: s, pick: pickOf(s, m) }))
    .filter((x) => x.pick && Number.isFinite(x.pick.timeS));
  return withPicks.map((x, i) => ({
    station: x.station,
    timeS: x.pick!.timeS,
    timeSdS: i === 0 ? x.pick!.uncertaintyS : Math.hypot(x.pick!.uncertaintyS, withPicks[i - 1].pick!.uncertaintyS),
  }));
}

export function rayFitFor(
  survey: Survey,
  prepared: { stations: readonly Station[]; pairs: readonly StationPair[] },
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  settings: Settings,
): { result: RayFitResult | null; byPair: Map<IntervalKey, { velocityMps: number; sdMps: number }> } {
  const byPair = new Map<IntervalKey, { velocityMps: number; sdMps: number }>();
  if (!hasSuccessiveDepths(survey) || !methodApplies('ray-fit', survey.kind) || !settings.intervals.rayFit)
    return { result: null, byPair };
  const method =
    methodInfo(settings.intervals.profileMethod).kind === 'model' ? 'xcorr' : settings.intervals.profileMethod;
  const direct = directTimesFor(prepared.stations, prepared.pairs, picks, delays, method);
  if (direct.length < 2) return { result: null, byPair };
  const result = fitLayersWithRays({
    depthsM: direct.map((d) => d.station.receiverPos[2]),
    timesS: direct.map((d) => d.timeS),
    offsetsM: direct.map((d) => horizontalDistanceM(d.station.receiverPos, d.station.sourcePos)),
    sourceDepthM: survey.sourceDepthM,
  });
  if (!result) return { result: null, byPair };
  const pairByEnds = new Map(prepared.pairs.filter((p) => p.wave === 'S').map((p) => [`${p.a.key}>${p.b.key}`, p]));
  for (let j = 1; j < direct.length; j++) {
    const pr = pairByEnds.get(`${direct[j - 1].station.key}>${direct[j].station.key}`);
    const layer = result.layers[j];
    if (!pr || layer.outOfOrder || !(layer.pathInLayerM > 0)) continue;
    const v = layer.velocityMps;
    // First order: s_i ~ dt_i / path_i, so sV = V^2 s_dt / path; s_dt from the picks or the delay used with
    // the error model's trigger-offset and floor terms (velocity/errorModel.ts).
    const sdT = intervalTimeSdS(direct[j].timeSdS, pr.kind, pr.a, pr.b, settings.intervals.triggerOffsetSdS);
    byPair.set(pr.key, { velocityMps: v, sdMps: (v * v * sdT) / layer.pathInLayerM });
  }
  return { result, byPair };
}
