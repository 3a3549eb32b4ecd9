/**
 * The single way through Borewave: survey + records + settings + user edits -> stations, picks,
 * delays, intervals, profile, stiffness and site summary. The UI, the worker, the command line and the
 * benchmark all call these functions; none re-implements a stage.
 *
 * Three stages so that a pick edit does not redo the heavy work:
 *   prepare()      conditioning and working traces (heavy; worker)
 *   autoPick()     onset/feature picks and pair delays for the whole survey (heavy; worker)
 *   derive()       user edits applied, intervals, profile, stiffness, Vs30, site classes (light; every edit)
 */
import { toErrorInfo, type ErrorInfo } from './errors';
import type { PairDelay, Pick, SoilColumn, Survey, Wave, WaveRecord } from './model';
import { defaultDesignSettings, type Settings, type UserEdits } from './settings';
import {
  intervalKey,
  pickEditKey,
  stationWaveKey,
  type IntervalKey,
  type StationKey,
  type StationWaveKey,
} from './keys';
import {
  EDITABLE_METHODS,
  editableMethodOf,
  isOnsetPick,
  methodApplies,
  methodInfo,
  pickMethodForEdit,
  type EditablePickMethod,
  type IntervalMethod,
} from './catalogue/methods';
import { FIT_SLOT, hasDepthTimeFits, hasDirectVelocities, hasSuccessiveDepths } from './catalogue/testKinds';
import { DOUBTFUL_VP_FLAGS, type IntervalFlag } from './flags';
import { autoPickSurvey, pairDelays, type AutoPickResult, type PickingSettings } from './picking/autopick';
import { buildStations, type Station } from './survey/stations';
import { horizontalDistanceM } from './survey/geometry';
import {
  delayRequests,
  intervalValues,
  pairStations,
  type IntervalValue,
  type StationPair,
} from './velocity/intervals';
import { correctedTimeS, fitLine, intervalVelocitySdMps } from './velocity/formulas';
import { fitLayerModel, fitLayersWithRays, type LayerModelFit, type RayFitResult } from './velocity/rayfit';
import { stiffnessProfile, type StiffnessRow, type VelocityInterval } from './stiffness/profile';
import type { FieldQ } from './stiffness/curves';
import { designResults, type DesignResults } from './stiffness/design';
import { defaultSoilColumn, validateSoilColumn } from './stiffness/stress';
import {
  siteClass,
  timeAveragedVs,
  SITE_CAUTIONS,
  SITE_STANDARDS,
  type SiteClassResult,
  type TimeAveraged,
} from './stiffness/site';
import { siteUncertainty, type SiteUncertainty } from './stiffness/montecarlo';
import { compareProfiles, type ComparisonProfile } from './stiffness/comparison';

export interface Prepared {
  stations: Station[];
  pairs: StationPair[];
  issues: ErrorInfo[];
}

export function prepare(survey: Survey, records: ReadonlyMap<string, WaveRecord>, settings: Settings): Prepared {
  const { stations, issues } = buildStations(survey, records, settings);
  let pairs: StationPair[] = [];
  try {
    pairs = pairStations(survey, stations);
  } catch (e) {
    issues.push(toErrorInfo(e, survey.name));
  }
  return { stations, pairs, issues };
}

function pickingSettings(settings: Settings): PickingSettings {
  return {
    onsetMethod: settings.onsetMethod,
    staS: settings.staS,
    ltaS: settings.ltaS,
    staLtaThreshold: settings.staLtaThreshold,
    phaseBandHz: settings.phaseBandHz,
  };
}

export function autoPick(
  prepared: Prepared,
  settings: Settings,
  onProgress?: (done: number, total: number) => void,
): AutoPickResult {
  return autoPickSurvey(
    prepared.stations.map((s) => s.working),
    delayRequests(prepared.pairs, settings),
    pickingSettings(settings),
    onProgress,
  );
}

/**
 * Downhole (one receiver): when the user excludes a depth, the stations above and below it are paired
 * directly, so the profile keeps a (longer) interval instead of a gap. Pick differences follow from
 * the picks; the delays of the new pair are measured here (two traces, well under a millisecond).
 */
