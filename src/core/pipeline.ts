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
import type { PairDelay, Pick, Survey, TestKind, WaveRecord } from './model';
import type { Settings, UserEdits } from './settings';
import { stationWaveKey, type IntervalKey, type StationKey } from './keys';
import { autoPickSurvey, type AutoPickResult } from './picking/autopick';
import { effectivePicks } from './picking/edits';
import { buildStations, type Station } from './survey/stations';
import type { DepthOrientation } from './survey/orientation';
import { setupChecks, setupIncompleteText, type SetupProblem } from './survey/setup-checks';
import { kindInfo } from './catalogue/testKinds';
import {
  delayRequests,
  intervalValues,
  pairStations,
  type IntervalValue,
  type StationPair,
} from './velocity/intervals';
import { bridgingPairs, gapVelocityFrom } from './velocity/bridging';
import { directVelocities, travelTimeRows, type DirectVelocity, type TravelTimeRow } from './velocity/direct';
import { layerFits, layerModelFor, rayFitFor, type LayerFit } from './velocity/layers';
import type { LayeredFit } from './velocity/layering';
import { layerMethod } from './velocity/layerMethod';
import { jointCorrelation, jointMethod, type JointLayer } from './velocity/joint';
import { sdScale } from './velocity/sdCalibration';
import { isOnsetPick, methodApplies } from './catalogue/methods';
import type { LayerModelFit, RayFitResult } from './velocity/rayfit';
import { methodDrift, type MethodDrift } from './velocity/drift';
import {
  broadeningCorrected,
  fieldDamping,
  fieldQForDesign,
  layerDamping,
  leadingEdgeDelays,
  stackOnLayers,
  type SurveyDamping,
} from './velocity/damping';
import { profileRows, type ProfileRow } from './stiffness/rows';
import { siteIntervals, siteSummary, spreadOf, type SiteSummary } from './site/summary';
import type { SiteUncertainty, SpanCorrelation } from './site/montecarlo';
import type { ComparisonProfile } from './site/comparison';
import { comparisonResult, type ComparisonResult } from './site/compare';
import type { FieldQ } from './stiffness/curves';
import { designResults, type DesignResults } from './stiffness/design';

export type { DirectVelocity, TravelTimeRow } from './velocity/direct';
export type { LayerFit } from './velocity/layers';
export type { MethodDrift } from './velocity/drift';
export type { SurveyDamping, IntervalDamping, LayerDamping } from './velocity/damping';
export type { ProfileRow } from './stiffness/rows';
export type { SiteSummary } from './site/summary';
export type { ComparisonResult } from './site/compare';
export { effectivePicks } from './picking/edits';

export interface Prepared {
  stations: Station[];
  pairs: StationPair[];
  issues: ErrorInfo[];
  /** Hits and horizontal rotation per record depth (inferred from the data where not given). */
  orientation: DepthOrientation[];
}

export function prepare(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
  azimuthDeg: Readonly<Record<string, number>> = {},
): Prepared {
  const { stations, issues, orientation } = buildStations(survey, records, settings, azimuthDeg);
  let pairs: StationPair[] = [];
  try {
    pairs = pairStations(survey, stations);
  } catch (e) {
    issues.push(toErrorInfo(e, survey.name));
  }
  return { stations, pairs, issues, orientation };
}

export function autoPick(
  prepared: Prepared,
  settings: Settings,
  onProgress?: (done: number, total: number) => void,
): AutoPickResult {
  return autoPickSurvey(
    prepared.stations.map((s) => s.working),
    delayRequests(prepared.pairs, settings),
    settings.picking,
    onProgress,
  );
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
  /** Downhole kinds: the layered model behind the 'layer-model' method (automatic or user boundaries), or why there is none. */
  layering: { fit: LayeredFit | null; reason: string | null };
  /** The joint travel-time inversion behind the 'joint' method: per-layer Vs with sd, fit quality, or why there is none. */
  joint: {
    layers: JointLayer[];
    reducedChi2: number | null;
    reason: string | null;
    notes: string[];
    /** Correlation between the chosen joint intervals' Vs (the Vs30 Monte Carlo draws from it). */
    correlation: SpanCorrelation | null;
  };
  drift: MethodDrift | null;
  /** Field Qs and damping D = 1/(2Q) per same-hit interval and per layer (spectral ratio), or why there is none. */
  damping: SurveyDamping;
  site: SiteSummary;
  /** Set-up checks (survey/setup-checks.ts): blocking ones withhold Vs30 and the site classes. */
  setupProblems: SetupProblem[];
  comparison: ComparisonResult | null;
  /** Modulus reduction and damping curves per soil layer; the liquefaction screen when shaking is given. */
  design: DesignResults;
  issues: ErrorInfo[];
}

