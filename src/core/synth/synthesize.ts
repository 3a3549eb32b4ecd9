/**
 * Forward model: synthetic downhole, two-receiver downhole and crosshole records with known
 * arrival times, from a layered earth model (earth.ts) and a test geometry.
 *
 * Physics (documented choices):
 * - Downhole S and P times follow the refracted (Snell's law) ray through flat layers (survey/rays.ts).
 *   Crosshole times use the straight ray between the deviated 3-D source and receiver positions at
 *   the velocity of the layer at the test depth (no refraction along layer boundaries: a head wave
 *   that could be faster near an interface is not modelled).
 * - Amplitude: 1 / ray path length (geometric spreading) times the receiver component's projection
 *   of the particle motion; constant-Q attenuation with the path-averaged Q (1/Q_eff = sum(t_j/Q_j)/t).
 * - Shear particle motion: downhole SH along the beam (north; the source lies east of the hole),
 *   polarity +1 for 'left', -1 for 'right'. Crosshole SV, perpendicular to the ray in its vertical
 *   plane, +1 (down) for 'down', -1 for 'up'. P motion is along the ray, same polarity for both hits.
 * - Receiver axes: nominal H1 (downhole: along the beam; crosshole: radial, away from the source hole),
 *   H2 (horizontal, across), V (down), turned by a small rotation about the vertical and a small tilt
 *   (options), so some S leaks onto H2 and some P onto H1 and V as in the field. Channels: downhole
 *   H1 H2 V per receiver ('R'; two-receiver 'upper' then 'lower'); crosshole V then H1 per receiver
 *   hole (near, far).
 * - Headers: RECEIVER_LOCATION / SOURCE_LOCATION hold the nominal position (hole collar east, north,
 *   depth along the hole); the true deviated positions are in the truth and follow from the survey's
 *   deviation tables. NOTE lines carry "HIT <direction>" and the depth.
 * - Trigger delay: per hit, uniform in [0, maxTriggerDelayS) from the seeded generator; it is ADDED to
 *   every arrival of that record (recorded time = travel time + delay, as in V = D/(t - t0)).
 * - Noise: white Gaussian, per channel, standard deviation = (peak |S| over the record's channels) / snr.
 */
import { receiverSlot } from '../keys';
import { DEFAULT_CONE_OFFSET_M } from '../catalogue/testKinds';
import { BorewaveError } from '../errors';
import type {
  Borehole,
  ChannelAssignment,
  Component,
  HitDirection,
  RecordAssignment,
  Survey,
  TestKind,
  Trace,
  WaveRecord,
} from '../model';
import { traceRay } from '../survey/rays';
import {
  modelSegments,
  soilColumnFromModel,
  trueQAt,
  trueVpAt,
  trueVsAt,
  validateEarthModel,
  type EarthModel,
  type ModelSegment,
} from './earth';
import { mulberry32, type Prng } from '../random';
import { positionAlongHole } from '../survey/geometry';
import { renderArrival, type ConstantQ } from './pulse';

type Vec3 = [number, number, number]; // east, north, down (m)

export interface DownholeGeometry {
  kind: 'downhole';
  holeId: string;
  /** Receiver depths, m. */
  depthsM: number[];
  /** Horizontal source offset from the hole collar (source lies east of the hole), m. */
  sourceOffsetM: number;
  sourceDepthM?: number;
}

export interface PairGeometry {
  kind: 'downhole-pair';
  holeId: string;
  /** Depths of the upper receiver, m; the lower one is receiverSpacingM deeper. */
  upperDepthsM: number[];
  receiverSpacingM: number;
  sourceOffsetM: number;
  sourceDepthM?: number;
}

export interface CrossholeGeometry {
  kind: 'crosshole';
  /** Source hole, near receiver hole, far receiver hole (collars and deviation surveys). */
  holes: [Borehole, Borehole, Borehole];
  /** Test depths (along-hole; source and receivers at the same depth), m. */
  depthsM: number[];
}

export type SynthGeometry = DownholeGeometry | PairGeometry | CrossholeGeometry;

