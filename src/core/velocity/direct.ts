/**
 * Direct times at each station: the travel-time rows (time by pick method and its slant-corrected
 * value) and the crosshole direct velocities.
 */
import type { Pick, Survey, Wave } from '../model';
import type { Settings } from '../settings';
import type { Station } from '../survey/stations';
import type { IntervalFlag } from '../flags';
import { stationWaveKey, type StationKey, type StationWaveKey } from '../keys';
import { editableMethodOf, isOnsetPick, type EditablePickMethod } from '../catalogue/methods';
import { hasDepthTimeFits, hasDirectVelocities } from '../catalogue/testKinds';
import { correctedTimeS, intervalVelocitySdMps } from './formulas';

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
export function directVelocities(
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
    const dt = p.timeS - settings.intervals.triggerDelayS;
    const flags: IntervalFlag[] = [...p.flags];
    let v: number | null = null;
    let sd: number | null = null;
    if (!(dt > 0)) flags.push('non-positive time');
    else {
      v = s.straightPathM / dt;
      sd = intervalVelocitySdMps(v, s.straightPathM, Math.SQRT2 * settings.intervals.positionSdM, dt, p.uncertaintyS);
      const range = s.wave === 'S' ? settings.picking.vsRangeMps : settings.picking.vpRangeMps;
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

export function travelTimeRows(survey: Survey, stations: readonly Station[], picks: readonly Pick[]): TravelTimeRow[] {
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
