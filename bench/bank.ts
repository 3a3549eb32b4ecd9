/**
 * The bank of random layered earths (src/core/synth/randomEarth.ts): per test kind, surveys on
 * training seeds (to choose defaults and tune) and held-out seeds (the figures reported). Each survey
 * runs the whole pipeline with default settings; every S interval by every method is compared with the
 * truth: the interval length over the true vertical travel time (docs/true-vs.md), and also with the
 * velocity an onset measures (noise-free attenuated pulse, first reaching 1% of its peak).
 *
 * The layered-model method ('layer-model') is computed here from the pipeline's picks and delays with
 * src/core/velocity/layering.ts until the pipeline carries it.
 */
import type { StationKey } from '../src/core/keys';
import { DEFAULT_CONE_OFFSET_M } from '../src/core/catalogue/testKinds';
import { readWaveFile } from '../src/core/io/readers';
import type { HitDirection, Survey, WaveRecord } from '../src/core/model';
import { mulberry32 } from '../src/core/random';
import { toLegacySurvey } from '../src/core/setup/legacy';
import { inferSetup } from '../src/core/setup/infer';
import { defaultPlacementSettings } from '../src/core/setup/types';
import { makeVariantSurvey } from '../src/core/synth/variants';
import { autoPick, broadeningCorrectionDefault, derive, leadingEdgeDefault, prepare } from '../src/core/pipeline';
import { defaultSettings, emptyEdits } from '../src/core/settings';
import { demoCrossholeHoles, synthesizeSurvey, type SynthGeometry, type SynthOptions } from '../src/core/synth';
import { layerIndexAt, trueVsAt } from '../src/core/synth/earth';
import { renderArrival } from '../src/core/synth/pulse';
import { randomEarth, trueIntervalVsMps, verticalTimeS, verticalTStarS } from '../src/core/synth/randomEarth';
import type { EarthModel } from '../src/core/synth/earth';
import { INTERVAL_METHOD_CATALOGUE, type IntervalMethod, isOnsetPick } from '../src/core/catalogue/methods';
import type { TestKind } from '../src/core/model';
import { calibrationScale, sdScale, withinShare } from '../src/core/velocity/sdCalibration';
import { layerMethod } from '../src/core/velocity/layerMethod';
import { blendIntervals, fitLayering, layerIntervalVs, type TimeObservation } from '../src/core/velocity/layering';
import { INTERCEPT_PRIOR_SD_S, sourceTimeObservation } from '../src/core/velocity/layerMethod';

export type BankKind = 'one-receiver' | 'two-receiver' | 'cone-0.5m' | 'crosshole';
export const BANK_KINDS: BankKind[] = ['one-receiver', 'two-receiver', 'cone-0.5m', 'crosshole'];

/** Prior sd of a per-hit trigger offset uniform on 0-0.5 ms: 0.5 / sqrt(12) ms. */
export const TRIGGER_OFFSET_SD_S = 0.5e-3 / Math.sqrt(12);
const MAX_TRIGGER_OFFSET_S = 0.5e-3;

export interface LayerModelTuning {
  /** Multiplier of the BIC penalty. */
  penaltyScale: number;
  minThicknessM: number;
  /** One-receiver surveys: absolute times from the onset picks or first onset + cumulative xcorr delays. */
  timeSource: 'onset' | 'xcorr';
  /** Floor on the sd of one time or delay, s (pick sds can be optimistic). */
  sdFloorS: number;
  /** Floor of the layer model's model error, share of the layer slowness. */
  modelSdShare: number;
}

/** Chosen on training seeds with bench/tune.ts (BIC penalty x0.5-2, onset or correlation times). */
export const DEFAULT_TUNING: LayerModelTuning = {
  penaltyScale: 1,
  minThicknessM: 1,
  timeSource: 'xcorr',
  sdFloorS: 5e-5,
  modelSdShare: 0.06,
};

export interface IntervalResult {
  method: string;
  topM: number;
  bottomM: number;
  vsMps: number;
  sdMps: number | null;
  trueVsMps: number;
  onsetVsMps: number | null;
}

interface Case {
  kind: BankKind;
  seed: number;
  model: EarthModel;
  /** Drawn layer boundaries (gradient sub-layers not counted), m. */
  boundariesM: number[];
  geometry: SynthGeometry;
  options: SynthOptions;
  /** Field realism of this survey (docs/true-vs.md "The bank"). */
  realism: Realism;
}

function grid(a: number, b: number, step: number): number[] {
  return Array.from({ length: Math.round((b - a) / step) + 1 }, (_, i) => Math.round((a + i * step) * 1000) / 1000);
}

/** What makes a bank survey less tidy than a textbook one. */
export interface Realism {
  /** The probe turns: azimuth random walk (step sd, rad) with a drift that passes the full circle. */
  turning: boolean;
  /** Depth indices with one of the two hits missing, and with no record at all. */
  oneHitAt: number[];
  missingAt: number[];
  /** Records (by index in the synthesized order) with extra noise: peak / noisySnr. */
  noisyRecords: number[];
  noisySnr: number;
}

