/**
 * Flags: short words attached to picks, delays, stations and intervals that say what to check. Logic
 * matches on some of them (doubtful Vp, a hand pick clearing 'no onset'), so they are a closed union.
 */

/** Flags set by the automatic picker on picks and pair delays. */
export type PickFlag =
  | 'low snr'
  | 'no onset'
  | 'onset at window edge'
  | 'at lag bound'
  | 'low correlation'
  | 'low coherence'
  | 'outside lag bound'
  | 'edited'
  | 'bridges excluded station';

/** Flags on a station (its working trace and position). */
export type StationFlag = 'no reversed pair' | 'flat trace' | 'beyond deviation survey' | 'deviation table rejected';

/** Flags an interval or a direct velocity adds. */
export type ValueFlag =
  | 'slow?'
  | 'fast?'
  | 'non-positive delay'
  | 'non-positive time'
  | 'no path difference'
  | 'no pick'
  | 'no delay'
  | 'methods differ'
  | 'sd widened to the method spread'
  | 'no value'
  | `fallback from ${string}`
  | `vp left out (${string})`;

export type IntervalFlag = PickFlag | StationFlag | ValueFlag;

/** Any flag a pick, delay, station, interval or exported row carries. */
export type Flag = IntervalFlag;

/** P-interval flags that keep its Vp out of Poisson's ratio and the moduli. */
export const DOUBTFUL_VP_FLAGS: ReadonlySet<IntervalFlag> = new Set<IntervalFlag>([
  'low correlation',
  'at lag bound',
  'outside lag bound',
  'slow?',
  'fast?',
  'low snr',
  'no onset',
]);
