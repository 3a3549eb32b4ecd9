/**
 * Orientation stage of prepare(): gathers each depth's records per receiver, solves the hit directions
 * and the horizontal rotation together (hits.ts) and hands the stations their shear working signals
 * (the horizontals rotated to the shear axis; crosshole: the vertical) and the effective hits.
 */
import type { ErrorInfo } from '../errors';
import type { HitDirection, Survey, WaveRecord } from '../model';
import type { Settings } from '../settings';
import { conditionTrace } from '../signal/condition';
import { solveHitsAndRotation, type ChannelEnergy, type DepthGroupInput, type ThreeComponent } from './hits';
import { toDegrees360 } from './rotation';
import { distanceM } from './geometry';
import { kindInfo, receiverDepthM } from '../catalogue/testKinds';
import { receiverDepthKey, type ReceiverDepthKey, type ReceiverSlot } from '../keys';
import { stationPositions } from './stations';

/** What the set-up checks and the views need from the orientation stage (plain, structured-clone friendly). */
export interface DepthOrientation {
  /** Logged record depth, m. */
  depthM: number;
  recordIds: string[];
  /** Effective hit per record id and where it came from. */
  hits: Record<string, HitDirection>;
  hitSource: 'given' | 'data';
  confidence: number;
  unexplainedRecords: string[];
  contradictions: number;
  reversedPair: boolean;
  receivers: {
    receiver: string;
    /** Receiver depth, m. */
    depthM: number;
    /** Azimuth of the first hit direction's motion, degrees in [0, 360) in the receiver frame (0 = H1, 90 = H2); null on V. */
    azimuthDeg: number | null;
    azimuthSource: 'data' | 'user';
    linearity: number;
    sEnergy: ChannelEnergy;
    pEnergy: ChannelEnergy | null;
  }[];
}

export interface Orientation {
  depths: DepthOrientation[];
  /** Effective hit per record id (given where given, else from the data). */
  hits: Map<string, HitDirection>;
  /** Shear working signal per `${recordId}|${receiver}` (conditioned with the S settings). */
  shear: Map<string, Float64Array>;
  mode: 'horizontal' | 'vertical';
}

/** Key of a user-fixed azimuth in edits.azimuthDeg: `<slot>@<logged depth mm>` (keys.ts). */
export function azimuthEditKey(receiver: ReceiverSlot, loggedDepthM: number): ReceiverDepthKey {
  return receiverDepthKey(receiver, loggedDepthM);
}

/**
 * Runs the orientation solve. Records without a depth, a missing channel or mixed sampling are left to
 * the station builder, which reports them; here they only drop out of the solve.
 */