export interface SynthOptions {
  seed: number;
  sampleIntervalS: number;
  samplesPerTrace: number;
  /** Time of the first sample after the trigger (SEG-2 DELAY), s; default 0. */
  firstSampleS?: number;
  sFrequencyHz: number;
  pFrequencyHz: number;
  /** P source amplitude relative to S (default 0.2). */
  pToSRatio?: number;
  /** Constant-Q attenuation on (true) or off (the pulse keeps its exact shape). */
  attenuation: boolean;
  /** Peak |S| / noise standard deviation; null = no noise. */
  snr: number | null;
  /** Upper bound of the random trigger delay per hit, s (0 = none). */
  maxTriggerDelayS: number;
  /** Receiver rotation about the vertical, rad (default 0.1). */
  receiverRotationRad?: number;
  /**
   * Turning probe: the receiver azimuth random-walks from depth to depth (downhole kinds) with this
   * step standard deviation, rad, from a uniformly random start over the full circle; null/absent =
   * the fixed receiverRotationRad. Two receivers on one probe turn together (the lower 0.4 rad apart).
   */
  azimuthWalkSdRad?: number | null;
  /** Mean turn per depth step of the turning probe, rad (a cable that twists one way); default 0. */
  azimuthDriftRad?: number;
  /** Hits recorded at each depth (by depth index); absent = one 'left' then one 'right' (crosshole 'up', 'down'). */
  hitPlan?: HitDirection[][];
  /** Receiver tilt, rad (default 0.05). */
  receiverTiltRad?: number;
  /** S amplitude at 1 m path before attenuation (default 1000). */
  sourceAmplitude?: number;
  /** Prefix of record ids (default dh, dhp, xh by kind). */
  filePrefix?: string;
  surveyName?: string;
}

export interface ChannelTruth {
  channel: number;
  receiver: string;
  component: Component;
  /** Arrival times after the trigger (travel time + trigger delay), s. */
  sArrivalS: number;
  pArrivalS: number;
  /** Trigger-free travel times, s. */
  sTravelS: number;
  pTravelS: number;
  /** Ray path lengths, m (crosshole: the 3-D straight distance). */
  sPathM: number;
  pPathM: number;
  /** Signed amplitude of each wave on this channel before attenuation (spreading, projection, polarity). */
  sAmplitude: number;
  pAmplitude: number;
  /** Path-averaged quality factors. */
  qEffS: number;
  qEffP: number;
  /** Receiver position (east, north, depth), m. */
  receiverPositionM: Vec3;
  /** Receiver rotation about the vertical, rad (nominal H1 turned toward nominal H2). */
  receiverRotationRad: number;
}

export interface RecordTruth {
  recordId: string;
  depthM: number;
  hit: HitDirection;
  triggerDelayS: number;
  /** Standard deviation of the added noise (0 when off). */
  noiseStd: number;
  sourcePositionM: Vec3;
  channels: ChannelTruth[];
}

export interface SynthTruth {
  kind: TestKind;
  records: RecordTruth[];
}

export interface SynthResult {
  survey: Survey;
  records: WaveRecord[];
  truth: SynthTruth;
}

// ---------------------------------------------------------------- small vector helpers

function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}
function scale3(a: Vec3, k: number): Vec3 {
  return [a[0] * k, a[1] * k, a[2] * k];
}
function add3(a: Vec3, b: Vec3): Vec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}
function sub3(a: Vec3, b: Vec3): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}
function norm3(a: Vec3): number {
  return Math.sqrt(dot(a, a));
}
function unit3(a: Vec3): Vec3 {
  return scale3(a, 1 / norm3(a));
}

/** Receiver axes (H1, H2, V) in world coordinates: nominal horizontal H1, rotated by rot about the vertical, tilted by tilt in the H1-V plane. */
export function receiverAxes(nominalH1: Vec3, rotationRad: number, tiltRad: number): { H1: Vec3; H2: Vec3; V: Vec3 } {
  const h1 = unit3(nominalH1);
  const h2: Vec3 = [-h1[1], h1[0], 0];
  const down: Vec3 = [0, 0, 1];
  const r1 = add3(scale3(h1, Math.cos(rotationRad)), scale3(h2, Math.sin(rotationRad)));
  const r2 = add3(scale3(h1, -Math.sin(rotationRad)), scale3(h2, Math.cos(rotationRad)));
  return {
    H1: add3(scale3(r1, Math.cos(tiltRad)), scale3(down, Math.sin(tiltRad))),
    H2: r2,
    V: add3(scale3(r1, -Math.sin(tiltRad)), scale3(down, Math.cos(tiltRad))),
  };
}

