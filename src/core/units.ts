/**
 * SI <-> US customary units for display and CSV columns. Values inside the core are SI in these units:
 *   depth m, velocity m/s, stress kPa, modulus kPa, unit weight kN/m3, density Mg/m3.
 * Factors are built from the exact definitions (international foot, 1959: 1 ft = 0.3048 m;
 * avoirdupois pound: 1 lb = 0.45359237 kg; standard gravity 9.80665 m/s2 for the pound-force),
 * so every conversion is exact up to floating point (NIST SP 811, appendix B; from memory).
 */

export type UnitSystem = 'SI' | 'US';

export type QuantityKind = 'depth' | 'velocity' | 'stress' | 'modulus' | 'unitWeight' | 'density';

export const M_PER_FT = 0.3048;
export const FT_PER_M = 1 / M_PER_FT;
export const KG_PER_LB = 0.45359237;
/** Standard gravity, m/s2 (defines the pound-force). */
const G0_MPS2 = 9.80665;
/** Pound-force in newtons: 0.45359237 kg x 9.80665 m/s2. */
export const N_PER_LBF = KG_PER_LB * G0_MPS2;

const FT2_M2 = M_PER_FT * M_PER_FT;
const FT3_M3 = FT2_M2 * M_PER_FT;
/** kPa per psf (lbf/ft2). */
export const KPA_PER_PSF = N_PER_LBF / FT2_M2 / 1000;
/** kPa per ksi (1000 lbf/in2); 1 in = 0.0254 m. */
export const KPA_PER_KSI = (1000 * N_PER_LBF) / (0.0254 * 0.0254) / 1000;
/** kN/m3 per pcf (lbf/ft3). */
export const KNM3_PER_PCF = N_PER_LBF / FT3_M3 / 1000;
/** Mg/m3 per lb/ft3 (mass density). */
export const MGM3_PER_LBFT3 = KG_PER_LB / FT3_M3 / 1000;

export interface UnitSpec {
  /** Label for the UI (axis titles, table heads). */
  label: string;
  /** ASCII suffix for CSV column names, e.g. 'mps' in vs_mps. */
  csvSuffix: string;
  /** Display value = internal SI value x factor. */
  factor: number;
  /** Default decimals for display. */
  decimals: number;
}

const SPECS: Record<QuantityKind, Record<UnitSystem, UnitSpec>> = {
  depth: {
    SI: { label: 'm', csvSuffix: 'm', factor: 1, decimals: 2 },
    US: { label: 'ft', csvSuffix: 'ft', factor: FT_PER_M, decimals: 1 },
  },
  velocity: {
    SI: { label: 'm/s', csvSuffix: 'mps', factor: 1, decimals: 0 },
    US: { label: 'ft/s', csvSuffix: 'ftps', factor: FT_PER_M, decimals: 0 },
  },
  stress: {
    SI: { label: 'kPa', csvSuffix: 'kpa', factor: 1, decimals: 1 },
    US: { label: 'psf', csvSuffix: 'psf', factor: 1 / KPA_PER_PSF, decimals: 0 },
  },
  modulus: {
    SI: { label: 'MPa', csvSuffix: 'mpa', factor: 1 / 1000, decimals: 1 },
    US: { label: 'ksi', csvSuffix: 'ksi', factor: 1 / KPA_PER_KSI, decimals: 2 },
  },
  unitWeight: {
    SI: { label: 'kN/m³', csvSuffix: 'knm3', factor: 1, decimals: 1 },
    US: { label: 'pcf', csvSuffix: 'pcf', factor: 1 / KNM3_PER_PCF, decimals: 1 },
  },
  density: {
    SI: { label: 'Mg/m³', csvSuffix: 'mgm3', factor: 1, decimals: 3 },
    US: { label: 'lb/ft³', csvSuffix: 'lbft3', factor: 1 / MGM3_PER_LBFT3, decimals: 1 },
  },
};

export function unitSpec(kind: QuantityKind, system: UnitSystem): UnitSpec {
  return SPECS[kind][system];
}

/** Internal SI value -> display value in the chosen system. */
export function toDisplay(kind: QuantityKind, system: UnitSystem, siValue: number): number {
  return siValue * SPECS[kind][system].factor;
}

/** Display value in the chosen system -> internal SI value (for user entry). */
export function fromDisplay(kind: QuantityKind, system: UnitSystem, displayValue: number): number {
  return displayValue / SPECS[kind][system].factor;
}

export interface FormatOptions {
  decimals?: number;
  /** Append the unit label (default true). */
  withUnit?: boolean;
}

/** Internal SI value -> text, e.g. formatQuantity('velocity', 'US', 270.68) = '888 ft/s'. Non-finite -> '–'. */
export function formatQuantity(kind: QuantityKind, system: UnitSystem, siValue: number, o: FormatOptions = {}): string {
  if (!Number.isFinite(siValue)) return '–';
  const spec = SPECS[kind][system];
  const text = toDisplay(kind, system, siValue).toFixed(o.decimals ?? spec.decimals);
  return o.withUnit === false ? text : `${text} ${spec.label}`;
}

/** CSV column name with its unit, e.g. csvColumn('vs', 'velocity', 'SI') = 'vs_mps'. */
export function csvColumn(base: string, kind: QuantityKind, system: UnitSystem): string {
  return `${base}_${SPECS[kind][system].csvSuffix}`;
}
