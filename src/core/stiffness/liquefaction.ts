/**
 * Vs-based liquefaction triggering SCREEN (not a design check on its own).
 *
 * Demand: the simplified procedure as summarised by Youd et al. (2001), "Liquefaction resistance of soils:
 * summary report from the 1996 NCEER and 1998 NCEER/NSF workshops", J. Geotech. Geoenviron. Eng. 127(10):
 *   CSR = 0.65 (amax/g) (sigma_v / sigma'_v) rd
 *   rd  = (1 - 0.4113 z^0.5 + 0.04052 z + 0.001753 z^1.5) /
 *         (1 - 0.4177 z^0.5 + 0.05729 z - 0.006205 z^1.5 + 0.001210 z^2), z in m (Blake's fit, their eq. 3)
 *   MSF = 10^2.24 / Mw^2.56 (Idriss's revised factors: the summary's lower bound for Mw < 7.5 and its
 *         recommendation for Mw > 7.5; the conservative choice over the whole range)
 * Resistance: Andrus & Stokoe (2000), "Liquefaction resistance of soils from shear-wave velocity",
 * J. Geotech. Geoenviron. Eng. 126(11), for Mw = 7.5 and uncemented Holocene soils:
 *   CRR = a (Vs1/100)^2 + b (1/(Vs1* - Vs1) - 1/Vs1*), a = 0.022, b = 2.8
 *   Vs1* = 215 m/s for FC <= 5 %, 215 - 0.5 (FC - 5) for 5 < FC < 35 %, 200 m/s for FC >= 35 %
 *   Vs1 = Vs (Pa / sigma'_v)^0.25 with Pa = 100 kPa (the procedure's own normalisation)
 * FS = CRR MSF / CSR. No K_sigma or K_alpha correction is applied.
 * (Coefficients recalled from memory: check against the papers before relying on them.)
 */
import { BorewaveError } from '../errors';
import type { SoilType } from './curves';

export const LIQUEFIABLE_TYPES: SoilType[] = ['sand', 'silty-sand'];

/** Reference pressure and exponent of the Vs1 used by Andrus & Stokoe (2000). */
export const AS2000_PA_KPA = 100;
export const AS2000_EXPONENT = 0.25;
export const AS2000_A = 0.022;
export const AS2000_B = 2.8;

/** Stress reduction coefficient rd at depth z (m), Youd et al. (2001) eq. 3 (Blake 1996 fit). */
export function stressReductionRd(depthM: number): number {
  if (!Number.isFinite(depthM) || depthM < 0)
    throw new BorewaveError(
      'LIQ_DEPTH',
      `Depth ${depthM} m must be at or below the ground surface.`,
      'liquefaction',
      'depthM',
    );
  const z = depthM;
  const r = Math.sqrt(z);
  const num = 1 - 0.4113 * r + 0.04052 * z + 0.001753 * z * r;
  const den = 1 - 0.4177 * r + 0.05729 * z - 0.006205 * z * r + 0.00121 * z * z;
  return num / den;
}

/** Magnitude scaling factor, Idriss's revised factors as given by Youd et al. (2001): 10^2.24 / Mw^2.56. */
export function magnitudeScalingFactor(mw: number): number {
  if (!Number.isFinite(mw) || mw <= 0)
    throw new BorewaveError('LIQ_MAGNITUDE', `Magnitude ${mw} must be positive.`, 'liquefaction', 'magnitude');
  return 10 ** 2.24 / mw ** 2.56;
}

/** Upper bound of the summary's recommended range for Mw < 7.5: (Mw/7.5)^-3.3 (Andrus & Stokoe 1997). */
export function magnitudeScalingFactorUpper(mw: number): number {
  if (!Number.isFinite(mw) || mw <= 0)
    throw new BorewaveError('LIQ_MAGNITUDE', `Magnitude ${mw} must be positive.`, 'liquefaction', 'magnitude');
  return mw < 7.5 ? (mw / 7.5) ** -3.3 : magnitudeScalingFactor(mw);
}

/** CSR = 0.65 (amax/g) (sigma_v / sigma'_v) rd. */
export function cyclicStressRatio(pgaG: number, sigmaVKpa: number, sigmaVEffKpa: number, rd: number): number {
  return 0.65 * pgaG * (sigmaVKpa / sigmaVEffKpa) * rd;
}

/** Limiting upper Vs1* (m/s) by fines content, Andrus & Stokoe (2000); null FC = clean sand (lowest CRR). */
export function limitingVs1Mps(finesContentPct: number | null): number {
  const fc = finesContentPct === null || !Number.isFinite(finesContentPct) ? 0 : finesContentPct;
  if (fc <= 5) return 215;
  if (fc >= 35) return 200;
  return 215 - 0.5 * (fc - 5);
}

/** CRR for Mw 7.5 from Vs1 (Andrus & Stokoe 2000); null when Vs1 >= Vs1* (outside the relation: no triggering). */
export function cyclicResistanceRatio75(vs1Mps: number, vs1StarMps: number): number | null {
  if (!Number.isFinite(vs1Mps) || vs1Mps <= 0) return null;
  if (vs1Mps >= vs1StarMps) return null;
  return AS2000_A * (vs1Mps / 100) ** 2 + AS2000_B * (1 / (vs1StarMps - vs1Mps) - 1 / vs1StarMps);
}

/** Vs1 = Vs (100 kPa / sigma'_v)^0.25 as the procedure defines it (whatever exponent the profile uses). */
export function vs1ForLiquefaction(vsMps: number, sigmaVEffKpa: number): number {
  return vsMps * (AS2000_PA_KPA / sigmaVEffKpa) ** AS2000_EXPONENT;
}