/** True position (east, north, vertical depth) of the point at an along-hole depth (survey/geometry.ts rules). */
export function holePositionAt(hole: Borehole, depthAlongM: number): Vec3 {
  return positionAlongHole(hole, depthAlongM).pos;
}

// ---------------------------------------------------------------- rays

interface WavePath {
  timeS: number;
  pathM: number;
  qEff: number;
  /** Unit propagation direction at the receiver (east, north, down). */
  directionAtReceiver: Vec3;
}

/** Path-averaged Q: t / sum(t_j / Q_j) (attenuation operators multiply along the path). */
function effectiveQ(segs: readonly ModelSegment[], segmentPathM: readonly number[], timeS: number): number {
  let tOverQ = 0;
  segs.forEach((s, j) => {
    tOverQ += segmentPathM[j] / s.velocityMps / s.q;
  });
  return tOverQ > 0 ? timeS / tOverQ : Infinity;
}

/**
 * Refracted ray from a source at (offsetM east of the hole, sourceDepthM) to a receiver in the hole at
 * receiverDepthM, through the model's layers (water table included for P).
 */
export function downholePath(
  model: EarthModel,
  wave: 'S' | 'P',
  sourceDepthM: number,
  receiverDepthM: number,
  offsetM: number,
): WavePath {
  const segs = modelSegments(model, wave, sourceDepthM, receiverDepthM);
  const shallow = Math.min(sourceDepthM, receiverDepthM);
  const vFallback = wave === 'S' ? trueVsAt(model, shallow) : trueVpAt(model, shallow);
  const ray = traceRay(segs, offsetM, vFallback);
  let qEff: number;
  let sinI: number;
  if (segs.length === 0) {
    qEff = trueQAt(model, shallow, wave);
    sinI = 1;
  } else {
    const ordered = receiverDepthM >= sourceDepthM ? segs : [...segs].reverse();
    const vAtReceiver = ordered[ordered.length - 1].velocityMps;
    qEff = effectiveQ(segs, ray.segmentPathM, ray.timeS);
    sinI = Math.min(1, ray.rayParameterSpM * vAtReceiver);
  }
  const cosI = Math.sqrt(Math.max(0, 1 - sinI * sinI));
  const vertical = receiverDepthM >= sourceDepthM ? cosI : -cosI;
  // Source is east of the hole: the ray arrives travelling west (-east).
  const direction: Vec3 = offsetM > 0 ? [-sinI, 0, vertical] : [0, 0, receiverDepthM >= sourceDepthM ? 1 : -1];
  return { timeS: ray.timeS, pathM: ray.pathLengthM, qEff, directionAtReceiver: direction };
}

/** Straight crosshole ray in the layer at the test depth. */
function crossholePath(model: EarthModel, wave: 'S' | 'P', depthM: number, src: Vec3, rec: Vec3): WavePath {
  const d = sub3(rec, src);
  const distM = norm3(d);
  const v = wave === 'S' ? trueVsAt(model, depthM) : trueVpAt(model, depthM);
  return { timeS: distM / v, pathM: distM, qEff: trueQAt(model, depthM, wave), directionAtReceiver: unit3(d) };
}

// ---------------------------------------------------------------- records

interface ReceiverSpec {
  name: string;
  rotationRad: number;
  positionM: Vec3;
  /** Written to RECEIVER_LOCATION: hole collar east, north and the along-hole depth (what the crew sets). */
  nominalM: Vec3;
  axes: { H1: Vec3; H2: Vec3; V: Vec3 };
  s: WavePath;
  p: WavePath;
  /** Unit S particle motion (before hit polarity). */
  sMotion: Vec3;
}

interface ShotSpec {
  recordId: string;
  depthM: number;
  hit: HitDirection;
  polarity: 1 | -1;
  sourcePositionM: Vec3;
  sourceNominalM: Vec3;
  receivers: ReceiverSpec[];
}