export function orientSurvey(
  survey: Survey,
  records: ReadonlyMap<string, WaveRecord>,
  settings: Settings,
  azimuthDeg: Readonly<Record<string, number>> = {},
  issues: ErrorInfo[] = [],
): Orientation {
  // Vertical hits in a hole (crosshole): shear on V; a horizontal beam: shear on the horizontals.
  const mode = kindInfo(survey.kind).sourceInHole ? 'vertical' : 'horizontal';
  const cond = {
    detrend: settings.conditioning.detrend,
    taperFraction: settings.conditioning.taperFraction,
    bandpass: settings.conditioning.bandpassS,
  };
  const byDepth = new Map<number, DepthGroupInput & { receiversAt: Map<string, number> }>();
  let dtS = 0;
  for (const ra of survey.records) {
    if (ra.excluded || ra.depthM === null || !Number.isFinite(ra.depthM)) continue;
    const rec = records.get(ra.recordId);
    if (!rec) continue;
    const bySlot: Record<string, ThreeComponent> = {};
    for (const rx of [...new Set(ra.channels.map((c) => c.receiver))]) {
      const pick = (comp: 'H1' | 'H2' | 'V') => {
        const ch = ra.channels.find((c) => c.receiver === rx && c.component === comp);
        return ch ? rec.traces.find((t) => t.channel === ch.channel) : undefined;
      };
      const [t1, t2, tv] = [pick('H1'), pick('H2'), pick('V')];
      const ref = tv ?? t1 ?? t2;
      if (!ref || !(ref.sampleIntervalS > 0)) continue;
      if (dtS && Math.abs(ref.sampleIntervalS - dtS) > 1e-12) continue;
      dtS = ref.sampleIntervalS;
      const n = ref.samples.length;
      const zero = new Float64Array(n);
      const c = (t: typeof ref | undefined) => {
        if (!t || t.samples.length !== n) return zero;
        try {
          return conditionTrace(t.samples, dtS, cond);
        } catch {
          return zero;
        }
      };
      bySlot[rx] = { h1: c(t1), h2: c(t2), v: c(tv) };
    }
    if (!Object.keys(bySlot).length) continue;
    const key = Math.round(ra.depthM * 1000);
    let g = byDepth.get(key);
    if (!g) {
      g = { depthM: ra.depthM, records: [], slots: [], receiversAt: new Map() };
      byDepth.set(key, g);
    }
    // A hit placed from the data (source 'data') is inferred again; any other source is kept.
    const given = ra.hit === 'none' || ra.hitSource === 'data' ? null : ra.hit;
    g.records.push({ recordId: ra.recordId, givenHit: given, bySlot });
    if (!g.slots.length) {
      const ref = rec.traces[0];
      const first = ref.delayS;
      for (const rx of Object.keys(bySlot)) {
        const zRx = receiverDepthM(survey, rx as ReceiverSlot, ra.depthM);
        g.receiversAt.set(rx, zRx);
        let path = 1;
        try {
          const pos = stationPositions(survey, rx as ReceiverSlot, zRx);
          path = distanceM(pos.receiverPos, pos.sourcePos);
        } catch {
          continue;
        }
        const n = bySlot[rx].v.length;
        const idx = (tS: number) => Math.max(0, Math.min(n, Math.round((tS - first) / dtS)));
        g.slots.push({
          slot: rx,
          searchS: [idx(path / settings.picking.vsRangeMps[1]), idx(path / settings.picking.vsRangeMps[0])],
          searchP: [idx(path / settings.picking.vpRangeMps[1]), idx(path / settings.picking.vpRangeMps[0])],
        });
      }
    }
  }
  // Only records with every slot of their depth take part.
  const groups = [...byDepth.values()].map((g) => ({
    ...g,
    records: g.records.filter((r) => g.slots.every((s) => r.bySlot[s.slot])),
  }));
  const fixed = new Map<string, number>();
  for (const g of groups)
    for (const s of g.slots) {
      const d = azimuthDeg[azimuthEditKey(s.slot as ReceiverSlot, g.depthM)];
      if (d !== undefined && Number.isFinite(d)) fixed.set(`${s.slot}@${g.depthM.toFixed(3)}`, (d * Math.PI) / 180);
    }
  const hits = new Map<string, HitDirection>();
  const shear = new Map<string, Float64Array>();
  const depths: DepthOrientation[] = [];
  if (!dtS || !groups.length) return { depths, hits, shear, mode };
  let solved: ReturnType<typeof solveHitsAndRotation> = [];
  try {
    solved = solveHitsAndRotation(groups, {
      mode,
      sampleIntervalS: dtS,
      hitSwap: !!survey.hitSwap,
      fixedAzimuthRad: fixed,
    });
  } catch (e) {
    issues.push({
      code: 'ORIENTATION_FAILED',
      message: `Hits and rotation could not be solved: ${(e as Error).message}`,
    });
    return { depths, hits, shear, mode };
  }
  solved.forEach((sol, k) => {
    const g = groups[k];
    for (const [id, h] of sol.hits) hits.set(id, h);
    for (const s of sol.slots) for (const [id, tr] of s.projected) shear.set(`${id}|${s.slot}`, tr);
    depths.push({
      depthM: sol.depthM,
      recordIds: g.records.map((r) => r.recordId),
      hits: Object.fromEntries(sol.hits),
      hitSource: sol.hitSource,
      confidence: sol.confidence,
      unexplainedRecords: sol.unexplainedRecords,
      contradictions: sol.contradictions,
      reversedPair: sol.reversedPair,
      receivers: sol.slots.map((s) => ({
        receiver: s.slot,
        depthM: g.receiversAt.get(s.slot) ?? sol.depthM,
        azimuthDeg: s.azimuthRad === null ? null : toDegrees360(s.azimuthRad),
        azimuthSource: s.azimuthSource,
        linearity: s.linearity,
        sEnergy: s.sEnergy,
        pEnergy: s.pEnergy,
      })),
    });
  });
  depths.sort((a, b) => a.depthM - b.depthM);
  return { depths, hits, shear, mode };
}
