/**
 * The user's pick edits applied to the automatic picks: hand times replace (or add) the pick of each
 * editable method; an excluded station's picks carry origin 'excluded'.
 */
import type { Pick, Wave, WorkingTrace } from '../model';
import type { UserEdits } from '../settings';
import type { Station } from '../survey/stations';
import { pickEditKey, stationWaveKey, type IntervalKey, type StationKey, type StationWaveKey } from '../keys';
import { EDITABLE_METHODS, editableMethodOf, pickMethodForEdit, type EditablePickMethod } from '../catalogue/methods';
import { snapTimeS } from './snap';

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

/**
 * One hand pick as an edit action: the time (snapped to the method's feature on the station's working
 * trace when `snap` is on), and every interval that uses the station switched to the edited method, so
 * the profile follows the edit at once. Pure: returns the new edits.
 */
export function applyPickEdit(
  edits: UserEdits,
  pairs: readonly { key: IntervalKey; wave: Wave; a: { key: StationKey }; b: { key: StationKey } }[],
  station: { key: StationKey; wave: Wave; working?: WorkingTrace },
  method: EditablePickMethod,
  timeS: number,
  snap = false,
): UserEdits {
  const t = snap && station.working ? snapTimeS(station.working, method, timeS) : timeS;
  const chosen = { ...edits.chosenMethod };
  for (const p of pairs)
    if (p.wave === station.wave && (p.a.key === station.key || p.b.key === station.key)) chosen[p.key] = method;
  return {
    ...edits,
    picks: { ...edits.picks, [pickEditKey(station.key, station.wave, method)]: t },
    chosenMethod: chosen,
  };
}