/** Components recorded per receiver: downhole H1 H2 V; crosshole V then H1 (the test kinds' default channel layout, catalogue/testKinds.ts). */
function componentsFor(kind: TestKind): Component[] {
  return kind === 'crosshole' ? ['V', 'H1'] : ['H1', 'H2', 'V'];
}

function hitLetter(hit: HitDirection): string {
  return { left: 'L', right: 'R', up: 'U', down: 'D', none: 'N' }[hit];
}

function recordIdFor(prefix: string, depthM: number, hit: HitDirection, index = 0, plan: HitDirection[] = []): string {
  // A repeated hit at one depth gets a numbered name (…_L2) so ids stay unique.
  const repeat = plan.slice(0, index).filter((h) => h === hit).length;
  return `${prefix}_d${depthM.toFixed(1)}_${hitLetter(hit)}${repeat ? repeat + 1 : ''}.sg2`;
}

/** Receiver rotation per depth index: fixed, or a random walk over the full circle (turning probe). */
function probeRotations(count: number, o: SynthOptions): number[] {
  const fixed = o.receiverRotationRad ?? 0.1;
  if (!o.azimuthWalkSdRad) return new Array<number>(count).fill(fixed);
  const rng = mulberry32((o.seed ^ 0x5eed1) >>> 0);
  let a = (rng.uniform() * 2 - 1) * Math.PI;
  const out: number[] = [];
  for (let k = 0; k < count; k++) {
    if (k) a += (o.azimuthDriftRad ?? 0) + o.azimuthWalkSdRad * rng.normal();
    out.push(a);
  }
  return out;
}

function formatCoord(x: number): string {
  return String(Math.round(x * 1e6) / 1e6);
}

function renderShot(
  shot: ShotSpec,
  o: SynthOptions,
  rng: Prng,
  amplitude0: number,
  pRatio: number,
  kind: TestKind,
): { record: WaveRecord; truth: RecordTruth } {
  const dt = o.sampleIntervalS;
  const n = o.samplesPerTrace;
  const t0 = o.firstSampleS ?? 0;
  const triggerDelayS = o.maxTriggerDelayS > 0 ? rng.uniform() * o.maxTriggerDelayS : 0;
  const channels: { truth: ChannelTruth; nominalM: Vec3; signal: Float64Array; sPart: Float64Array }[] = [];
  let ch = 1;
  for (const r of shot.receivers) {
    const sAmp0 = amplitude0 / r.s.pathM;
    const pAmp0 = (amplitude0 * pRatio) / r.p.pathM;
    const att = (path: WavePath, f: number): ConstantQ | null =>
      o.attenuation && Number.isFinite(path.qEff) ? { travelTimeS: path.timeS, q: path.qEff, referenceHz: f } : null;
    const sWave = renderArrival(n, dt, t0, {
      arrivalS: r.s.timeS + triggerDelayS,
      frequencyHz: o.sFrequencyHz,
      attenuation: att(r.s, o.sFrequencyHz),
    });
    const pWave = renderArrival(n, dt, t0, {
      arrivalS: r.p.timeS + triggerDelayS,
      frequencyHz: o.pFrequencyHz,
      attenuation: att(r.p, o.pFrequencyHz),
    });
    const sVec = scale3(r.sMotion, shot.polarity);
    for (const comp of componentsFor(kind)) {
      const axis = r.axes[comp];
      const sA = sAmp0 * dot(sVec, axis);
      const pA = pAmp0 * dot(r.p.directionAtReceiver, axis);
      const signal = new Float64Array(n);
      const sPart = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        sPart[i] = sA * sWave[i];
        signal[i] = sPart[i] + pA * pWave[i];
      }
      channels.push({
        nominalM: r.nominalM,
        signal,
        sPart,
        truth: {
          channel: ch++,
          receiver: r.name,
          component: comp,
          sArrivalS: r.s.timeS + triggerDelayS,
          pArrivalS: r.p.timeS + triggerDelayS,
          sTravelS: r.s.timeS,
          pTravelS: r.p.timeS,
          sPathM: r.s.pathM,
          pPathM: r.p.pathM,
          sAmplitude: sA,
          pAmplitude: pA,
          qEffS: r.s.qEff,
          qEffP: r.p.qEff,
          receiverPositionM: r.positionM,
          receiverRotationRad: r.rotationRad,
        },
      });
    }
  }
  let sPeak = 0;
  for (const c of channels) for (let i = 0; i < n; i++) sPeak = Math.max(sPeak, Math.abs(c.sPart[i]));
  const noiseStd = o.snr !== null && o.snr > 0 ? sPeak / o.snr : 0;
  const hitWord = shot.hit;
  const sourceWord = kind === 'crosshole' ? `hammer in hole, ${hitWord} hit` : `beam at surface, ${hitWord} end struck`;
  const traces: Trace[] = channels.map((c) => {
    const samples = new Float32Array(n);
    for (let i = 0; i < n; i++) samples[i] = c.signal[i] + (noiseStd > 0 ? noiseStd * rng.normal() : 0);
    const recLoc = c.nominalM.map((x) => Number(formatCoord(x)));
    const srcLoc = shot.sourceNominalM.map((x) => Number(formatCoord(x)));
    return {
      channel: c.truth.channel,
      samples,
      sampleIntervalS: dt,
      delayS: t0,
      receiverLocation: recLoc,
      sourceLocation: srcLoc,
      strings: {
        SAMPLE_INTERVAL: String(dt),
        DELAY: String(t0),
        DESCALING_FACTOR: '1',
        CHANNEL_NUMBER: String(c.truth.channel),
        RECEIVER_LOCATION: recLoc.join(' '),
        SOURCE_LOCATION: srcLoc.join(' '),
        RECEIVER: `${c.truth.receiver} ${c.truth.component}`,
        SOURCE: sourceWord,
      },
    };
  });
  const record: WaveRecord = {
    id: shot.recordId,
    fileName: shot.recordId,
    format: 'seg2',
    fileStrings: { UNITS: 'METERS', TRACE_SORT: 'AS_ACQUIRED' },
    notes: [
      `HIT ${hitWord}`,
      `DEPTH ${shot.depthM.toFixed(2)} M`,
      `TEST ${kind}`,
      'SYNTHETIC RECORD: forward model with known arrival times',
    ],
    traces,
  };
  const truth: RecordTruth = {
    recordId: shot.recordId,
    depthM: shot.depthM,
    hit: shot.hit,
    triggerDelayS,
    noiseStd,
    sourcePositionM: shot.sourcePositionM,
    channels: channels.map((c) => c.truth),
  };
  return { record, truth };
}

