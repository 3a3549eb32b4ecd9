/**
 * Stations: one receiver at one depth, one component, one wave. A station gathers the hits recorded
 * there and forms one working trace: the difference of reversed hits for S (keeps the reversing shear
 * wave, cancels P and common noise), their sum for P, or the stack of single-direction hits
 * (common practice; Robertson et al. 1986 for the reversed-hit idea (from memory)).
 */
import { BorewaveError, toErrorInfo, type ErrorInfo } from '../errors';
import type { Component, HitDirection, Survey, Wave, WaveRecord, WorkingTrace } from '../model';
import type { Settings } from '../settings';
import type { StationFlag } from '../flags';
import { stationKey, type ReceiverSlot, type StationKey } from '../keys';
import {
  componentFor,
  holesUsed,
  receiverDepthM,
  receiverHole,
  reversedDirections,
  surfaceSource,
} from '../catalogue/testKinds';
import { conditionTrace } from '../signal/condition';
import { reversedDifference, reversedSum, stackTraces } from '../signal/stack';
import { distanceM, findHole, positionAlongHole, validateDeviation, type Vec3 } from './geometry';
import { orientSurvey, type DepthOrientation } from './orientation';

export interface StationHit {
  recordId: string;
  channel: number;
  hit: HitDirection;
}

export interface Station {
  key: StationKey;
  /** Receiver slot (r0, r1 ...) in the test kind's layout. */
  receiver: ReceiverSlot;
  /** Receiver depth along the hole, m (from the logged depth by the kind catalogue's receiverDepthM). */
  depthM: number;
  /** Logged depth of the records, m (the station key's depth; the cone's tip depth). */
  loggedDepthM: number;
  component: Component;
  wave: Wave;
  receiverPos: Vec3;
  sourcePos: Vec3;
  /** Straight source-receiver distance, m. */
  straightPathM: number;
  hits: StationHit[];
  workingKind: 'difference' | 'sum' | 'stack' | 'single';
  working: WorkingTrace;
  flags: StationFlag[];
}

/** Positions of the receiver and the source for one station. */
export function stationPositions(
  survey: Survey,
  receiver: ReceiverSlot,
  depthM: number,
): { receiverPos: Vec3; sourcePos: Vec3; beyondSurvey: boolean } {
  if (!surfaceSource(survey.kind)) {
    const rx = positionAlongHole(findHole(survey.boreholes, receiverHole(survey, receiver)), depthM);
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
  /** Per record depth: effective hits, inferred azimuths and confidences (orientation.ts). */
  orientation: DepthOrientation[];
}

/** Builds every station's working trace. Problems with one record or station are reported, not thrown. */
export function buildStations(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
  azimuthDeg: Readonly<Record<string, number>> = {},
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
  const orient = orientSurvey(survey, records, settings, azimuthDeg, issues);
  // The rotated horizontal is the shear working signal of a horizontal-beam survey (rotation on).
  const shearOverride =
    orient.mode === 'horizontal' && settings.conditioning.rotateHorizontals !== false ? orient.shear : null;
  type Group = {
    receiver: ReceiverSlot;
    depthM: number;
    loggedDepthM: number;
    component: Component;
    wave: Wave;
    hits: StationHit[];
  };
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
    const shearComponent = componentFor(survey.kind, 'S');
    if (!ra.channels.some((ch) => ch.component === shearComponent)) {
      // no station can come of it: say so rather than leave the record silently out of the profile
      issues.push({
        code: 'RECORD_NO_CHANNEL',
        message: `Record ${ra.recordId} has no channel assigned to the ${shearComponent} component that carries the shear wave${ra.channels.length ? '' : ' (no channels assigned at all)'}: set its channels in Geometry.`,
        file: ra.recordId,
        field: 'channels',
      });
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
        const key = stationKey(ch.receiver, ra.depthM, comp);
        const gk = `${key}|${wave}`;
        let g = groups.get(gk);
        if (!g)
          groups.set(
            gk,
            (g = { receiver: ch.receiver, depthM, loggedDepthM: ra.depthM, component: comp, wave, hits: [] }),
          );
        g.hits.push({ recordId: ra.recordId, channel: ch.channel, hit: orient.hits.get(ra.recordId) ?? ra.hit });
      }
    }
  }
  const stations: Station[] = [];
  for (const g of groups.values()) {
    const key = stationKey(g.receiver, g.loggedDepthM, g.component);
    try {
      const st = buildStation(survey, records, settings, g, g.wave === 'S' ? shearOverride : null);
      if (holesUsed(survey, g.receiver).some((h) => badHoles.has(h))) st.flags.push('deviation table rejected');
      stations.push(st);
    } catch (e) {
      issues.push(toErrorInfo(e, key));
    }
  }
  stations.sort(
    (a, b) =>
      (a.wave === b.wave ? 0 : a.wave === 'S' ? -1 : 1) ||
      a.receiver.localeCompare(b.receiver, 'en', { numeric: true }) ||
      a.depthM - b.depthM,
  );
  return { stations, issues, orientation: orient.depths };
}

function buildStation(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
  g: {
    receiver: ReceiverSlot;
    depthM: number;
    loggedDepthM: number;
    component: Component;
    wave: Wave;
    hits: StationHit[];
  },
  shearOverride: ReadonlyMap<string, Float64Array> | null = null,
): Station {
  const { receiver, depthM, loggedDepthM, component, wave, hits } = g;
  const key = stationKey(receiver, loggedDepthM, component);
  const flags: StationFlag[] = [];
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
  const bandpass = wave === 'S' ? settings.conditioning.bandpassS : settings.conditioning.bandpassP;
  const cond = { detrend: settings.conditioning.detrend, taperFraction: settings.conditioning.taperFraction, bandpass };
  const conditioned = traces.map(
    (t, i) => shearOverride?.get(`${hits[i].recordId}|${receiver}`) ?? conditionTrace(t.samples, dtS, cond),
  );
  const [dirA, dirB] = reversedDirections(survey.kind);
  const groupA = conditioned.filter((_, i) => hits[i].hit === dirA);
  const groupB = conditioned.filter((_, i) => hits[i].hit === dirB);
  let samples: Float64Array;
  let workingKind: Station['workingKind'];
  if (settings.conditioning.useReversedHits && groupA.length && groupB.length) {
    const a = stackTraces(groupA);
    const b = stackTraces(groupB);
    samples = wave === 'S' ? reversedDifference(a, b) : reversedSum(a, b);
    workingKind = wave === 'S' ? 'difference' : 'sum';
  } else {
    // One direction only (or reversal off): stack what there is, keeping the first direction's polarity.
    const all = groupA.length ? groupA : groupB.length ? groupB : conditioned;
    samples = all.length > 1 ? stackTraces(all) : all[0];
    // Second direction only: the shear wave is flipped against the difference traces (first minus
    // second) of the neighbouring depths, so flip it back; P does not reverse and stays as it is.
    if (wave === 'S' && !groupA.length && groupB.length) samples = samples.map((x) => -x);
    workingKind = all.length > 1 ? 'stack' : 'single';
    if (wave === 'S' && settings.conditioning.useReversedHits) flags.push('no reversed pair');
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
  const range = wave === 'S' ? settings.picking.vsRangeMps : settings.picking.vpRangeMps;
  const [searchStartS, searchEndS] = searchWindowS(straightPathM, range, delayS, lastS);
  return {
    key,
    receiver,
    depthM,
    loggedDepthM,
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