/** Seismic cone: receiver above the tip, m (the catalogue default). */
const CONE_OFFSET_M = DEFAULT_CONE_OFFSET_M;

function realismFor(kind: BankKind, seed: number, depthCount: number): Realism {
  const rng = mulberry32((seed * 2654435761 + BANK_KINDS.indexOf(kind) * 97) >>> 0);
  const oneHitAt: number[] = [];
  const missingAt: number[] = [];
  // never the first or the last depth, so every survey keeps its depth range
  for (let k = 1; k < depthCount - 1; k++) {
    const u = rng.uniform();
    if (u < 0.04) missingAt.push(k);
    else if (u < 0.12) oneHitAt.push(k);
  }
  const noisyRecords: number[] = [];
  for (let r = 0; r < 2 * depthCount; r++) if (rng.uniform() < 0.06) noisyRecords.push(r);
  const all: Realism = {
    turning: kind !== 'crosshole' && seed % 2 === 1,
    oneHitAt,
    missingAt,
    noisyRecords,
    noisySnr: 4,
  };
  // BANK_REALISM=turning,missing,noisy (diagnostics: which realism costs what); default all
  const only = process.env.BANK_REALISM?.split(',');
  if (!only) return all;
  return {
    turning: only.includes('turning') && all.turning,
    oneHitAt: only.includes('missing') ? oneHitAt : [],
    missingAt: only.includes('missing') ? missingAt : [],
    noisyRecords: only.includes('noisy') ? noisyRecords : [],
    noisySnr: 4,
  };
}

function hitPlanFor(r: Realism, depthCount: number, crosshole: boolean): HitDirection[][] {
  const [a, b]: HitDirection[] = crosshole ? ['up', 'down'] : ['left', 'right'];
  return Array.from({ length: depthCount }, (_, k) =>
    r.missingAt.includes(k) ? [] : r.oneHitAt.includes(k) ? [k % 2 ? a : b] : [a, b],
  );
}

export function bankCase(kind: BankKind, seed: number): Case {
  const step = kind === 'cone-0.5m' ? 0.5 : 1;
  const depthM = kind === 'cone-0.5m' ? 20 : kind === 'crosshole' ? 20 : 25;
  const earth = randomEarth(seed * 7 + BANK_KINDS.indexOf(kind), { depthM, gridStepM: step });
  const rot = ((seed * 37) % 60) / 100 - 0.3; // fixed probe azimuth per survey, -0.3..0.3 rad
  const depths =
    kind === 'crosshole'
      ? grid(1, depthM, 1)
      : kind === 'two-receiver'
        ? grid(1, depthM - 1, 1)
        : kind === 'cone-0.5m'
          ? grid(1, depthM, step) // tip depths; the receiver lies CONE_OFFSET_M above
          : grid(1, depthM, step);
  const realism = realismFor(kind, seed, depths.length);
  const common = {
    seed,
    attenuation: true,
    snr: 25,
    maxTriggerDelayS: MAX_TRIGGER_OFFSET_S,
    pToSRatio: 0.2,
    receiverRotationRad: rot,
    receiverTiltRad: 0.05,
    azimuthWalkSdRad: realism.turning ? 0.3 : null,
    azimuthDriftRad: realism.turning ? 0.25 : 0,
    hitPlan: hitPlanFor(realism, depths.length, kind === 'crosshole'),
  };
  const offset = 2 + ((seed * 13) % 6) / 10; // 2.0-2.5 m
  let geometry: SynthGeometry;
  let options: SynthOptions;
  if (kind === 'crosshole') {
    geometry = { kind: 'crosshole', holes: demoCrossholeHoles(), depthsM: depths };
    options = {
      ...common,
      sampleIntervalS: 2.5e-5,
      samplesPerTrace: 3072,
      firstSampleS: -0.001,
      sFrequencyHz: 300,
      pFrequencyHz: 1500,
    };
  } else {
    geometry =
      kind === 'two-receiver'
        ? { kind: 'downhole-pair', holeId: 'DH1', upperDepthsM: depths, receiverSpacingM: 1, sourceOffsetM: offset }
        : // the cone's records are written and read back through the set-up (seismic-cone kind, tip depths; coneSurvey)
          { kind: 'downhole', holeId: 'DH1', depthsM: depths, sourceOffsetM: offset };
    options = { ...common, sampleIntervalS: 1e-4, samplesPerTrace: 4096, sFrequencyHz: 100, pFrequencyHz: 400 };
  }
  return { kind, seed, model: earth.model, boundariesM: earth.boundariesM, geometry, options, realism };
}

/**
 * A seismic-cone sounding through the real set-up: SEG-2 files named by instrument number in shuffled
 * order with the tip depth in the notes, read back, placed by the set-up (src/core/setup/infer.ts) and
 * turned into a 'seismic-cone' survey whose stations lie coneOffsetM above the logged tips.
 */