function checkOptions(o: SynthOptions): void {
  const bad = (field: string, problem: string): never => {
    throw new BorewaveError(
      'SYNTH_BAD_OPTION',
      `synthetic survey options: ${field} ${problem}.`,
      'synthetic survey',
      field,
    );
  };
  if (!(o.sampleIntervalS > 0)) bad('sampleIntervalS', `is ${o.sampleIntervalS}, must be positive`);
  if (!(Number.isInteger(o.samplesPerTrace) && o.samplesPerTrace > 1))
    bad('samplesPerTrace', `is ${o.samplesPerTrace}, must be an integer above 1`);
  if (!(o.sFrequencyHz > 0) || o.sFrequencyHz >= 0.5 / o.sampleIntervalS)
    bad('sFrequencyHz', `is ${o.sFrequencyHz}, must be positive and below the Nyquist frequency`);
  if (!(o.pFrequencyHz > 0) || o.pFrequencyHz >= 0.5 / o.sampleIntervalS)
    bad('pFrequencyHz', `is ${o.pFrequencyHz}, must be positive and below the Nyquist frequency`);
  if (o.snr !== null && !(o.snr > 0)) bad('snr', `is ${o.snr}, must be positive or null`);
  if (!(o.maxTriggerDelayS >= 0)) bad('maxTriggerDelayS', `is ${o.maxTriggerDelayS}`);
}

function checkDepths(depths: number[], field: string): void {
  depths.forEach((d, i) => {
    if (!(Number.isFinite(d) && d > 0)) {
      throw new BorewaveError(
        'SYNTH_BAD_GEOMETRY',
        `synthetic geometry: ${field}[${i}] is ${d}, must be a positive depth in m.`,
        'synthetic geometry',
        `${field}[${i}]`,
      );
    }
  });
}

function verticalHole(id: string): Borehole {
  return { id, collarEastM: 0, collarNorthM: 0, deviation: [] };
}

