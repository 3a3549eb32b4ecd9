/**
 * Stations: one receiver at one depth, one component, one wave. A station gathers the hits recorded
 * there and forms one working trace: the difference of reversed hits for S (keeps the reversing shear
 * wave, cancels P and common noise), their sum for P, or the stack of single-direction hits
 * (common practice; Robertson et al. 1986 for the reversed-hit idea (from memory)).
 */
import { BorewaveError, toErrorInfo, type ErrorInfo } from '../errors';
import type { Component, HitDirection, Survey, TestKind, Wave, WaveRecord } from '../model';
import type { Settings } from '../settings';
import { conditionTrace } from '../signal/condition';
import { reversedDifference, reversedSum, stackTraces } from '../signal/stack';
import type { WorkingTrace } from '../picking/autopick';
import { distanceM, findHole, positionAlongHole, validateDeviation, type Vec3 } from './geometry';

export interface StationHit {
  recordId: string;
  channel: number;
  hit: HitDirection;
}

export interface Station {
  key: string;
  receiver: string;
  /** Receiver depth along the hole, m (the depth the user assigned). */
  depthM: number;
  component: Component;
  wave: Wave;
  receiverPos: Vec3;
  sourcePos: Vec3;
  /** Straight source-receiver distance, m. */
  straightPathM: number;
  hits: StationHit[];
  workingKind: 'difference' | 'sum' | 'stack' | 'single';
  working: WorkingTrace;
  flags: string[];
}

/** Component that carries each wave for each test kind (common practice: horizontal beam -> SH on the
 * horizontal along the beam, P on the vertical; vertical hits in a crosshole -> SV on the vertical,
 * P on the radial horizontal). */
export function componentFor(kind: TestKind, wave: Wave): Component {
  if (kind === 'crosshole') return wave === 'S' ? 'V' : 'H1';
  return wave === 'S' ? 'H1' : 'V';
}

/** The two directions that reverse the shear wave: first minus second is the difference trace. */
export function reversedDirections(kind: TestKind): [HitDirection, HitDirection] {
  return kind === 'crosshole' ? ['up', 'down'] : ['left', 'right'];
}

export function stationKey(receiver: string, depthM: number, component: Component): string {
  return `${receiver}@${depthM.toFixed(3)}:${component}`;
}

/** Receiver depth of a channel's receiver for a record depth. */
export function receiverDepthM(survey: Survey, receiver: string, recordDepthM: number): number {
  return survey.kind === 'downhole-pair' && receiver === 'lower'
    ? recordDepthM + survey.receiverSpacingM
    : recordDepthM;
}

/** Positions of the receiver and the source for one station. */
export function stationPositions(
  survey: Survey,
  receiver: string,
  depthM: number,
): { receiverPos: Vec3; sourcePos: Vec3; beyondSurvey: boolean } {
  if (survey.kind === 'crosshole') {
    const rx = positionAlongHole(findHole(survey.boreholes, receiver), depthM);
    const sx = positionAlongHole(findHole(survey.boreholes, survey.mainHoleId), depthM);
    return { receiverPos: rx.pos, sourcePos: sx.pos, beyondSurvey: rx.beyondSurvey || sx.beyondSurvey };
  }
  const hole = findHole(survey.boreholes, survey.mainHoleId);
  const rx = positionAlongHole(hole, depthM);
  // Source on the surface (or at sourceDepthM) at a horizontal offset east of the receiver hole's collar.
  const sourcePos: Vec3 = [hole.collarEastM + survey.sourceOffsetM, hole.collarNorthM, survey.sourceDepthM];
  return { receiverPos: rx.pos, sourcePos, beyondSurvey: rx.beyondSurvey };
}

/** Arrival search window from the path length and the plausible velocity range, within the record. */
export function searchWindowS(
  pathM: number,
  rangeMps: [number, number],
  firstS: number,
  lastS: number,
): [number, number] {
  const start = Math.max(firstS, pathM / rangeMps[1]);
  const end = Math.min(lastS, pathM / rangeMps[0]);
  return [start, Math.max(start, end)];
}

export interface StationBuild {
  stations: Station[];
  issues: ErrorInfo[];
}