function bridgingPairs(
  survey: Survey,
  prepared: Prepared,
  excluded: ReadonlySet<StationWaveKey>,
  settings: Settings,
  issues: ErrorInfo[],
): { pairs: StationPair[]; delays: PairDelay[] } {
  const pairs: StationPair[] = [];
  const delays: PairDelay[] = [];
  if (!hasSuccessiveDepths(survey) || !excluded.size) return { pairs, delays };
  const existing = new Set(prepared.pairs.map((p) => p.key));
  for (const wave of ['S', 'P'] as Wave[]) {
    const kept = prepared.stations.filter((s) => s.wave === wave && !excluded.has(stationWaveKey(s.key, wave)));
    const receivers = [...new Set(kept.map((s) => s.receiver))];
    for (const r of receivers) {
      const list = kept.filter((s) => s.receiver === r).sort((a, b) => a.depthM - b.depthM);
      for (let i = 0; i + 1 < list.length; i++) {
        const [a, b] = [list[i], list[i + 1]];
        const key = intervalKey(wave, a.key, b.key);
        if (existing.has(key) || b.depthM - a.depthM < 1e-6) continue;
        const pair: StationPair = { key, wave, kind: 'pseudo', a, b, topM: a.depthM, bottomM: b.depthM };
        pairs.push(pair);
        try {
          const [req] = delayRequests([pair], settings);
          for (const d of pairDelays(a.working, b.working, req, pickingSettings(settings)))
            delays.push({ ...d, flags: [...d.flags, 'bridges excluded station'] });
        } catch (e) {
          issues.push(toErrorInfo(e, key));
        }
      }
    }
  }
  return { pairs, delays };
}

export interface DirectVelocity {
  stationKey: StationKey;
  receiver: Station['receiver'];
  wave: Wave;
  depthM: number;
  pathM: number;
  timeS: number;
  velocityMps: number | null;
  velocitySdMps: number | null;
  flags: IntervalFlag[];
}

/**
 * Crosshole direct velocities V = D / (t - t0) with D the 3-D source-receiver distance (deviation
 * surveys) and t0 the trigger delay (ASTM D4428/D4428M). Checks the interval values: a source hole
 * delay or a trigger offset shows up as near-hole direct velocities that disagree with the far hole's.
 */
function directVelocities(
  survey: Survey,
  stations: readonly Station[],
  picks: readonly Pick[],
  settings: Settings,
): DirectVelocity[] {
  if (!hasDirectVelocities(survey.kind)) return [];
  const onset = new Map<StationWaveKey, Pick>();
  for (const p of picks)
    if (p.origin !== 'excluded' && isOnsetPick(p)) onset.set(stationWaveKey(p.stationKey, p.wave), p);
  const out: DirectVelocity[] = [];
  for (const s of stations) {
    const p = onset.get(stationWaveKey(s.key, s.wave));
    if (!p) continue;
    const dt = p.timeS - settings.triggerDelayS;
    const flags: IntervalFlag[] = [...p.flags];
    let v: number | null = null;
    let sd: number | null = null;
    if (!(dt > 0)) flags.push('non-positive time');
    else {
      v = s.straightPathM / dt;
      sd = intervalVelocitySdMps(v, s.straightPathM, Math.SQRT2 * settings.positionSdM, dt, p.uncertaintyS);
      const range = s.wave === 'S' ? settings.vsRangeMps : settings.vpRangeMps;
      if (v < range[0]) flags.push('slow?');
      if (v > range[1]) flags.push('fast?');
    }
    out.push({
      stationKey: s.key,
      receiver: s.receiver,
      wave: s.wave,
      depthM: s.depthM,
      pathM: s.straightPathM,
      timeS: p.timeS,
      velocityMps: v,
      velocitySdMps: sd,
      flags,
    });
  }
  return out;
}

/** One row of the travel-time view: direct times at one station. */
export interface TravelTimeRow {
  stationKey: StationKey;
  receiver: Station['receiver'];
  wave: Wave;
  depthM: number;
  pathM: number;
  /** Time by pick method (s after trigger) and its slant-corrected value. */
  times: Partial<Record<EditablePickMethod, { timeS: number; correctedS: number; origin: Pick['origin'] }>>;
}

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

