/** Small view helpers about picks and stations (lookups only; nothing here computes a pick). */
import type { Pick, Wave } from '../core/model';
import type { EditablePickMethod } from '../core/settings';
import type { Station } from '../core/survey/stations';
import type { Derived } from '../core/pipeline';

const ONSET = new Set(['aic', 'stalta', 'manual']);

export function isMethod(p: Pick, m: EditablePickMethod): boolean {
  return m === 'onset' ? ONSET.has(p.method) : p.method === m;
}

export function pickFor(
  picks: readonly Pick[],
  stationKey: string,
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

/** Receivers with stations of the wave, in survey order: upper before lower, near hole before far. */
export function receiversOf(stations: readonly Station[], wave: Wave): string[] {
  const list = [...new Set(stations.filter((s) => s.wave === wave).map((s) => s.receiver))];
  const rank = (r: string) => (r === 'upper' || r === 'R' ? 0 : r === 'lower' ? 1 : 2);
  const firstDepth = (r: string) => Math.min(...stations.filter((s) => s.receiver === r).map((s) => s.straightPathM));
  return list.sort((a, b) => rank(a) - rank(b) || firstDepth(a) - firstDepth(b));
}

/** The receiver shown when the user has not chosen one: the first receiver that has stations. */
export function effectiveReceiver(stations: readonly Station[], wave: Wave, chosen: string): string {
  const list = receiversOf(stations, wave);
  if (chosen === '*' || list.includes(chosen)) return chosen;
  return list[0] ?? '*';
}

/** The interval a view should show for the current selection: the chosen one, else the one ending at the selected station. */
export function focusInterval(
  d: Derived | null,
  selectedInterval: string | null,
  selectedStation: string | null,
  wave: Wave,
): string | null {
  if (!d) return null;
  if (selectedInterval && d.intervals.some((r) => r.key === selectedInterval)) return selectedInterval;
  if (selectedStation) {
    const r =
      d.intervals.find((x) => x.wave === wave && x.stationB === selectedStation) ??
      d.intervals.find((x) => x.wave === wave && x.stationA === selectedStation);
    if (r) return r.key;
  }
  return d.intervals.find((x) => x.wave === wave && x.chosen)?.key ?? null;
}

export const METHOD_WORDS: Record<string, string> = {
  onset: 'onset',
  peak: 'first peak',
  trough: 'first trough',
  'zero-crossing': 'zero crossing',
  xcorr: 'cross-correlation',
  phase: 'phase slope',
  'ray-fit': 'ray fit',
};

export const METHOD_SHORT: Record<string, string> = {
  onset: 'Onset',
  peak: 'Peak',
  trough: 'Trough',
  'zero-crossing': 'Zero x',
  xcorr: 'X-corr',
  phase: 'Phase',
  'ray-fit': 'Ray fit',
};
