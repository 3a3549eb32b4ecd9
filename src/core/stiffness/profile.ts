/**
 * Stiffness profile: for each velocity interval, density and stresses at its mid-depth, Gmax with its
 * uncertainty, Poisson's ratio (from Vp/Vs where Vp describes the skeleton, else the layer's value),
 * E, M, K and Vs1.
 */
import { BorewaveError } from '../errors';
import type { SoilColumn } from '../model';
import {
  bulkModulusKpa,
  constrainedModulusKpa,
  densityMgM3,
  gmaxKpa,
  isPoreFluidVp,
  poissonFromVelocityRatio,
  youngFromShear,
} from './moduli';
import { ATMOSPHERIC_PRESSURE_KPA, stressNormalisedVs } from './normalise';
import { layerAt, soilColumnBottomM, validateSoilColumn, verticalStressAt } from './stress';

export interface VelocityInterval {
  topM: number;
  bottomM: number;
  vsMps: number;
  vsSdMps: number;
  vpMps: number | null;
  vpSdMps: number | null;
  flags: string[];
}

export interface StiffnessRow {
  topM: number;
  bottomM: number;
  midM: number;
  vsMps: number;
  vsSdMps: number;
  vpMps: number | null;
  densityMgM3: number;
  sigmaVKpa: number;
  porePressureKpa: number;
  sigmaVEffKpa: number;
  gmaxKpa: number;
  gmaxSdKpa: number;
  poissonRatio: number;
  poissonSource: 'vp/vs' | 'user';
  youngKpa: number;
  constrainedKpa: number | null;
  bulkKpa: number | null;
  vs1Mps: number | null;
  stressExponent: number;
  flags: string[];
}

export const STIFFNESS_FLAGS = {
  poreWater: 'vp is pore water',
  lowVpVs: 'vp/vs < sqrt 2',
  noEffectiveStress: 'sigma_v_eff <= 0',
  spansLayers: 'spans soil layers',
  belowSoil: 'below soil column',
  spansWaterTable: 'spans water table',
} as const;

export interface StiffnessOptions {
  /** Reference pressure for Vs1, kPa (default 101.325). */
  paKpa?: number;
}

/**
 * Row flags: the interval's own flags first, then the stiffness flags (STIFFNESS_FLAGS).
 * Density, stresses and the layer (n, nu) are taken at the interval's mid-depth. gmaxSd propagates the
 * Vs uncertainty only, to first order: sd(G) = 2 rho Vs sd(Vs) (density uncertainty not included).
 * Where Vp is the pore water or Vp/Vs < sqrt 2, nu is the layer's and M, K are null.
 * Throws BorewaveError when the soil column is invalid or an interval has bad depths or Vs.
 */
export function stiffnessProfile(
  intervals: VelocityInterval[],
  soil: SoilColumn,
  o: StiffnessOptions = {},
): StiffnessRow[] {
  const problems = validateSoilColumn(soil);
  if (problems.length > 0) {
    const p = problems[0];
    throw new BorewaveError(p.code, p.message, p.file, p.field);
  }
  const paKpa = o.paKpa ?? ATMOSPHERIC_PRESSURE_KPA;
  const soilBottomM = soilColumnBottomM(soil);
  return intervals.map((iv) => {
    const item = `interval ${iv.topM}-${iv.bottomM} m`;
    if (!Number.isFinite(iv.topM) || !Number.isFinite(iv.bottomM) || iv.topM < 0 || iv.bottomM <= iv.topM) {
      throw new BorewaveError(
        'STIFFNESS_INTERVAL',
        `${item}: top and bottom must satisfy 0 <= top < bottom.`,
        item,
        'topM/bottomM',
      );
    }
    if (!Number.isFinite(iv.vsMps) || iv.vsMps <= 0) {
      throw new BorewaveError('STIFFNESS_INTERVAL', `${item}: Vs ${iv.vsMps} m/s must be positive.`, item, 'vsMps');
    }
    const flags = [...iv.flags];
    const addFlag = (f: string) => {
      if (!flags.includes(f)) flags.push(f);
    };
    const midM = 0.5 * (iv.topM + iv.bottomM);
    const layer = layerAt(soil, midM);
    if (soil.layers.some((l) => l.topM > iv.topM && l.topM < iv.bottomM)) addFlag(STIFFNESS_FLAGS.spansLayers);
    if (midM > soilBottomM) addFlag(STIFFNESS_FLAGS.belowSoil);
    const zw = soil.waterTableM;
    if (zw !== null && zw > iv.topM && zw < iv.bottomM) addFlag(STIFFNESS_FLAGS.spansWaterTable);

    const rho = densityMgM3(layer.unitWeightKnM3);
    const stress = verticalStressAt(soil, midM);
    const g = gmaxKpa(rho, iv.vsMps);
    const gSd = Number.isFinite(iv.vsSdMps) && iv.vsSdMps > 0 ? 2 * rho * iv.vsMps * iv.vsSdMps : 0;

    let nu = layer.poissonRatio;
    let poissonSource: 'vp/vs' | 'user' = 'user';
    let constrainedKpa: number | null = null;
    let bulkKpa: number | null = null;
    const vp = iv.vpMps;
    if (vp !== null && Number.isFinite(vp) && vp > 0) {
      const below = zw !== null && midM > zw;
      const fromRatio = poissonFromVelocityRatio(vp, iv.vsMps);
      if (isPoreFluidVp(vp, below)) {
        addFlag(STIFFNESS_FLAGS.poreWater);
      } else if (fromRatio === null) {
        addFlag(STIFFNESS_FLAGS.lowVpVs);
      } else {
        nu = fromRatio;
        poissonSource = 'vp/vs';
        constrainedKpa = constrainedModulusKpa(rho, vp);
        bulkKpa = bulkModulusKpa(rho, vp, iv.vsMps);
      }
    }

    let vs1Mps: number | null = null;
    if (stress.effectiveKpa > 0)
      vs1Mps = stressNormalisedVs(iv.vsMps, stress.effectiveKpa, layer.stressExponent, paKpa);
    else addFlag(STIFFNESS_FLAGS.noEffectiveStress);

    return {
      topM: iv.topM,
      bottomM: iv.bottomM,
      midM,
      vsMps: iv.vsMps,
      vsSdMps: iv.vsSdMps,
      vpMps: iv.vpMps,
      densityMgM3: rho,
      sigmaVKpa: stress.totalKpa,
      porePressureKpa: stress.poreKpa,
      sigmaVEffKpa: stress.effectiveKpa,
      gmaxKpa: g,
      gmaxSdKpa: gSd,
      poissonRatio: nu,
      poissonSource,
      youngKpa: youngFromShear(g, nu),
      constrainedKpa,
      bulkKpa,
      vs1Mps,
      stressExponent: layer.stressExponent,
      flags,
    };
  });
}