/** Builds every station's working trace. Problems with one record or station are reported, not thrown. */
export function buildStations(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
): StationBuild {
  const issues: ErrorInfo[] = [];
  // A hole whose deviation table is unusable is reported and taken as vertical, so the rest still computes.
  const badHoles = new Set<string>();
  const boreholes = survey.boreholes.map((h) => {
    try {
      validateDeviation(h.id, h.deviation);
      return h;
    } catch (e) {
      const info = toErrorInfo(e, h.id);
      issues.push({ ...info, message: `${info.message} The hole is taken as vertical until the table is fixed.` });
      badHoles.add(h.id);
      return { ...h, deviation: [] };
    }
  });
  survey = { ...survey, boreholes };
  type Group = { receiver: string; depthM: number; component: Component; wave: Wave; hits: StationHit[] };
  const groups = new Map<string, Group>();
  const waves: Wave[] = ['S', 'P'];
  for (const ra of survey.records) {
    if (ra.excluded) continue;
    const rec = records.get(ra.recordId);
    if (!rec) {
      issues.push({
        code: 'RECORD_MISSING',
        message: `Record ${ra.recordId} is in the survey but its file is not loaded.`,
        file: ra.recordId,
      });
      continue;
    }
    if (ra.depthM === null || !Number.isFinite(ra.depthM)) {
      issues.push({
        code: 'RECORD_NO_DEPTH',
        message: `Record ${ra.recordId} has no depth: set it in Geometry.`,
        file: ra.recordId,
        field: 'depth',
      });
      continue;
    }
    for (const wave of waves) {
      const comp = componentFor(survey.kind, wave);
      for (const ch of ra.channels) {
        if (ch.component !== comp) continue;
        if (!rec.traces.some((t) => t.channel === ch.channel)) {
          issues.push({
            code: 'RECORD_NO_CHANNEL',
            message: `Record ${ra.recordId} has no channel ${ch.channel}.`,
            file: ra.recordId,
            field: `channel ${ch.channel}`,
          });
          continue;
        }
        const depthM = receiverDepthM(survey, ch.receiver, ra.depthM);
        const key = stationKey(ch.receiver, depthM, comp);
        const gk = `${key}|${wave}`;
        let g = groups.get(gk);
        if (!g) groups.set(gk, (g = { receiver: ch.receiver, depthM, component: comp, wave, hits: [] }));
        g.hits.push({ recordId: ra.recordId, channel: ch.channel, hit: ra.hit });
      }
    }
  }
  const stations: Station[] = [];
  for (const g of groups.values()) {
    const key = stationKey(g.receiver, g.depthM, g.component);
    try {
      const st = buildStation(survey, records, settings, g.receiver, g.depthM, g.component, g.wave, g.hits);
      const holesUsed = survey.kind === 'crosshole' ? [g.receiver, survey.mainHoleId] : [survey.mainHoleId];
      if (holesUsed.some((h) => badHoles.has(h))) st.flags.push('deviation table rejected');
      stations.push(st);
    } catch (e) {
      issues.push(toErrorInfo(e, key));
    }
  }
  stations.sort(
    (a, b) =>
      (a.wave === b.wave ? 0 : a.wave === 'S' ? -1 : 1) || a.receiver.localeCompare(b.receiver) || a.depthM - b.depthM,
  );
  return { stations, issues };
}

function buildStation(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
  receiver: string,
  depthM: number,
  component: Component,
  wave: Wave,
  hits: StationHit[],
): Station {
  const key = stationKey(receiver, depthM, component);
  const flags: string[] = [];
  const traces = hits.map((h) => records.get(h.recordId)!.traces.find((t) => t.channel === h.channel)!);
  const dtS = traces[0].sampleIntervalS;
  const delayS = traces[0].delayS;
  const n = traces[0].samples.length;
  for (const t of traces) {
    if (t.sampleIntervalS !== dtS || t.samples.length !== n || Math.abs(t.delayS - delayS) > dtS / 2) {
      throw new BorewaveError(
        'STATION_MIXED_SAMPLING',
        `Hits at ${key} differ in sample interval, length or delay and cannot be combined.`,
        key,
      );
    }
  }
  if (!(dtS > 0))
    throw new BorewaveError('STATION_BAD_SAMPLE_INTERVAL', `Sample interval at ${key} is not positive.`, key);
  const bandpass = wave === 'S' ? settings.bandpassS : settings.bandpassP;
  const cond = { detrend: settings.detrend, taperFraction: settings.taperFraction, bandpass };
  const conditioned = traces.map((t) => conditionTrace(t.samples, dtS, cond));
  const [dirA, dirB] = reversedDirections(survey.kind);
  const groupA = conditioned.filter((_, i) => hits[i].hit === dirA);
  const groupB = conditioned.filter((_, i) => hits[i].hit === dirB);
  let samples: Float64Array;
  let workingKind: Station['workingKind'];
  if (settings.useReversedHits && groupA.length && groupB.length) {
    const a = stackTraces(groupA);
    const b = stackTraces(groupB);
    samples = wave === 'S' ? reversedDifference(a, b) : reversedSum(a, b);
    workingKind = wave === 'S' ? 'difference' : 'sum';
  } else {
    // One direction only (or reversal off): stack what there is, keeping the first direction's polarity.
    const all = groupA.length ? groupA : groupB.length ? groupB : conditioned;
    samples = all.length > 1 ? stackTraces(all) : all[0];
    workingKind = all.length > 1 ? 'stack' : 'single';
    if (wave === 'S' && settings.useReversedHits) flags.push('no reversed pair');
  }
  let peak = 0;
  for (let i = 0; i < samples.length; i++) peak = Math.max(peak, Math.abs(samples[i]));
  if (!(peak > 0)) flags.push('flat trace');
  const { receiverPos, sourcePos, beyondSurvey } = stationPositions(survey, receiver, depthM);
  if (beyondSurvey) flags.push('beyond deviation survey');
  const straightPathM = distanceM(receiverPos, sourcePos);
  if (!(straightPathM > 0)) {
    throw new BorewaveError(
      'STATION_ZERO_DISTANCE',
      `Receiver at ${key} sits on the source (zero source-receiver distance): give the source an offset or drop this depth.`,
      key,
      'source offset',
    );
  }
  const lastS = delayS + (n - 1) * dtS;
  const range = wave === 'S' ? settings.vsRangeMps : settings.vpRangeMps;
  const [searchStartS, searchEndS] = searchWindowS(straightPathM, range, delayS, lastS);
  return {
    key,
    receiver,
    depthM,
    component,
    wave,
    receiverPos,
    sourcePos,
    straightPathM,
    hits,
    workingKind,
    working: { stationKey: key, wave, samples, sampleIntervalS: dtS, delayS, searchStartS, searchEndS },
    flags,
  };
}
