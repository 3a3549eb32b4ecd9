/**
 * Stress-normalised shear-wave velocity: Vs1 = Vs (Pa / sigma'_v)^n.
 * Pa defaults to one standard atmosphere, 101.325 kPa (common practice); much of the liquefaction
 * literature uses 100 kPa, so Pa can be set.
 */
import { BorewaveError } from '../errors';

export const ATMOSPHERIC_PRESSURE_KPA = 101.325;

export function stressNormalisedVs(
  vsMps: number,
  effectiveStressKpa: number,
  exponent: number,
  paKpa: number = ATMOSPHERIC_PRESSURE_KPA,
): number {
  if (!Number.isFinite(effectiveStressKpa) || effectiveStressKpa <= 0) {
    throw new BorewaveError(
      'VS1_STRESS',
      `Effective stress ${effectiveStressKpa} kPa must be positive to normalise Vs.`,
      'stiffness',
      'effectiveStressKpa',
    );
  }
  if (!Number.isFinite(paKpa) || paKpa <= 0) {
    throw new BorewaveError('VS1_PA', `Reference pressure ${paKpa} kPa must be positive.`, 'stiffness', 'paKpa');
  }
  return vsMps * Math.pow(paKpa / effectiveStressKpa, exponent);
}

/**
 * Choices offered for n. Vs scales with stress at half the exponent of Gmax (Gmax = rho Vs^2).
 */
export const STRESS_EXPONENT_CHOICES: { label: string; n: number; source: string }[] = [
  {
    label: 'Sand, gravel',
    n: 0.25,
    source:
      // Provenance: citations recalled, not checked against the papers (docs/site-class-sources.md).
      'Robertson et al. (1992), Can. Geotech. J. 29; Andrus & Stokoe (2000), JGGE 126(11)',
  },
  { label: 'Silt, low-plasticity clay', n: 0.35, source: 'common practice: between the sand and clay values' },
  { label: 'Clay', n: 0.5, source: 'common practice: upper end of values used for clays' },
  { label: 'No normalisation', n: 0, source: 'Vs1 = Vs' },
];