function coneSurvey(c: Case): { survey: Survey; records: Map<string, WaveRecord> } {
  if (c.geometry.kind !== 'downhole') throw new Error('cone case without tip depths');
  const v = makeVariantSurvey({
    kind: 'seismic-cone',
    seed: c.seed,
    componentOrder: ['V', 'H1', 'H2'],
    labels: 'receiver-words',
    locations: 'none',
    naming: 'instrument',
    notes: true,
    format: 'seg2',
    depthCount: c.geometry.depthsM.length,
    stepM: 0.5,
    coneOffsetM: CONE_OFFSET_M,
    model: c.model,
    sourceOffsetM: c.geometry.sourceOffsetM,
    synth: { ...c.options, surveyName: `Bank cone ${c.seed}` },
  });
  const recs = v.files.map((f) => {
    const out = readWaveFile(f.bytes, f.name);
    if (!out.ok) throw new Error(out.error.message);
    return { ...out.record, id: f.name };
  });
  const geometry = {
    kind: 'seismic-cone' as const,
    receiverCount: 1 as const,
    receiverSpacingM: 0,
    coneOffsetM: CONE_OFFSET_M,
    receiverHoles: [],
  };
  const setup = inferSetup({ records: recs, geometry, settings: defaultPlacementSettings(), log: null });
  const survey = toLegacySurvey({
    name: `Bank cone ${c.seed}`,
    geometry,
    boreholes: [{ id: 'SC1', collarEastM: 0, collarNorthM: 0, deviation: [] }],
    mainHoleId: 'SC1',
    sourceOffsetM: c.geometry.sourceOffsetM,
    sourceDepthM: 0,
    soil: v.synth.survey.soil,
    records: setup.records,
  });
  return { survey, records: recordsMap(recs) };
}

/** Extra white noise on the chosen records (a bad hit): sd = peak |sample| of the record / snr. */
function addNoise(records: WaveRecord[], r: Realism, seed: number): WaveRecord[] {
  const rng = mulberry32((seed * 40503 + 11) >>> 0);
  return records.map((rec, i) => {
    if (!r.noisyRecords.includes(i)) return rec;
    let peak = 0;
    for (const t of rec.traces) for (const x of t.samples) peak = Math.max(peak, Math.abs(x));
    const sd = peak / r.noisySnr;
    return {
      ...rec,
      traces: rec.traces.map((t) => {
        const samples = new Float32Array(t.samples.length);
        for (let k = 0; k < samples.length; k++) samples[k] = t.samples[k] + sd * rng.normal();
        return { ...t, samples };
      }),
    };
  });
}

/** The survey and its records as the pipeline receives them. */
function surveyOf(c: Case): { survey: Survey; records: Map<string, WaveRecord> } {
  if (c.kind === 'cone-0.5m') {
    const cone = coneSurvey(c);
    const noisy = addNoise([...cone.records.values()], c.realism, c.seed);
    return { survey: cone.survey, records: recordsMap(noisy) };
  }
  const res = synthesizeSurvey(c.model, c.geometry, c.options);
  return { survey: res.survey, records: recordsMap(addNoise(res.records, c.realism, c.seed)) };
}

/** Onset of the noise-free pulse after a vertical path to depth z: first time it reaches 1% of its peak. */
function onsetTimeS(model: EarthModel, z: number, fHz: number): number {
  const tR = verticalTimeS(model, 0, z);
  const tStar = verticalTStarS(model, 0, z);
  const dt = 1e-5;
  const n = 4096;
  const first = tR - 0.005;
  const w = renderArrival(n, dt, first, {
    arrivalS: tR,
    frequencyHz: fHz,
    attenuation: tStar > 0 ? { travelTimeS: tR, q: tR / tStar, referenceHz: fHz } : null,
  });
  let peak = 0;
  for (const x of w) peak = Math.max(peak, Math.abs(x));
  for (let i = 0; i < n; i++) if (Math.abs(w[i]) >= 0.01 * peak) return first + i * dt;
  return tR;
}

function recordsMap(rs: WaveRecord[]): Map<string, WaveRecord> {
  return new Map(rs.map((r) => [r.id, r]));
}

/** A field Q (interval or layer of the layered model) against the forward model's Q over the same span. */
export interface QResult {
  scope: 'interval' | 'layer';
  topM: number;
  bottomM: number;
  /** null where the spectral ratio gave none (reason in the pipeline's result). */
  qS: number | null;
  trueQS: number;
}

export interface SurveyRun {
  kind: BankKind;
  seed: number;
  intervals: IntervalResult[];
  /** Field damping of same-hit surveys (two-receiver, crosshole); empty for one-receiver ones. */
  q: QResult[];
  layerModelNote: string | null;
  layers: number | null;
}

/** A survey run through the pipeline once; the layered model is evaluated on it for each tuning. */
export interface PreparedCase {
  c: Case;
  stations: ReturnType<typeof prepare>['stations'];
  /** The survey's station pairs as prepared (no edits in the bank: the pipeline's pairs). */
  pairs: ReturnType<typeof prepare>['pairs'];
  derived: ReturnType<typeof derive>;
  perMethod: IntervalResult[];
  truthOf: (top: number, bottom: number) => number;
  onsetTruth: (top: number, bottom: number) => number | null;
}

