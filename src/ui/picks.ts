/** Small view helpers about picks and stations (lookups only; nothing here computes a pick). */
import type { Pick, Wave } from '../core';
import { pickIsMethod, type EditablePickMethod } from '../core';
import type { Station } from '../core';
import type { Derived } from '../core';
import { slotIndex, type IntervalKey, type StationKey } from '../core';

export const isMethod = pickIsMethod;

export function pickFor(
  picks: readonly Pick[],
  stationKey: StationKey,
  wave: Wave,
  m: EditablePickMethod,
): Pick | undefined {
  return picks.find((p) => p.stationKey === stationKey && p.wave === wave && isMethod(p, m));
}

/** Stations on the board: one wave, one receiver ('*' = all), sorted by depth. */
export function boardStations(stations: readonly Station[], wave: Wave, receiver: string): Station[] {
  return stations
    .filter((s) => s.wave === wave && (receiver === '*' || s.receiver === receiver))
    .sort((a, b) => a.depthM - b.depthM || a.receiver.localeCompare(b.receiver));
}

/** Receivers with stations of the wave, in slot order: upper before lower, near hole before far. */
export function receiversOf(stations: readonly Station[], wave: Wave): Station['receiver'][] {
  const list = [...new Set(stations.filter((s) => s.wave === wave).map((s) => s.receiver))];
  return list.sort((a, b) => slotIndex(a) - slotIndex(b));
}

/** The receiver shown when the user has not chosen one: the first receiver that has stations. */
export function effectiveReceiver(stations: readonly Station[], wave: Wave, chosen: string): string {
  const list = receiversOf(stations, wave);
  if (chosen === '*' || (list as string[]).includes(chosen)) return chosen;
  return list[0] ?? '*';
}

/** The interval a view should show for the current selection: the chosen one, else the one ending at the selected station. */
export function focusInterval(
  d: Derived | null,
  selectedInterval: string | null,
  selectedStation: string | null,
  wave: Wave,
): IntervalKey | null {
  if (!d) return null;
  const sel = selectedInterval ? d.intervals.find((r) => r.key === selectedInterval) : undefined;
  if (sel) return sel.key;
  if (selectedStation) {
    const r =
      d.intervals.find((x) => x.wave === wave && x.stationB === selectedStation) ??
      d.intervals.find((x) => x.wave === wave && x.stationA === selectedStation);
    if (r) return r.key;
  }
  return d.intervals.find((x) => x.wave === wave && x.chosen)?.key ?? null;
}

/** What the working trace of the board's stations is, in words that match what is drawn. */
export function workingTraceLabel(stations: readonly { workingKind: Station['workingKind'] }[]): string {
  const kinds = new Set(stations.map((s) => s.workingKind));
  const words: Record<Station['workingKind'], string> = {
    difference: 'difference of reversed hits',
    sum: 'sum of hits',
    stack: 'stack of hits',
    single: 'single hit',
  };
  if (kinds.size === 1) return words[[...kinds][0]];
  if (kinds.size === 0) return 'working trace';
  return `working trace (${[...kinds].map((k) => words[k]).join(' / ')})`;
}