function downholeReceiver(
  model: EarthModel,
  name: string,
  depthM: number,
  sourceDepthM: number,
  offsetM: number,
  o: SynthOptions,
  rotationRad: number,
): ReceiverSpec {
  return {
    name,
    rotationRad,
    positionM: [0, 0, depthM],
    nominalM: [0, 0, depthM],
    // Nominal H1 along the beam (north); the source lies east of the hole.
    axes: receiverAxes([0, 1, 0], rotationRad, o.receiverTiltRad ?? 0.05),
    s: downholePath(model, 'S', sourceDepthM, depthM, offsetM),
    p: downholePath(model, 'P', sourceDepthM, depthM, offsetM),
    sMotion: [0, 1, 0],
  };
}

function shotsFor(model: EarthModel, g: SynthGeometry, o: SynthOptions): ShotSpec[] {
  const shots: ShotSpec[] = [];
  if (g.kind === 'downhole' || g.kind === 'downhole-pair') {
    const zs = g.sourceDepthM ?? 0;
    const depths = g.kind === 'downhole' ? g.depthsM : g.upperDepthsM;
    checkDepths(depths, g.kind === 'downhole' ? 'depthsM' : 'upperDepthsM');
    if (g.kind === 'downhole-pair' && !(g.receiverSpacingM > 0)) {
      throw new BorewaveError(
        'SYNTH_BAD_GEOMETRY',
        `synthetic geometry: receiverSpacingM is ${g.receiverSpacingM}, must be positive.`,
        'synthetic geometry',
        'receiverSpacingM',
      );
    }
    const prefix = o.filePrefix ?? (g.kind === 'downhole' ? 'dh' : 'dhp');
    const rotations = probeRotations(depths.length, o);
    depths.forEach((z, k) => {
      const rot = rotations[k];
      const receivers =
        g.kind === 'downhole'
          ? [downholeReceiver(model, 'R', z, zs, g.sourceOffsetM, o, rot)]
          : [
              downholeReceiver(model, 'upper', z, zs, g.sourceOffsetM, o, rot),
              downholeReceiver(
                model,
                'lower',
                z + g.receiverSpacingM,
                zs,
                g.sourceOffsetM,
                o,
                rot + (o.azimuthWalkSdRad ? 0.4 : 0),
              ),
            ];
      const plan = o.hitPlan?.[k] ?? ['left', 'right'];
      plan.forEach((hit, h) => {
        const polarity = hit === 'right' ? -1 : 1;
        shots.push({
          recordId: recordIdFor(prefix, z, hit, h, plan),
          depthM: z,
          hit,
          polarity,
          sourcePositionM: [g.sourceOffsetM, 0, zs],
          sourceNominalM: [g.sourceOffsetM, 0, zs],
          receivers,
        });
      });
    });
    return shots;
  }
  checkDepths(g.depthsM, 'depthsM');
  const [srcHole, nearHole, farHole] = g.holes;
  const prefix = o.filePrefix ?? 'xh';
  for (const z of g.depthsM) {
    const src = holePositionAt(srcHole, z);
    const receivers = [nearHole, farHole].map((hole): ReceiverSpec => {
      const rec = holePositionAt(hole, z);
      const s = crossholePath(model, 'S', z, src, rec);
      const p = crossholePath(model, 'P', z, src, rec);
      const radial: Vec3 = [hole.collarEastM - srcHole.collarEastM, hole.collarNorthM - srcHole.collarNorthM, 0];
      // SV motion: the downward unit vector with its part along the ray removed.
      const down: Vec3 = [0, 0, 1];
      const sMotion = unit3(sub3(down, scale3(s.directionAtReceiver, dot(down, s.directionAtReceiver))));
      return {
        name: hole.id,
        rotationRad: o.receiverRotationRad ?? 0.1,
        positionM: rec,
        nominalM: [hole.collarEastM, hole.collarNorthM, z],
        axes: receiverAxes(radial, o.receiverRotationRad ?? 0.1, o.receiverTiltRad ?? 0.05),
        s,
        p,
        sMotion,
      };
    });
    const plan = o.hitPlan?.[g.depthsM.indexOf(z)] ?? ['up', 'down'];
    plan.forEach((hit, h) => {
      shots.push({
        recordId: recordIdFor(prefix, z, hit, h, plan),
        depthM: z,
        hit,
        polarity: hit === 'up' ? -1 : 1,
        sourcePositionM: src,
        sourceNominalM: [srcHole.collarEastM, srcHole.collarNorthM, z],
        receivers,
      });
    });
  }
  return shots;
}