export function prepareCase(c: Case): PreparedCase {
  const res = surveyOf(c);
  // The forward model's positions are exact: no position sd here (in the field the user's adds on top).
  const base = defaultSettings();
  const settings = { ...base, intervals: { ...base.intervals, positionSdM: 0 } };
  const prep = prepare(res.survey, res.records, settings);
  const auto = autoPick(prep, settings);
  const d = derive(res.survey, prep, auto, emptyEdits(), settings, { monteCarlo: false });
  const onsetCache = new Map<number, number>();
  const onsetAt = (z: number) => {
    let t = onsetCache.get(z);
    if (t === undefined) {
      t = onsetTimeS(c.model, z, c.options.sFrequencyHz);
      onsetCache.set(z, t);
    }
    return t;
  };
  const truthOf = (top: number, bottom: number) =>
    // crosshole: the layer at the test depth (the middle of the span the depth stands for), not at the span's top
    c.kind === 'crosshole' ? trueVsAt(c.model, (top + bottom) / 2) : trueIntervalVsMps(c.model, top, bottom);
  const onsetTruth = (top: number, bottom: number) =>
    c.kind === 'crosshole' ? null : (bottom - top) / (onsetAt(bottom) - onsetAt(top));
  const perMethod: IntervalResult[] = [];
  // Same-hit kinds: xcorr delays the other way round from the default (corrected for pulse broadening
  // with the field Q, 'xcorr-bc', or as measured, 'xcorr-raw'), to compare the two
  const bcDefault = broadeningCorrectionDefault(res.survey.kind);
  const bc =
    c.kind === 'two-receiver' || c.kind === 'crosshole'
      ? derive(res.survey, prep, auto, emptyEdits(), settings, {
          monteCarlo: false,
          broadeningCorrection: !bcDefault,
          leadingEdge: false,
        })
      : null;
  const bcRows = (bc?.intervals ?? [])
    .filter((r) => r.method === 'xcorr')
    .map((r) => ({ ...r, method: bcDefault ? 'xcorr-raw' : 'xcorr-bc' }));
  // and on the onset-aligned leading edge the other way round from the default ('xcorr-le' when off by
  // default, 'xcorr-whole' when on), with the joint inversion built on them ('joint-le' / 'joint-whole')
  const leDefault = leadingEdgeDefault(res.survey.kind);
  const le =
    c.kind === 'two-receiver' || c.kind === 'crosshole'
      ? derive(res.survey, prep, auto, emptyEdits(), settings, { monteCarlo: false, leadingEdge: !leDefault })
      : null;
  const leRows = (le?.intervals ?? [])
    .filter((r) => r.method === 'xcorr' || r.method === 'joint')
    .map((r) => ({ ...r, method: `${r.method}-${leDefault ? 'whole' : 'le'}` }));
  for (const r of [...d.intervals, ...bcRows, ...leRows]) {
    if (r.wave !== 'S' || r.velocityMps === null) continue;
    perMethod.push({
      method: r.method,
      topM: r.topM,
      bottomM: r.bottomM,
      vsMps: r.velocityMps,
      sdMps: r.velocitySdMps,
      trueVsMps: truthOf(r.topM, r.bottomM),
      onsetVsMps: onsetTruth(r.topM, r.bottomM),
    });
  }
  return { c, stations: prep.stations, pairs: prep.pairs, derived: d, perMethod, truthOf, onsetTruth };
}

/** The layered-model intervals of a prepared survey for one tuning. */
export function evaluateCase(p: PreparedCase, tuning: LayerModelTuning): SurveyRun {
  const { c, derived: d } = p;
  const out = [...p.perMethod];
  let note: string | null = null;
  let layers: number | null = null;
  if (c.kind !== 'crosshole') {
    const obs = layerObservations(c, p.stations, d, tuning);
    const fit = fitLayering(obs, {
      sourceDepthM: 0,
      mode: 'auto',
      minThicknessM: tuning.minThicknessM,
      intercept: true,
      interceptPriorSdS: INTERCEPT_PRIOR_SD_S,
      penaltyScale: tuning.penaltyScale,
    });
    if (!fit.ok) note = fit.reason;
    else {
      layers = fit.fit.layers.length;
      const rows = d.intervals.filter((r) => r.wave === 'S' && r.method === 'xcorr');
      const lm = rows.map((r) => layerIntervalVs(fit.fit, r.topM, r.bottomM));
      // the interval's own correlation delay; one receiver per hit: its sd includes both hits' trigger offsets
      const pseudo = c.kind !== 'two-receiver';
      const own = rows.map((r) => {
        if (r.velocityMps === null || r.velocitySdMps === null) return { v: null, sd: null };
        const len = r.pathBM - r.pathAM;
        const trig = pseudo ? (r.velocityMps * r.velocityMps * Math.SQRT2 * TRIGGER_OFFSET_SD_S) / len : 0;
        const floor = (r.velocityMps * r.velocityMps * tuning.sdFloorS) / len;
        return { v: r.velocityMps, sd: Math.hypot(r.velocitySdMps, trig, floor) };
      });
      const blend = blendIntervals(
        rows.map((r, i) => ({
          topM: r.topM,
          bottomM: r.bottomM,
          layerVsMps: lm[i].vsMps,
          layerSdMps: lm[i].vsSdMps,
          ownVsMps: own[i].v,
          ownSdMps: own[i].sd,
        })),
        { modelSdShare: tuning.modelSdShare },
      );
      rows.forEach((r, i) => {
        const base = {
          topM: r.topM,
          bottomM: r.bottomM,
          trueVsMps: p.truthOf(r.topM, r.bottomM),
          onsetVsMps: p.onsetTruth(r.topM, r.bottomM),
        };
        // the bench's own copy of the method, for tuning (bench/tune.ts); the pipeline's rows are 'layer-model'
        out.push({ ...base, method: 'layer-model:tuned', vsMps: lm[i].vsMps, sdMps: blend[i].layerWithModelSdMps });
        out.push({ ...base, method: 'layer-blend:tuned', vsMps: blend[i].vsMps, sdMps: blend[i].vsSdMps });
      });
    }
  }
  return { kind: c.kind, seed: c.seed, intervals: out, q: qResults(p), layerModelNote: note, layers };
}

