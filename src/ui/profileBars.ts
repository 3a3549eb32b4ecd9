/**
 * The Vs bars of the Profile plot, in display units: the 95% range of each profile row (the chosen S
 * interval's low95Mps / high95Mps, computed in the core: velocity/intervals.ts setRange95), drawn as
 * asymmetric bars (the low end is floored at 0, so the two arms can differ); a row without a range keeps
 * its +-1 sd bar, in a trace of its own so that its name says so. Nothing is computed here but the
 * lengths of the arms.
 */
import { toDisplay, vsBarMps, type ProfileRow, type UnitSystem } from '../core';

export interface AsymmetricBars {
  x: number[];
  y: number[];
  /** Arm towards higher values (high95 - v), display units. */
  plus: number[];
  /** Arm towards lower values (v - low95), display units. */
  minus: number[];
}

export interface VsBars {
  /** Rows with a 95% range. */
  range95: AsymmetricBars;
  /** Rows without one: +-1 sd both ways. */
  sdOnly: AsymmetricBars;
}

const empty = (): AsymmetricBars => ({ x: [], y: [], plus: [], minus: [] });

/** Vs bars of the profile rows at their mid-depths: the 95% range where a row has one, else +-1 sd. */
export function vsBars(
  rows: readonly Pick<ProfileRow, 'midM' | 'vsMps' | 'vsSdMps' | 'vsLow95Mps' | 'vsHigh95Mps'>[],
  units: UnitSystem,
): VsBars {
  const v = (mps: number) => toDisplay('velocity', units, mps);
  const out: VsBars = { range95: empty(), sdOnly: empty() };
  for (const r of rows) {
    if (!Number.isFinite(r.vsMps)) continue;
    const bar = vsBarMps(r.vsMps, r.vsSdMps, r.vsLow95Mps, r.vsHigh95Mps);
    const to = bar.isRange95 ? out.range95 : out.sdOnly;
    to.x.push(v(r.vsMps));
    to.y.push(toDisplay('depth', units, r.midM));
    to.plus.push(v(bar.highMps) - v(r.vsMps));
    to.minus.push(v(r.vsMps) - v(bar.lowMps));
  }
  return out;
}