export interface DeriveOptions {
  /** Run the Monte Carlo site uncertainty (default true); the UI defers it while a pick is dragged. */
  monteCarlo?: boolean;
  /** A profile from another test (e.g. surface waves) to compare with. */
  comparison?: ComparisonProfile | null;
  /** Field attenuation (Q) per depth range, when estimated from the waveforms; else the field damping is empty. */
  fieldQ?: readonly FieldQ[];
  /** Correct same-hit xcorr delays for pulse broadening with the field Q (default: broadeningCorrectionDefault). */
  broadeningCorrection?: boolean;
  /** Measure same-hit xcorr delays on the onset-aligned leading edge (default: leadingEdgeDefault). */
  leadingEdge?: boolean;
}

/**
 * The Monte Carlo spread of Vs30 and class probabilities for a result derived with monteCarlo: false
 * (the UI computes it when the user pauses); the same figures derive() gives with monteCarlo on.
 */
export function siteSpread(derived: Derived, settings: Settings): SiteUncertainty | null {
  if (!derived.site.vs30) return null;
  const ivs = [...siteIntervals(derived.profile), ...derived.site.bridged].sort((a, b) => a.topM - b.topM);
  return spreadOf(ivs, settings, derived.joint.correlation);
}

/**
 * Broadening correction of same-hit xcorr delays with the local Q (inverse-variance 1/Q of the intervals
 * within halfWidthM). Off by default for every kind: on the bank's training seeds (bench/bank.ts, rows
 * 'xcorr-bc') the measured delays were closer to the true vertical times (crosshole median / P90
 * 0.09 / 0.47% as measured against 0.15 / 0.59% corrected; the two-receiver layered model, built on the
 * same delays, 0.66 / 4.7% against 1.9 / 4.8%).
 */
export const BROADENING_CORRECTION: { kinds: readonly TestKind[]; halfWidthM: number } = {
  kinds: [],
  halfWidthM: 2,
};

/**
 * Kinds whose same-hit S correlation delays are measured on the onset-aligned leading edge
 * (velocity/damping.ts leadingEdgeDelays). On the bank's training seeds (6 per kind, median / P90 %):
 * crosshole 0.097 / 0.40 leading edge against 0.138 / 0.49 whole pulse; two receivers 2.02 / 8.76
 * against 1.85 / 8.67 (so not there).
 */
export const LEADING_EDGE_KINDS: readonly TestKind[] = ['crosshole'];

export function leadingEdgeDefault(kind: TestKind): boolean {
  return LEADING_EDGE_KINDS.includes(kind);
}

/**
 * The joint inversion's per-layer Vs sds on the same calibrated scale as its interval sds
 * (velocity/sdCalibration.ts sdScale for the kind and method 'joint'), so site.json and the report
 * state both with one calibration.
 */
export function calibratedJointLayers(kind: TestKind, layers: readonly JointLayer[]): JointLayer[] {
  const k = sdScale(kind, 'joint');
  return layers.map((l) => ({ ...l, vsSdMps: l.vsSdMps * k }));
}