/**
 * True Q over a span: crosshole, the layer's Q at the interval's depth (horizontal rays); downhole, the
 * vertical travel time over t* (the path-averaged Q, 1/Q_eff = sum(h/(V Q)) / sum(h/V)).
 */
function trueQ(c: Case, topM: number, bottomM: number): number {
  if (c.kind === 'crosshole') return c.model.layers[layerIndexAt(c.model, (topM + bottomM) / 2)].qS;
  return verticalTimeS(c.model, topM, bottomM) / verticalTStarS(c.model, topM, bottomM);
}

function qResults(p: PreparedCase): QResult[] {
  const dmp = p.derived.damping;
  return [
    ...dmp.intervals.map((x) => ({
      scope: 'interval' as const,
      topM: x.topM,
      bottomM: x.bottomM,
      qS: x.qS,
      trueQS: trueQ(p.c, x.topM, x.bottomM),
    })),
    ...dmp.layers.map((x) => ({
      scope: 'layer' as const,
      topM: x.topM,
      bottomM: x.bottomM,
      qS: x.qS,
      trueQS: trueQ(p.c, x.topM, x.bottomM),
    })),
  ];
}

/** One survey through the pipeline with default settings: every method as the app gives it. */
export function runCase(c: Case): SurveyRun {
  const p = prepareCase(c);
  const layers = p.derived.layering.fit?.layers.length ?? null;
  const note = c.kind === 'crosshole' ? null : p.derived.layering.reason;
  return { kind: c.kind, seed: c.seed, intervals: p.perMethod, q: qResults(p), layerModelNote: note, layers };
}

type Derived = ReturnType<typeof derive>;
type Stations = ReturnType<typeof prepare>['stations'];

function layerObservations(c: Case, stations: Stations, d: Derived, t: LayerModelTuning): TimeObservation[] {
  const sStations = new Map(stations.filter((s) => s.wave === 'S').map((s) => [s.key, s]));
  const offsetOf = (key: StationKey) => {
    const s = sStations.get(key)!;
    return Math.hypot(s.receiverPos[0] - s.sourcePos[0], s.receiverPos[1] - s.sourcePos[1]);
  };
  const depthOf = (key: StationKey) => sStations.get(key)!.receiverPos[2];
  const onsets = new Map<string, { timeS: number; sdS: number }>();
  for (const p of d.picks)
    if (p.wave === 'S' && (p.method === 'aic' || p.method === 'stalta') && p.origin !== 'excluded')
      onsets.set(p.stationKey, { timeS: p.timeS, sdS: p.uncertaintyS });
  if (c.kind === 'two-receiver') {
    const obs: TimeObservation[] = [];
    // as the app (velocity/layerMethod.ts layerObservations): the shallowest upper receiver's onset as a time from the source
    const firstIv = d.intervals
      .filter((iv) => iv.wave === 'S' && iv.method === 'xcorr')
      .sort((a, b) => depthOf(a.stationA) - depthOf(b.stationA))[0];
    const first = firstIv ? onsets.get(firstIv.stationA) : undefined;
    if (firstIv && first)
      obs.push(
        sourceTimeObservation(
          sStations.get(firstIv.stationA)!,
          { timeS: first.timeS, uncertaintyS: first.sdS },
          TRIGGER_OFFSET_SD_S,
        ),
      );
    for (const iv of d.intervals) {
      if (iv.wave !== 'S' || iv.method !== 'xcorr' || iv.dtS === null) continue;
      const delay = d.delays.find((x) => x.pairKey === iv.key && x.method === 'xcorr');
      obs.push({
        depthAM: depthOf(iv.stationA),
        depthBM: depthOf(iv.stationB),
        offsetM: offsetOf(iv.stationB),
        timeS: iv.dtS,
        sdS: Math.hypot(delay?.uncertaintyS ?? 0, t.sdFloorS),
      });
    }
    return obs;
  }
  // one receiver per hit: absolute times with the per-hit trigger offset as a prior (its mean is the fitted intercept)
  const keys = [...sStations.keys()].sort((a, b) => depthOf(a) - depthOf(b));
  const obs: TimeObservation[] = [];
  if (t.timeSource === 'onset') {
    for (const k of keys) {
      const o = onsets.get(k);
      if (!o) continue;
      obs.push({
        depthAM: null,
        depthBM: depthOf(k),
        offsetM: offsetOf(k),
        timeS: o.timeS,
        sdS: Math.hypot(o.sdS, TRIGGER_OFFSET_SD_S, t.sdFloorS),
      });
    }
    return obs;
  }
  // first onset + cumulative xcorr delays
  const delayInto = new Map<string, { delayS: number; sdS: number }>();
  for (const iv of d.intervals)
    if (iv.wave === 'S' && iv.method === 'xcorr' && iv.dtS !== null) {
      const delay = d.delays.find((x) => x.pairKey === iv.key && x.method === 'xcorr');
      delayInto.set(iv.stationB, { delayS: iv.dtS, sdS: delay?.uncertaintyS ?? 0 });
    }
  let time: number | null = null;
  for (const k of keys) {
    if (time === null) {
      const o = onsets.get(k);
      if (o) time = o.timeS;
    } else {
      const dl = delayInto.get(k);
      if (!dl) break;
      time += dl.delayS;
    }
    if (time !== null)
      obs.push({
        depthAM: null,
        depthBM: depthOf(k),
        offsetM: offsetOf(k),
        timeS: time,
        sdS: Math.hypot(TRIGGER_OFFSET_SD_S, t.sdFloorS),
      });
  }
  return obs;
}

