/** Display helpers: SI inside, the chosen unit system on screen (conversions from core/units). */
import { toDisplay, fromDisplay, unitSpec, type QuantityKind, type UnitSystem } from '../core';
import { useApp } from '../state/store';

export function useUnits(): UnitSystem {
  return useApp((s) => s.unitSystem);
}

export function label(kind: QuantityKind, u: UnitSystem): string {
  return unitSpec(kind, u).label;
}

/** Number for a table cell (no unit; the unit is in the column head). Non-finite -> en dash. */
export function fmt(kind: QuantityKind, u: UnitSystem, si: number | null | undefined, decimals?: number): string {
  if (si === null || si === undefined || !Number.isFinite(si)) return '–';
  return toDisplay(kind, u, si).toFixed(decimals ?? unitSpec(kind, u).decimals);
}

/** A velocity's 95% range for a table cell, 'low–high' in display units; an en dash without one. */
export function fmtRange95(u: UnitSystem, lowMps: number | null, highMps: number | null): string {
  return lowMps !== null && highMps !== null ? `${fmt('velocity', u, lowMps)}–${fmt('velocity', u, highMps)}` : '–';
}

export function disp(kind: QuantityKind, u: UnitSystem, si: number): number {
  return toDisplay(kind, u, si);
}

/** Display value back to SI. */
export function undisp(kind: QuantityKind, u: UnitSystem, value: number): number {
  return fromDisplay(kind, u, value);
}

/** Parses a number typed in display units back to SI; null when it is not a number. */
export function parseDisplay(kind: QuantityKind, u: UnitSystem, text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  const v = Number(t);
  return Number.isFinite(v) ? fromDisplay(kind, u, v) : null;
}

export function ms(s: number | null | undefined, decimals = 2): string {
  return s === null || s === undefined || !Number.isFinite(s) ? '–' : (s * 1000).toFixed(decimals);
}