export interface LiquefactionInput {
  /** Depth range this row stands for; the check is made at midM. */
  topM: number;
  bottomM: number;
  midM: number;
  vsMps: number;
  sigmaVKpa: number;
  sigmaVEffKpa: number;
  soilType: SoilType | null;
  finesContentPct: number | null;
  /** Whether midM is below the water table. */
  saturated: boolean;
}

export interface Shaking {
  pgaG: number;
  magnitude: number;
}

export type LiquefactionStatus = 'screened' | 'not-susceptible-type' | 'above-water-table' | 'vs1-above-limit';

export interface LiquefactionRow {
  topM: number;
  bottomM: number;
  midM: number;
  soilType: SoilType | null;
  status: LiquefactionStatus;
  vsMps: number;
  sigmaVKpa: number;
  sigmaVEffKpa: number;
  vs1Mps: number | null;
  finesContentPct: number | null;
  vs1StarMps: number | null;
  rd: number | null;
  csr: number | null;
  crr75: number | null;
  msf: number;
  /** FS = CRR MSF / CSR; null when not screened or Vs1 >= Vs1*. */
  factorOfSafety: number | null;
  flags: string[];
}

export const LIQ_FLAGS = {
  deep: 'deeper than 20 m: beyond the simplified procedure case histories',
  highStress: "sigma'_v > 100 kPa: K_sigma not applied",
  vs1High: 'Vs1 >= Vs1*: outside the CRR relation (no triggering by it)',
  fcDefault: 'fines content not given: clean-sand Vs1* used',
  outsideMagnitude: 'magnitude outside 5.5-8.5',
  nearLimit: 'Vs1 within 10 m/s of Vs1*: CRR very sensitive to Vs',
} as const;

export function liquefactionScreen(rows: readonly LiquefactionInput[], shaking: Shaking): LiquefactionRow[] {
  if (!Number.isFinite(shaking.pgaG) || shaking.pgaG <= 0 || shaking.pgaG > 3)
    throw new BorewaveError(
      'LIQ_PGA',
      `Peak ground acceleration ${shaking.pgaG} g must be above 0 and at most 3.`,
      'liquefaction',
      'pgaG',
    );
  const msf = magnitudeScalingFactor(shaking.magnitude);
  return rows.map((r) => {
    const base = {
      topM: r.topM,
      bottomM: r.bottomM,
      midM: r.midM,
      soilType: r.soilType,
      vsMps: r.vsMps,
      sigmaVKpa: r.sigmaVKpa,
      sigmaVEffKpa: r.sigmaVEffKpa,
      finesContentPct: r.finesContentPct,
      msf,
    };
    const empty = { vs1Mps: null, vs1StarMps: null, rd: null, csr: null, crr75: null, factorOfSafety: null };
    if (!r.soilType || !LIQUEFIABLE_TYPES.includes(r.soilType))
      return { ...base, ...empty, status: 'not-susceptible-type' as const, flags: [] };
    if (!r.saturated || !(r.sigmaVEffKpa > 0))
      return { ...base, ...empty, status: 'above-water-table' as const, flags: [] };
    const flags: string[] = [];
    if (r.finesContentPct === null) flags.push(LIQ_FLAGS.fcDefault);
    if (r.midM > 20) flags.push(LIQ_FLAGS.deep);
    if (r.sigmaVEffKpa > 100) flags.push(LIQ_FLAGS.highStress);
    if (shaking.magnitude < 5.5 || shaking.magnitude > 8.5) flags.push(LIQ_FLAGS.outsideMagnitude);
    const vs1 = vs1ForLiquefaction(r.vsMps, r.sigmaVEffKpa);
    const vs1Star = limitingVs1Mps(r.finesContentPct);
    const rd = stressReductionRd(r.midM);
    const csr = cyclicStressRatio(shaking.pgaG, r.sigmaVKpa, r.sigmaVEffKpa, rd);
    const crr = cyclicResistanceRatio75(vs1, vs1Star);
    if (crr === null) flags.push(LIQ_FLAGS.vs1High);
    // Near the asymptote a few m/s of Vs change CRR several-fold: say so (our guard, common practice).
    else if (vs1Star - vs1 < 10) flags.push(LIQ_FLAGS.nearLimit);
    return {
      ...base,
      status: crr === null ? ('vs1-above-limit' as const) : ('screened' as const),
      vs1Mps: vs1,
      vs1StarMps: vs1Star,
      rd,
      csr,
      crr75: crr,
      factorOfSafety: crr === null ? null : (crr * msf) / csr,
      flags,
    };
  });
}

export const LIQUEFACTION_METHOD =
  'CSR: simplified procedure (Youd et al. 2001; rd Blake fit; MSF Idriss revised); CRR: Andrus & Stokoe (2000) Vs1, Mw 7.5';

export const LIQUEFACTION_CAUTIONS: string[] = [
  'Liquefaction triggering SCREEN from shear-wave velocity only: not for design on its own.',
  'Applies to uncemented Holocene sands and silty sands within the Vs1 range of the case histories (about 100-250 m/s); aged or cemented soils, gravels and soils with plastic fines are outside it.',
  "Peak ground acceleration and magnitude are the user's inputs; no K_sigma or K_alpha correction is applied.",
  'Local codes and a qualified professional govern; confirm with penetration tests (SPT, CPT) and site-specific study.',
];