function assignmentFor(shot: ShotSpec, kind: TestKind): RecordAssignment {
  const channels: ChannelAssignment[] = [];
  let ch = 1;
  shot.receivers.forEach((_, i) => {
    for (const component of componentsFor(kind)) channels.push({ channel: ch++, component, receiver: receiverSlot(i) });
  });
  return {
    recordId: shot.recordId,
    depthM: shot.depthM,
    hit: shot.hit,
    channels,
    excluded: false,
    depthSource: 'filename',
    hitSource: 'filename',
  };
}

/** Synthetic records, the survey that describes them and the true arrival times. Deterministic for a seed. */
export function synthesizeSurvey(model: EarthModel, geometry: SynthGeometry, o: SynthOptions): SynthResult {
  validateEarthModel(model);
  checkOptions(o);
  const shots = shotsFor(model, geometry, o);
  const rng = mulberry32(o.seed);
  const amplitude0 = o.sourceAmplitude ?? 1000;
  const pRatio = o.pToSRatio ?? 0.2;
  const rendered = shots.map((s) => renderShot(s, o, rng, amplitude0, pRatio, geometry.kind));
  const deepestM = Math.max(...shots.flatMap((s) => s.receivers.map((r) => r.nominalM[2])));
  const base = {
    name: o.surveyName ?? `Synthetic ${geometry.kind}`,
    kind: geometry.kind,
    sourceDepthM: 0,
    sourceOffsetM: 0,
    receiverSpacingM: 0,
    receiverCount: geometry.kind === 'downhole' ? 1 : 2,
    coneOffsetM: DEFAULT_CONE_OFFSET_M,
    receiverHoleIds: [] as string[],
    records: shots.map((s) => assignmentFor(s, geometry.kind)),
    soil: soilColumnFromModel(model, deepestM),
  };
  let survey: Survey;
  if (geometry.kind === 'crosshole') {
    survey = {
      ...base,
      boreholes: geometry.holes.map((h) => ({ ...h, deviation: h.deviation.map((d) => ({ ...d })) })),
      mainHoleId: geometry.holes[0].id,
      receiverHoleIds: [geometry.holes[1].id, geometry.holes[2].id],
    };
  } else {
    survey = {
      ...base,
      boreholes: [verticalHole(geometry.holeId)],
      mainHoleId: geometry.holeId,
      sourceOffsetM: geometry.sourceOffsetM,
      sourceDepthM: geometry.sourceDepthM ?? 0,
      receiverSpacingM: geometry.kind === 'downhole-pair' ? geometry.receiverSpacingM : 0,
    };
  }
  return {
    survey,
    records: rendered.map((r) => r.record),
    truth: { kind: geometry.kind, records: rendered.map((r) => r.truth) },
  };
}

/** The record as input for the SEG-2 writer (io/seg2.ts writeSeg2); the writer sets the sampling keywords itself. */
export function toSeg2Input(record: WaveRecord): {
  fileStrings: Record<string, string>;
  notes: string[];
  traces: {
    channel: number;
    samples: Float32Array;
    sampleIntervalS: number;
    delayS: number;
    receiverLocation?: number[];
    sourceLocation?: number[];
    strings: Record<string, string>;
  }[];
} {
  const own = new Set([
    'SAMPLE_INTERVAL',
    'DELAY',
    'DESCALING_FACTOR',
    'CHANNEL_NUMBER',
    'RECEIVER_LOCATION',
    'SOURCE_LOCATION',
  ]);
  return {
    fileStrings: { ...record.fileStrings },
    notes: [...record.notes],
    traces: record.traces.map((t) => ({
      channel: t.channel,
      samples: t.samples,
      sampleIntervalS: t.sampleIntervalS,
      delayS: t.delayS,
      receiverLocation: t.receiverLocation,
      sourceLocation: t.sourceLocation,
      strings: Object.fromEntries(Object.entries(t.strings).filter(([k]) => !own.has(k))),
    })),
  };
}