// ---------------------------------------------------------------- figures

function quantile(xs: number[], q: number): number {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
}

export interface MethodFigures {
  n: number;
  medianErrPct: number;
  p90ErrPct: number;
  /** Against the velocity an onset measures. */
  medianErrVsOnsetPct: number | null;
  within1Sd: number | null;
  within2Sd: number | null;
}

function byMethod(runs: SurveyRun[]): Map<string, IntervalResult[]> {
  const by = new Map<string, IntervalResult[]>();
  for (const r of runs) for (const iv of r.intervals) by.set(iv.method, [...(by.get(iv.method) ?? []), iv]);
  return by;
}

export const TEST_KIND: Record<BankKind, TestKind> = {
  'one-receiver': 'downhole',
  'two-receiver': 'downhole-pair',
  'cone-0.5m': 'seismic-cone',
  crosshole: 'crosshole',
};

/**
 * The sd scale per method the training intervals ask for (src/core/velocity/sdCalibration.ts
 * calibrationScale of |error| / sd), as a full scale: the one the app applies now times the further
 * factor. Copied into SD_SCALE there after a change to the error model; the figures use the app's sd as is.
 */
export function sdScales(runs: SurveyRun[], kind: BankKind): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [m, ivs] of byMethod(runs)) {
    const z = ivs.filter((iv) => iv.sdMps && iv.sdMps > 0).map((iv) => Math.abs(iv.vsMps - iv.trueVsMps) / iv.sdMps!);
    const f = calibrationScale(z);
    const applied = m in METHOD_IDS ? sdScale(TEST_KIND[kind], m as IntervalMethod) : 1;
    if (f !== null) out[m] = Math.round(f * applied * 1000) / 1000;
  }
  return out;
}

const METHOD_IDS = Object.fromEntries(INTERVAL_METHOD_CATALOGUE.map((x) => [x.id, true]));

/** Figures per method; sds multiplied by `scales` (default none: the app's sd as it is). */
export function figures(runs: SurveyRun[], scales: Record<string, number> = {}): Record<string, MethodFigures> {
  const by = byMethod(runs);
  const out: Record<string, MethodFigures> = {};
  for (const [m, ivs] of by) {
    const err = ivs.map((iv) => (100 * Math.abs(iv.vsMps - iv.trueVsMps)) / iv.trueVsMps);
    const errOn = ivs
      .filter((iv) => iv.onsetVsMps !== null)
      .map((iv) => (100 * Math.abs(iv.vsMps - iv.onsetVsMps!)) / iv.onsetVsMps!);
    const sc = scales[m] ?? 1;
    const rows = ivs.map((iv) => ({
      errorMps: iv.vsMps - iv.trueVsMps,
      sdMps: iv.sdMps === null ? null : sc * iv.sdMps,
    }));
    const share = (k: number) => withinShare(rows, k);
    const r3 = (x: number) => Math.round(x * 1000) / 1000;
    out[m] = {
      n: ivs.length,
      medianErrPct: r3(quantile(err, 0.5)),
      p90ErrPct: r3(quantile(err, 0.9)),
      medianErrVsOnsetPct: errOn.length ? r3(quantile(errOn, 0.5)) : null,
      within1Sd: share(1) === null ? null : r3(share(1)!),
      within2Sd: share(2) === null ? null : r3(share(2)!),
    };
  }
  return out;
}

export interface QFigures {
  /** Estimates made / spans offered. */
  n: number;
  made: number;
  /** |Q - true Q| / true Q over the estimates made, %. */
  medianErrPct: number | null;
  p90ErrPct: number | null;
}

