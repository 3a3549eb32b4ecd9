/**
 * Keys that name stations, intervals and edits (docs/project-format.md, "Keys"). Built only here, so
 * every part of the program spells them the same way, and branded so a plain string cannot stand in
 * for one by accident. Keys use receiver slots (r0, r1 ...) and the LOGGED depth in whole millimetres:
 * renaming a hole, changing a unit, the probe spacing or the cone offset keeps every key and edit.
 */
import type { Component, Wave } from './model';

declare const brand: unique symbol;
type Brand<T, B extends string> = T & { readonly [brand]: B };

/** Index in the test kind's receiver layout: r0, r1, ... (never a hole name). */
export type ReceiverSlot = `r${number}`;
/** Logged depth in whole millimetres, as text ("12500"). */
export type DepthKey = Brand<string, 'DepthKey'>;
/** `<slot>@<depth key>:<component>`, e.g. r1@12500:H1. */
export type StationKey = Brand<string, 'StationKey'>;
/** `<station key>|<wave>`. */
export type StationWaveKey = Brand<string, 'StationWaveKey'>;
/** `<station key>|<wave>|<method>`. */
export type PickEditKey = Brand<string, 'PickEditKey'>;
/** `<wave>:<station key a>><station key b>`. */
export type IntervalKey = Brand<string, 'IntervalKey'>;
/** `<slot>@<depth key>`: one receiver at one logged depth (user-fixed horizontal rotation). */
export type ReceiverDepthKey = Brand<string, 'ReceiverDepthKey'>;

export function receiverSlot(index: number): ReceiverSlot {
  return `r${index}`;
}

export function slotIndex(slot: ReceiverSlot): number {
  return Number(slot.slice(1));
}

export function isReceiverSlot(s: string): s is ReceiverSlot {
  return /^r(0|[1-9][0-9]*)$/.test(s);
}

export function depthKey(loggedDepthM: number): DepthKey {
  return String(Math.round(loggedDepthM * 1000)) as DepthKey;
}

export function stationKey(slot: ReceiverSlot, loggedDepthM: number, component: Component): StationKey {
  return `${slot}@${depthKey(loggedDepthM)}:${component}` as StationKey;
}

export function stationWaveKey(station: StationKey, wave: Wave): StationWaveKey {
  return `${station}|${wave}` as StationWaveKey;
}

export function pickEditKey(station: StationKey, wave: Wave, method: string): PickEditKey {
  return `${station}|${wave}|${method}` as PickEditKey;
}

export function intervalKey(wave: Wave, a: StationKey, b: StationKey): IntervalKey {
  return `${wave}:${a}>${b}` as IntervalKey;
}

export function receiverDepthKey(slot: ReceiverSlot, loggedDepthM: number): ReceiverDepthKey {
  return `${slot}@${depthKey(loggedDepthM)}` as ReceiverDepthKey;
}

/** Parts of a station key; null when the text is not one. */
export function parseStationKey(
  key: string,
): { slot: ReceiverSlot; depthMm: number; component: Component; key: StationKey } | null {
  const m = /^(r(?:0|[1-9][0-9]*))@(-?[0-9]+):(H1|H2|V)$/.exec(key);
  if (!m) return null;
  return { slot: m[1] as ReceiverSlot, depthMm: Number(m[2]), component: m[3] as Component, key: key as StationKey };
}

/** The station part of a station-wave key. */
export function stationOfWaveKey(key: StationWaveKey): { station: StationKey; wave: Wave } {
  const i = key.lastIndexOf('|');
  return { station: key.slice(0, i) as StationKey, wave: key.slice(i + 1) as Wave };
}
