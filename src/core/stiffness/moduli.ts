/**
 * Small-strain elastic moduli of an isotropic medium from wave velocities (isotropic elasticity;
 * e.g. Jaeger, Cook & Zimmerman, Fundamentals of Rock Mechanics, 4th ed., ch. 5, from memory):
 *   G = rho Vs^2, M = rho Vp^2, K = M - 4G/3, E = 2G(1 + nu), nu = (r^2 - 2) / (2 (r^2 - 1)), r = Vp/Vs.
 * Trade units: rho in Mg/m3 and V in m/s give kPa (1 Mg/m3 x 1 m2/s2 = 1 kN/m2) (common practice).
 */
import { BorewaveError } from '../errors';

export const STANDARD_GRAVITY_MPS2 = 9.80665;

/** Vp of a saturated soil at or above this, below the water table, is taken as the pore water's (m/s). */
export const PORE_FLUID_VP_MIN_MPS = 1350;

function requirePositive(field: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new BorewaveError('STIFFNESS_INPUT', `${field} = ${value} must be a positive number.`, 'stiffness', field);
  }
}

/** rho = gamma / g: kN/m3 divided by m/s2 gives Mg/m3. */
export function densityMgM3(unitWeightKnM3: number): number {
  requirePositive('unitWeightKnM3', unitWeightKnM3);
  return unitWeightKnM3 / STANDARD_GRAVITY_MPS2;
}

/** Gmax = rho Vs^2, kPa. */
export function gmaxKpa(densityMgM3: number, vsMps: number): number {
  requirePositive('densityMgM3', densityMgM3);
  requirePositive('vsMps', vsMps);
  return densityMgM3 * vsMps * vsMps;
}

/**
 * Poisson's ratio from r = Vp/Vs. Null when r < sqrt(2) (nu would be negative, not a soil skeleton;
 * usually a pick problem). r = sqrt(2) gives 0; a relative slack of 1e-12 on r^2 absorbs rounding.
 */
export function poissonFromVelocityRatio(vpMps: number, vsMps: number): number | null {
  if (!Number.isFinite(vpMps) || !Number.isFinite(vsMps) || vpMps <= 0 || vsMps <= 0) return null;
  const r2 = (vpMps / vsMps) ** 2;
  if (r2 < 2 * (1 - 1e-12)) return null;
  return Math.max(0, (r2 - 2) / (2 * (r2 - 1)));
}

/** E = 2 G (1 + nu), same unit as G. */
export function youngFromShear(gKpa: number, nu: number): number {
  return 2 * gKpa * (1 + nu);
}

/** M = rho Vp^2 (P-wave / constrained modulus), kPa. */
export function constrainedModulusKpa(densityMgM3: number, vpMps: number): number {
  requirePositive('densityMgM3', densityMgM3);
  requirePositive('vpMps', vpMps);
  return densityMgM3 * vpMps * vpMps;
}

/** K = rho (Vp^2 - 4 Vs^2 / 3), kPa. */
export function bulkModulusKpa(densityMgM3: number, vpMps: number, vsMps: number): number {
  requirePositive('densityMgM3', densityMgM3);
  requirePositive('vpMps', vpMps);
  requirePositive('vsMps', vsMps);
  return densityMgM3 * (vpMps * vpMps - (4 / 3) * vsMps * vsMps);
}

/**
 * Below the water table a saturated soil carries P waves at about the speed in water (~1450-1500 m/s,
 * ASTM D7400); then Vp describes the pore fluid, not the skeleton, and Vp/Vs gives the undrained (near 0.5)
 * value, not the skeleton's nu. Band: Vp >= 1350 m/s below the water table (common practice, allowing
 * for scatter). Above the water table Vp is taken to describe the skeleton.
 */
export function isPoreFluidVp(vpMps: number, belowWaterTable: boolean): boolean {
  return belowWaterTable && Number.isFinite(vpMps) && vpMps >= PORE_FLUID_VP_MIN_MPS;
}