/** Q recovery per scope (interval, layer) over runs. */
export function qFigures(runs: SurveyRun[]): Record<string, QFigures> {
  const out: Record<string, QFigures> = {};
  for (const scope of ['interval', 'layer'] as const) {
    const all = runs.flatMap((r) => r.q.filter((x) => x.scope === scope));
    if (!all.length) continue;
    const err = all.flatMap((x) => (x.qS === null ? [] : [(100 * Math.abs(x.qS - x.trueQS)) / x.trueQS]));
    const r1 = (x: number) => Math.round(x * 10) / 10;
    out[scope] = {
      n: all.length,
      made: err.length,
      medianErrPct: err.length ? r1(quantile(err, 0.5)) : null,
      p90ErrPct: err.length ? r1(quantile(err, 0.9)) : null,
    };
  }
  return out;
}

export function seeds(split: 'training' | 'held-out', count: number): number[] {
  const base = split === 'training' ? 1000 : 5000;
  return Array.from({ length: count }, (_, i) => base + i);
}

function rowsOf(runs: SurveyRun[], m: string) {
  return runs.flatMap((r) =>
    r.intervals.filter((iv) => iv.method === m).map((iv) => ({ errorMps: iv.vsMps - iv.trueVsMps, sdMps: iv.sdMps })),
  );
}

/** The 95% point of |error| / sd over a method's intervals (null without sds). */
function tailFactor(runs: SurveyRun[], m: string): number | null {
  const z = rowsOf(runs, m).flatMap((r) => (r.sdMps && r.sdMps > 0 ? [Math.abs(r.errorMps) / r.sdMps] : []));
  return z.length ? Math.round(quantile(z, 0.95) * 100) / 100 : null;
}

/** The 95% point of |error| / sd rounded up to 2 decimals (null without sds): the entry of TAIL_K95. */
function tailFactorUp(runs: SurveyRun[], m: string): number | null {
  const z = rowsOf(runs, m).flatMap((r) => (r.sdMps && r.sdMps > 0 ? [Math.abs(r.errorMps) / r.sdMps] : []));
  return z.length ? Math.ceil(quantile(z, 0.95) * 100 - 1e-9) / 100 : null;
}

/** TAIL_K95 as TypeScript, ready to paste into src/core/velocity/sdCalibration.ts. */
export function k95TableSource(table: Record<string, Record<string, number>>): string {
  const key = (x: string) => (/^[a-z]+$/i.test(x) ? x : `'${x}'`);
  const lines = Object.entries(table).map(
    ([kind, row]) =>
      `  ${key(kind)}: { ${Object.entries(row)
        .map(([m, v]) => `${key(m)}: ${v}`)
        .join(', ')} },`,
  );
  return `export const TAIL_K95: Partial<Record<TestKind, Partial<Record<IntervalMethod, number>>>> = {\n${lines.join('\n')}\n};`;
}

function withinOf(runs: SurveyRun[], m: string, k: number): number | null {
  const w = withinShare(rowsOf(runs, m), k);
  return w === null ? null : Math.round(w * 1000) / 1000;
}

export interface BankReport {
  seedsPerSplit: number;
  /** Per kind and method, training and held-out figures (the app's sd). */
  table: Record<string, Record<string, { training: MethodFigures; heldOut: MethodFigures }>>;
  /** Share of intervals with the truth within 1 and 2 sd (the app's sd): held-out, and training beside. */
  calibration: Record<
    string,
    Record<
      string,
      {
        within1Sd: number | null;
        within2Sd: number | null;
        training: { within1Sd: number | null; within2Sd: number | null };
        /**
         * The stated tail: k95 = the 95% point of |error| / sd on the training seeds (2 for a Gaussian),
         * and the held-out share within k95 sd. Above 2 where the errors are heavier-tailed than a scale can mend.
         */
        k95: number | null;
        withinK95: number | null;
      }
    >
  >;
  /** The sd scale the training intervals ask for (full scale; the app's is in velocity/sdCalibration.ts). */
  sdScale: Record<string, Record<string, number>>;
  /**
   * TAIL_K95 for src/core/velocity/sdCalibration.ts: per app test kind and method, the training k95
   * rounded UP to 2 decimals (the range then covers at least the training share). Measured with the app's
   * sd as it is, so it must be measured again after any change to SD_SCALE or the error model.
   */
  k95Table: Record<string, Record<string, number>>;
  /** Default method per kind: lowest median + P90/2 on training seeds. */
  defaultMethod: Record<string, string>;
  layerModelFailures: Record<string, string[]>;
  /** Field Q recovery per kind (same-hit kinds) and scope, training and held-out. */
  qRecovery: Record<string, Record<string, { training: QFigures; heldOut: QFigures }>>;
}