export interface ProfileRow extends StiffnessRow {
  intervalKey: IntervalKey;
  method: IntervalMethod;
  vpMethod: IntervalMethod | null;
  vpSdMps: number | null;
}

export interface SiteSummary {
  vs30: TimeAveraged | null;
  classes: SiteClassResult[];
  uncertainty: SiteUncertainty | null;
  cautions: string[];
}

export interface Derived {
  /** Effective picks: auto picks with user edits applied; picks of excluded stations carry origin 'excluded'. */
  picks: Pick[];
  delays: PairDelay[];
  intervals: IntervalValue[];
  profile: ProfileRow[];
  travelTimes: TravelTimeRow[];
  /** Crosshole: direct source-to-receiver velocities, V = D / (t - t0) (ASTM D4428), from the onset picks. */
  direct: DirectVelocity[];
  layerFits: LayerFit[];
  rayFit: RayFitResult | null;
  /** Downhole: S layer velocities over the chosen layers from the onset times with refracted rays. */
  layerModel: LayerModelFit | null;
  drift: MethodDrift | null;
  site: SiteSummary;
  comparison: ComparisonResult | null;
  /** Modulus reduction and damping curves per soil layer; the liquefaction screen when shaking is given. */
  design: DesignResults;
  issues: ErrorInfo[];
}

/** Applies the user's pick edits and exclusions to the automatic picks. */
export function effectivePicks(stations: readonly Station[], auto: readonly Pick[], edits: UserEdits): Pick[] {
  const excluded = new Set(edits.excludedStations);
  const byStation = new Map<StationWaveKey, Pick[]>();
  for (const p of auto) {
    const k = stationWaveKey(p.stationKey, p.wave);
    byStation.set(k, [...(byStation.get(k) ?? []), p]);
  }
  const out: Pick[] = [];
  for (const s of stations) {
    const k = stationWaveKey(s.key, s.wave);
    const picks = (byStation.get(k) ?? []).map((p) => ({ ...p, flags: [...p.flags] }));
    for (const m of EDITABLE_METHODS) {
      const t = edits.picks[pickEditKey(s.key, s.wave, m)];
      if (t === undefined || !Number.isFinite(t)) continue;
      const existing = picks.find((p) => editableMethodOf(p) === m);
      if (existing) {
        existing.timeS = t;
        existing.origin = 'edited';
        existing.flags = existing.flags.filter((f) => f !== 'no onset');
      } else {
        picks.push({
          stationKey: s.key,
          wave: s.wave,
          method: pickMethodForEdit(m),
          timeS: t,
          origin: 'edited',
          snr: 0,
          // A hand pick without an automatic one: two samples one-sigma (common practice).
          uncertaintyS: 2 * s.working.sampleIntervalS,
          flags: [],
        });
      }
    }
    if (excluded.has(k)) for (const p of picks) p.origin = 'excluded';
    out.push(...picks);
  }
  return out;
}

function travelTimeRows(survey: Survey, stations: readonly Station[], picks: readonly Pick[]): TravelTimeRow[] {
  const byStation = new Map<StationWaveKey, Pick[]>();
  for (const p of picks)
    byStation.set(stationWaveKey(p.stationKey, p.wave), [
      ...(byStation.get(stationWaveKey(p.stationKey, p.wave)) ?? []),
      p,
    ]);
  return stations.map((s) => {
    const times: TravelTimeRow['times'] = {};
    for (const p of byStation.get(stationWaveKey(s.key, s.wave)) ?? []) {
      const m = editableMethodOf(p);
      if (!m || p.origin === 'excluded') continue;
      const zs = s.sourcePos[2];
      times[m] = {
        timeS: p.timeS,
        correctedS: !hasDepthTimeFits(survey.kind)
          ? p.timeS
          : correctedTimeS(p.timeS, zs, s.receiverPos[2], s.straightPathM),
        origin: p.origin,
      };
    }
    return { stationKey: s.key, receiver: s.receiver, wave: s.wave, depthM: s.depthM, pathM: s.straightPathM, times };
  });
}