/** Whether derive corrects same-hit xcorr delays for broadening by default for a test kind. */
export function broadeningCorrectionDefault(kind: TestKind): boolean {
  return BROADENING_CORRECTION.kinds.includes(kind);
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
  const measuredDelays = bridges.delays.length ? [...auto.delays, ...bridges.delays] : auto.delays;
  // Field Q of same-hit pairs from the measured delays; then their xcorr delays freed of pulse broadening.
  const damping = fieldDamping(pairs, picks, measuredDelays, null, isOnsetPick);
  const corrected =
    (options.broadeningCorrection ?? broadeningCorrectionDefault(survey.kind))
      ? broadeningCorrected(measuredDelays, damping, BROADENING_CORRECTION.halfWidthM)
      : measuredDelays;
  const allDelays =
    (options.leadingEdge ?? leadingEdgeDefault(survey.kind))
      ? leadingEdgeDelays(pairs, picks, corrected, isOnsetPick)
      : corrected;
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
  const layering = layerMethod(
    survey.kind,
    survey.sourceDepthM,
    pairs,
    picks,
    allDelays,
    {
      mode: settings.layering.mode,
      boundariesM: settings.layering.boundariesM,
      minThicknessM: settings.layering.minThicknessM,
      triggerOffsetSdS: settings.intervals.triggerOffsetSdS,
    },
    isOnsetPick,
  );
  // The layered model never disappears silently: where it cannot be made, say why.
  if (methodApplies('layer-model', survey.kind) && layering.reason)
    issues.push({
      code: 'LAYER_MODEL_NOT_MADE',
      message: `No layered model: ${layering.reason}. Intervals use the other methods.`,
      field: 'layering',
    });
  const joint = jointMethod(
    survey.kind,
    survey.sourceDepthM,
    pairs,
    picks,
    allDelays,
    layering.fit,
    { triggerOffsetSdS: settings.intervals.triggerOffsetSdS },
    isOnsetPick,
  );
  const intervals = intervalValues({
    pairs,
    picksByStation,
    delaysByPair,
    rayFit: ray.byPair,
    layerModel: layering.byPair,
    joint: joint.byPair,
    kind: survey.kind,
    settings,
    edits,
  });
  const travelTimes = travelTimeRows(survey, prepared.stations, picks);
  const { rows: profile, velocity, soil } = profileRows(survey, intervals, issues);
  const dampingLayers =
    layering.fit && damping.intervals.length ? layerDamping(damping.intervals, layering.fit.layers) : [];
  const ownDamping = damping.intervals.map(({ pulse: _pulse, interceptLn: _c, ...rest }) => rest);
  const surveyDamping: SurveyDamping = {
    ...damping,
    // two-receiver intervals take the Q stacked over their layer (one 1 m pair alone is too noisy)
    intervals: survey.kind === 'crosshole' ? ownDamping : stackOnLayers(ownDamping, dampingLayers),
    layers: dampingLayers,
  };
  // Field D beside the laboratory-model Dmin: the Q given by the caller, else the one measured here.
  const design = designResults(profile, soil, settings.design, options.fieldQ ?? fieldQForDesign(surveyDamping));
  issues.push(...design.issues);
  const setupProblems = setupChecks({ survey, orientation: prepared.orientation ?? [], intervals, settings });
  // The chosen S intervals of the joint inversion share one covariance: the Monte Carlo draws them together.
  const jointChosen = intervals.filter((r) => r.chosen && r.wave === 'S' && r.method === 'joint');
  const correlation: SpanCorrelation | null =
    jointChosen.length > 1
      ? {
          spans: jointChosen.map((r) => ({ topM: r.topM, bottomM: r.bottomM })),
          matrix: jointChosen.flatMap((a) =>
            jointChosen.map((b) => (a === b ? 1 : (jointCorrelation(joint, a.key, b.key) ?? 0))),
          ),
        }
      : null;
  const site = siteSummary(
    velocity,
    settings,
    options.monteCarlo ?? true,
    setupIncompleteText(setupProblems),
    kindInfo(survey.kind).sourceInHole ? null : gapVelocityFrom(kept, picks),
    correlation,
  );
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
    layering: { fit: layering.fit, reason: layering.reason },
    joint: {
      layers: calibratedJointLayers(survey.kind, joint.layers),
      reducedChi2: joint.reducedChi2,
      reason: joint.reason,
      notes: joint.notes,
      correlation,
    },
    drift,
    damping: surveyDamping,
    site,
    setupProblems,
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
  const prepared = prepare(input.survey, input.records, input.settings, input.edits.azimuthDeg);
  onProgress?.('prepare', 1, 1);
  const auto = autoPick(prepared, input.settings, (d, t) => onProgress?.('auto-pick', d, t));
  const derived = derive(input.survey, prepared, auto, input.edits, input.settings, {
    comparison: input.comparison ?? null,
  });
  onProgress?.('derive', 1, 1);
  return { prepared, auto, derived };
}