export function bankReport(count: number, kinds = BANK_KINDS): BankReport {
  const rep: BankReport = {
    seedsPerSplit: count,
    table: {},
    calibration: {},
    sdScale: {},
    k95Table: {},
    defaultMethod: {},
    layerModelFailures: {},
    qRecovery: {},
  };
  for (const k of kinds) {
    const train = seeds('training', count).map((s) => runCase(bankCase(k, s)));
    const held = seeds('held-out', count).map((s) => runCase(bankCase(k, s)));
    const scales = sdScales(train, k);
    const qt = qFigures(train);
    const qh = qFigures(held);
    rep.qRecovery[k] = Object.fromEntries(
      Object.keys(qt)
        .filter((sc) => qh[sc])
        .map((sc) => [sc, { training: qt[sc], heldOut: qh[sc] }]),
    );
    const ft = figures(train);
    const fh = figures(held);
    rep.sdScale[k] = scales;
    rep.table[k] = {};
    rep.calibration[k] = {};
    rep.k95Table[TEST_KIND[k]] = {};
    for (const m of Object.keys(ft)) {
      if (!fh[m]) continue;
      rep.table[k][m] = { training: ft[m], heldOut: fh[m] };
      const k95 = tailFactor(train, m);
      rep.calibration[k][m] = {
        within1Sd: fh[m].within1Sd,
        within2Sd: fh[m].within2Sd,
        training: { within1Sd: ft[m].within1Sd, within2Sd: ft[m].within2Sd },
        k95,
        withinK95: k95 === null ? null : withinOf(held, m, k95),
      };
      const k95Up = tailFactorUp(train, m);
      if (k95Up !== null && m in METHOD_IDS) rep.k95Table[TEST_KIND[k]][m] = k95Up;
    }
    const score = (f: MethodFigures) => f.medianErrPct + f.p90ErrPct / 2;
    rep.defaultMethod[k] = Object.entries(ft)
      .filter(([m]) => fh[m] && ft[m].n >= 0.8 * Math.max(...Object.values(ft).map((x) => x.n)))
      .sort((a, b) => score(a[1]) - score(b[1]))[0][0];
    rep.layerModelFailures[k] = [...train, ...held].flatMap((r) =>
      r.layerModelNote ? [`seed ${r.seed}: ${r.layerModelNote}`] : [],
    );
  }
  return rep;
}

export function printBank(rep: BankReport, log: (s: string) => void): void {
  log(
    `\nBank of random layered earths: ${rep.seedsPerSplit} training + ${rep.seedsPerSplit} held-out surveys per kind`,
  );
  log(
    "  |error| of interval Vs against the truth (length / true vertical time), median / P90 %; share within 1 / 2 sd (the app's sd) training | held-out; scale the training seeds ask for",
  );
  for (const [k, rows] of Object.entries(rep.table)) {
    log(`  ${k} (default on training: ${rep.defaultMethod[k]})`);
    for (const [m, r] of Object.entries(rows))
      log(
        `    ${m.padEnd(14)} training ${r.training.medianErrPct.toFixed(2).padStart(6)} / ${r.training.p90ErrPct.toFixed(2).padStart(6)}   held-out ${r.heldOut.medianErrPct.toFixed(2).padStart(6)} / ${r.heldOut.p90ErrPct.toFixed(2).padStart(6)}   vs onset velocity ${r.heldOut.medianErrVsOnsetPct?.toFixed(2) ?? '  -  '}   within 1/2 sd ${r.training.within1Sd ?? '-'}/${r.training.within2Sd ?? '-'} | ${r.heldOut.within1Sd ?? '-'}/${r.heldOut.within2Sd ?? '-'}  (scale ${rep.sdScale[k][m] ?? '-'}; 95% at ${rep.calibration[k][m].k95 ?? '-'} sd, held-out ${rep.calibration[k][m].withinK95 ?? '-'})  n=${r.heldOut.n}`,
      );
    if (rep.layerModelFailures[k].length) log(`    layer model not made: ${rep.layerModelFailures[k].join('; ')}`);
    for (const [sc, r] of Object.entries(rep.qRecovery[k] ?? {}))
      log(
        `    field Q per ${sc.padEnd(8)} |Q error| median / P90 %: training ${r.training.medianErrPct ?? '-'} / ${r.training.p90ErrPct ?? '-'} (${r.training.made}/${r.training.n})   held-out ${r.heldOut.medianErrPct ?? '-'} / ${r.heldOut.p90ErrPct ?? '-'} (${r.heldOut.made}/${r.heldOut.n})`,
      );
  }
  log(
    '\n  TAIL_K95 (training k95 rounded up; paste into src/core/velocity/sdCalibration.ts after the final SD_SCALE):',
  );
  log(k95TableSource(rep.k95Table));
}

/**
 * The pipeline's layered model (velocity/layerMethod.ts) recomputed from a prepared survey's picks and
 * delays with default settings, so a change to the layering is measured without re-picking
 * (bench/shallow.ts, bench/shallow-eval.ts). Its sds are before the kind's scale.
 */
export function layerModelOf(p: PreparedCase): ReturnType<typeof layerMethod> {
  const st = defaultSettings();
  return layerMethod(
    TEST_KIND[p.c.kind],
    0,
    p.pairs,
    p.derived.picks,
    p.derived.delays,
    {
      mode: 'auto',
      boundariesM: [],
      minThicknessM: st.layering.minThicknessM,
      triggerOffsetSdS: st.intervals.triggerOffsetSdS,
    },
    isOnsetPick,
  );
}