/**
 * Layer boundaries for fits: the user's, else the soil column's layer tops and bottom. The user's list
 * is closed by the surface and the deepest station, so "5, 10" gives 0-5, 5-10 and 10-bottom layers.
 */
function layerBoundaries(survey: Survey, settings: Settings, deepestM: number): number[] {
  const inner = settings.layerBoundariesM.length
    ? settings.layerBoundariesM
    : survey.soil.layers
        .map((l) => l.topM)
        .concat(survey.soil.layers.length ? [survey.soil.layers[survey.soil.layers.length - 1].bottomM] : []);
  const top = Math.min(0, ...inner);
  const bottom = Math.max(deepestM, ...inner);
  return [...new Set([top, ...inner, bottom])].sort((a, b) => a - b);
}

/** Refracted-ray layer model of the downhole S onset times over the chosen layers. */
function layerModelFor(
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
  return fitLayerModel(
    {
      depthsM: pts.map((p) => p.z),
      timesS: pts.map((p) => p.t),
      offsetsM: pts.map((p) => p.x),
      sourceDepthM: survey.sourceDepthM,
    },
    layerBoundaries(survey, settings, pts[pts.length - 1].z),
  );
}

/** Travel time against path length, fitted per layer (user boundaries, else the soil layers). */
function layerFits(
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
        velocitySdMps: Number.isFinite(fit.slopeSe) ? fit.slopeSe / (fit.slope * fit.slope) : null,
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
function directTimesFor(
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

function rayFitFor(
  survey: Survey,
  prepared: Prepared,
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  settings: Settings,
): { result: RayFitResult | null; byPair: Map<IntervalKey, { velocityMps: number; sdMps: number }> } {
  const byPair = new Map<IntervalKey, { velocityMps: number; sdMps: number }>();
  if (!hasSuccessiveDepths(survey) || !methodApplies('ray-fit', survey.kind) || !settings.rayFit)
    return { result: null, byPair };
  const method = methodInfo(settings.profileMethod).kind === 'model' ? 'xcorr' : settings.profileMethod;
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
    // First order: s_i ~ dt_i / path_i, so sV = V^2 s_dt / path (s_dt from the picks or the delay used).
    byPair.set(pr.key, { velocityMps: v, sdMps: (v * v * direct[j].timeSdS) / layer.pathInLayerM });
  }
  return { result, byPair };
}

function profileRows(
  survey: Survey,
  intervals: readonly IntervalValue[],
  issues: ErrorInfo[],
): { rows: ProfileRow[]; velocity: VelocityInterval[]; soil: SoilColumn } {
  const chosenS = intervals.filter((r) => r.wave === 'S' && r.chosen).sort((a, b) => a.topM - b.topM);
  const chosenP = intervals.filter((r) => r.wave === 'P' && r.chosen);
  const velocity: VelocityInterval[] = chosenS.map((s) => {
    const p = chosenP.find((q) => Math.abs(q.topM - s.topM) < 1e-6 && Math.abs(q.bottomM - s.bottomM) < 1e-6);
    // A doubtful Vp would give a wrong Poisson's ratio and moduli: it is left out of them, and said so.
    const doubtful = p ? p.flags.filter((f) => DOUBTFUL_VP_FLAGS.has(f)) : [];
    const flags = [...s.flags];
    if (doubtful.length) flags.push(`vp left out (${doubtful.join(', ')})`);
    const useVp = p && !doubtful.length;
    return {
      topM: s.topM,
      bottomM: s.bottomM,
      vsMps: s.velocityMps!,
      vsSdMps: s.velocitySdMps ?? 0,
      vpMps: useVp ? p.velocityMps : null,
      vpSdMps: useVp ? p.velocitySdMps : null,
      flags,
    };
  });
  const fallbackSoil = {
    ...defaultSoilColumn(Math.max(30, ...velocity.map((v) => v.bottomM))),
    waterTableM: survey.soil.waterTableM,
  };
  const soilProblems = survey.soil.layers.length ? validateSoilColumn(survey.soil) : [];
  issues.push(...soilProblems);
  // An unusable soil column must not stop the profile: moduli then use the stated defaults, flagged.
  const soil = survey.soil.layers.length && !soilProblems.length ? survey.soil : fallbackSoil;
  let stiff: StiffnessRow[];
  let usedSoil = soil;
  try {
    stiff = stiffnessProfile(velocity, soil);
  } catch (e) {
    issues.push(toErrorInfo(e, 'soil column'));
    stiff = stiffnessProfile(velocity, fallbackSoil);
    usedSoil = fallbackSoil;
  }
  if (soil === fallbackSoil) for (const r of stiff) r.flags.push('default soil column');
  const rows: ProfileRow[] = stiff.map((r, i) => {
    const s = chosenS[i];
    const p = chosenP.find((q) => Math.abs(q.topM - s.topM) < 1e-6 && Math.abs(q.bottomM - s.bottomM) < 1e-6);
    const vpUsed = velocity[i].vpMps !== null;
    return {
      ...r,
      intervalKey: s.key,
      method: s.method,
      vpMethod: vpUsed ? (p?.method ?? null) : null,
      vpSdMps: velocity[i].vpSdMps,
    };
  });
  return { rows, velocity, soil: usedSoil };
}

type SiteInterval = { topM: number; bottomM: number; vsMps: number; vsSdMps: number };

function siteIntervals(rows: readonly SiteInterval[]): SiteInterval[] {
  return rows
    .filter((v) => v.vsMps > 0)
    .map((v) => ({ topM: v.topM, bottomM: v.bottomM, vsMps: v.vsMps, vsSdMps: v.vsSdMps }));
}

function spreadOf(ivs: SiteInterval[], settings: Settings): SiteUncertainty | null {
  return ivs.length
    ? siteUncertainty(ivs, {
        draws: settings.monteCarloDraws,
        seed: settings.monteCarloSeed,
        toDepthM: 30,
        rule: settings.vs30Rule,
        answers: settings.siteAnswers,
      })
    : null;
}

/**
 * The Monte Carlo spread of Vs30 and class probabilities for a result derived with monteCarlo: false
 * (the UI computes it when the user pauses); the same figures derive() gives with monteCarlo on.
 */
export function siteSpread(derived: Derived, settings: Settings): SiteUncertainty | null {
  return derived.site.vs30 ? spreadOf(siteIntervals(derived.profile), settings) : null;
}

function siteSummary(velocity: readonly VelocityInterval[], settings: Settings, monteCarlo: boolean): SiteSummary {
  const ivs = siteIntervals(velocity);
  const vs30 = ivs.length ? timeAveragedVs(ivs, 30, settings.vs30Rule) : null;
  const classes = vs30 ? SITE_STANDARDS.map((std) => siteClass(std, vs30.vsMps, settings.siteAnswers)) : [];
  const uncertainty = monteCarlo ? spreadOf(ivs, settings) : null;
  return { vs30, classes, uncertainty, cautions: [...SITE_CAUTIONS] };
}

/**
 * Onset-based and correlation-based interval times drift apart with depth when attenuation broadens
 * the pulse (rise time grows about as C t/Q, Gladwin & Stacey 1974 (from memory); shared/domain.md s.3).
 * We fit the cumulative difference (xcorr - onset) against depth: a slope that is positive and large
 * against its standard error, and a total above 1% of the travel time, is a real difference between
 * methods, reported once for the survey so the user chooses knowingly.
 */
export interface MethodDrift {
  /** Slope of the cumulative (xcorr - onset) time difference against depth, s/m. */
  slopeSpM: number;
  slopeSeSpM: number;
  /** Total difference over the depth span, s, and as a share of the total xcorr travel time. */
  totalS: number;
  share: number;
  significant: boolean;
}

function methodDrift(intervals: readonly IntervalValue[]): MethodDrift | null {
  const byKey = new Map<string, { depthM: number; onset?: number; xcorr?: number }>();
  for (const r of intervals) {
    if (r.wave !== 'S' || r.dtS === null || (r.method !== 'onset' && r.method !== 'xcorr')) continue;
    const e = byKey.get(r.key) ?? { depthM: r.bottomM };
    e[r.method] = r.dtS;
    byKey.set(r.key, e);
  }
  const rows = [...byKey.values()]
    .filter((e) => e.onset !== undefined && e.xcorr !== undefined)
    .sort((a, b) => a.depthM - b.depthM);
  if (rows.length < 5) return null;
  let cum = 0;
  let travel = 0;
  const depths: number[] = [];
  const diffs: number[] = [];
  for (const e of rows) {
    cum += e.xcorr! - e.onset!;
    travel += e.xcorr!;
    depths.push(e.depthM);
    diffs.push(cum);
  }
  const fit = fitLine(depths, diffs);
  if (!fit) return null;
  const share = travel > 0 ? cum / travel : 0;
  const significant = fit.slope > 3 * (Number.isFinite(fit.slopeSe) ? fit.slopeSe : Infinity) && Math.abs(share) > 0.01;
  return { slopeSpM: fit.slope, slopeSeSpM: fit.slopeSe, totalS: cum, share, significant };
}

export interface DeriveOptions {
  /** Run the Monte Carlo site uncertainty (default true); the UI defers it while a pick is dragged. */
  monteCarlo?: boolean;
  /** A profile from another test (e.g. surface waves) to compare with. */
  comparison?: ComparisonProfile | null;
  /** Field attenuation (Q) per depth range, when estimated from the waveforms; else the field damping is empty. */
  fieldQ?: readonly FieldQ[];
}

export interface ComparisonResult {
  name: string;
  source: ComparisonProfile['source'];
  /** Time-averaged Vs of the comparison profile to 30 m (or its depth), same rule as ours. */
  vs30: TimeAveraged | null;
  /** Per interval of our profile: our Vs, the comparison's travel-time average over the interval, difference in %. */
  differences: { depthM: number; vsMps: number; comparisonVsMps: number; differencePct: number }[];
}

function comparisonResult(
  cmp: ComparisonProfile,
  velocity: readonly VelocityInterval[],
  settings: Settings,
): ComparisonResult {
  const pts = [...cmp.points].sort((a, b) => a.depthM - b.depthM);
  // Points are step tops; the last step runs to our profile's bottom or 30 m, whichever is deeper.
  const bottomM = Math.max(30, ...velocity.map((v) => v.bottomM), pts.length ? pts[pts.length - 1].depthM + 1 : 0);
  const steps = pts
    .map((p, i) => ({ topM: p.depthM, bottomM: i + 1 < pts.length ? pts[i + 1].depthM : bottomM, vsMps: p.vsMps }))
    .filter((s) => s.bottomM > s.topM);
  return {
    name: cmp.name,
    source: cmp.source,
    vs30: steps.length ? timeAveragedVs(steps, 30, settings.vs30Rule) : null,
    differences: compareProfiles(
      velocity.map((v) => ({ topM: v.topM, bottomM: v.bottomM, vsMps: v.vsMps })),
      cmp,
    ),
  };
}

/** Light stage: everything that follows from the auto picks and the user's edits. */
export function derive(
  survey: Survey,
  prepared: Prepared,
  auto: AutoPickResult,
  edits: UserEdits,
  settings: Settings,
  options: DeriveOptions = {},
): Derived {
  const issues: ErrorInfo[] = [...prepared.issues, ...(auto.problems ?? [])];
  const picks = effectivePicks(prepared.stations, auto.picks, edits);
  const excluded = new Set(edits.excludedStations);
  const bridges = bridgingPairs(survey, prepared, excluded, settings, issues);
  const pairs = prepared.pairs
    .filter((p) => !excluded.has(stationWaveKey(p.a.key, p.wave)) && !excluded.has(stationWaveKey(p.b.key, p.wave)))
    .concat(bridges.pairs)
    .sort((a, b) => (a.wave === b.wave ? 0 : a.wave === 'S' ? -1 : 1) || a.topM - b.topM || a.bottomM - b.bottomM);
  const allDelays = bridges.delays.length ? [...auto.delays, ...bridges.delays] : auto.delays;
  // Say what an exclusion costs: the intervals that touched the station leave the profile (or are bridged).
  for (const key of edits.excludedStations) {
    const lost = prepared.pairs.filter(
      (p) => stationWaveKey(p.a.key, p.wave) === key || stationWaveKey(p.b.key, p.wave) === key,
    );
    if (!lost.length) continue;
    const spans = lost.map((p) => `${p.topM}-${p.bottomM} m`).join(', ');
    const bridge = bridges.pairs.find(
      (b) => lost.some((p) => p.a.key === b.a.key) && lost.some((p) => p.b.key === b.b.key),
    );
    const fate = bridge ? `replaced by ${bridge.topM}-${bridge.bottomM} m` : `left out of the profile`;
    issues.push({
      code: 'STATION_EXCLUDED',
      message: `Station ${key.replace('|', ' (')}) is excluded: ${lost.length === 1 ? 'interval' : 'intervals'} ${spans} ${lost.length === 1 ? 'is' : 'are'} ${fate}.`,
      file: key,
      field: 'excluded',
    });
  }
  const picksByStation = new Map<StationKey, Pick[]>();
  for (const p of picks) {
    if (p.origin === 'excluded') continue;
    picksByStation.set(p.stationKey, [...(picksByStation.get(p.stationKey) ?? []), p]);
  }
  const delaysByPair = new Map<IntervalKey, PairDelay[]>();
  for (const d of allDelays) delaysByPair.set(d.pairKey, [...(delaysByPair.get(d.pairKey) ?? []), d]);
  const kept = prepared.stations.filter((st) => !excluded.has(stationWaveKey(st.key, st.wave)));
  const ray = rayFitFor(survey, { ...prepared, stations: kept, pairs }, picks, allDelays, settings);
  const intervals = intervalValues({ pairs, picksByStation, delaysByPair, rayFit: ray.byPair, settings, edits });
  const travelTimes = travelTimeRows(survey, prepared.stations, picks);
  const { rows: profile, velocity, soil } = profileRows(survey, intervals, issues);
  const design = designResults(profile, soil, settings.design ?? defaultDesignSettings(), options.fieldQ ?? []);
  issues.push(...design.issues);
  const site = siteSummary(velocity, settings, options.monteCarlo ?? true);
  const drift = methodDrift(intervals);
  if (drift?.significant) {
    issues.push({
      code: 'METHOD_DRIFT',
      message: `Onset and cross-correlation interval times drift apart with depth: ${(drift.totalS * 1000).toFixed(2)} ms in all (${(drift.share * 100).toFixed(1)}% of the travel time), as attenuation broadening of the pulse does. Onset-based Vs come out faster; choose the method knowingly.`,
      field: 'method',
    });
  }
  return {
    picks,
    delays: allDelays,
    intervals,
    profile,
    travelTimes,
    direct: directVelocities(survey, prepared.stations, picks, settings),
    layerFits: layerFits(survey, travelTimes, settings, 'onset'),
    rayFit: ray.result,
    layerModel: layerModelFor(survey, prepared.stations, picks, settings),
    drift,
    site,
    comparison: options.comparison ? comparisonResult(options.comparison, velocity, settings) : null,
    design,
    issues,
  };
}

export interface PipelineInput {
  survey: Survey;
  records: ReadonlyMap<string, WaveRecord>;
  settings: Settings;
  edits: UserEdits;
  comparison?: ComparisonProfile | null;
}

export interface PipelineResult {
  prepared: Prepared;
  auto: AutoPickResult;
  derived: Derived;
}

/** The whole pipeline in one call (command line, benchmark, tests). */
export function runPipeline(
  input: PipelineInput,
  onProgress?: (stage: string, done: number, total: number) => void,
): PipelineResult {
  const prepared = prepare(input.survey, input.records, input.settings);
  onProgress?.('prepare', 1, 1);
  const auto = autoPick(prepared, input.settings, (d, t) => onProgress?.('auto-pick', d, t));
  const derived = derive(input.survey, prepared, auto, input.edits, input.settings, {
    comparison: input.comparison ?? null,
  });
  onProgress?.('derive', 1, 1);
  return { prepared, auto, derived };
}
