/**
 * Modulus reduction (G/Gmax) and damping (D) curves against shear strain, per soil layer.
 *
 * Strain is in PERCENT everywhere in this module (gammaPct = 0.0352 means 0.0352 %); damping in percent.
 *
 * Main model: Darendeli (2001), "Development of a new family of normalized modulus reduction and material
 * damping curves", PhD dissertation, University of Texas at Austin (coefficients phi1..phi12 of his
 * calibrated model for all soils). Alternative for comparison: Ishibashi & Zhang (1993), "Unified dynamic
 * shear moduli and damping ratios of sand and clay", Soils and Foundations 33(1), closed form.
 */
import { BorewaveError } from '../errors';
import type { SoilType } from '../model';

// ------------------------------------------------------------------ inputs

export type { SoilType };
export const SOIL_TYPES: SoilType[] = ['clay', 'silt', 'sand', 'silty-sand', 'gravel', 'rock', 'other'];

export type CurveModel = 'darendeli' | 'ishibashi-zhang';
export const CURVE_MODELS: CurveModel[] = ['darendeli', 'ishibashi-zhang'];

/** One atmosphere, kPa: Darendeli normalises the mean effective stress by it. */
export const ATM_KPA = 101.325;

/** Per-layer soil fields as in the project format; null = not given (a default is used and reported). */
export interface LayerSoilFields {
  soilType: SoilType | null;
  plasticityIndexPct: number | null;
  ocr: number | null;
  finesContentPct: number | null;
  k0: number | null;
  workingStrainPct: number | null;
}

export type SoilValueSource = 'user' | 'default';

export interface ResolvedSoilFields {
  soilType: SoilType;
  plasticityIndexPct: number;
  piSource: SoilValueSource;
  ocr: number;
  ocrSource: SoilValueSource;
  k0: number;
  k0Source: SoilValueSource;
  workingStrainPct: number | null;
}

/**
 * Defaults where the user gave nothing, all "common practice" placeholders to be replaced by lab data:
 *  - PI: 0 for sand, silty sand, gravel (non-plastic) and rock/other; 10 for silt; 25 for clay
 *    (a low-to-medium plasticity clay).
 *  - OCR: 1 (normally consolidated).
 *  - K0: Jaky (1944) K0 = 1 - sin(phi') with phi' = 30 deg, i.e. 0.5, times OCR^sin(phi') for
 *    overconsolidated soil (Mayne & Kulhawy 1982, J. Geotech. Eng. 108(GT6)) -> 0.5 OCR^0.5.
 */
export const DEFAULT_PI_PCT: Record<SoilType, number> = {
  clay: 25,
  silt: 10,
  sand: 0,
  'silty-sand': 0,
  gravel: 0,
  rock: 0,
  other: 0,
};
export const DEFAULT_FRICTION_ANGLE_DEG = 30;

export function defaultK0(ocr: number): number {
  const s = Math.sin((DEFAULT_FRICTION_ANGLE_DEG * Math.PI) / 180);
  return (1 - s) * ocr ** s;
}

export function resolveSoilFields(f: LayerSoilFields): ResolvedSoilFields {
  // An unknown type (a hand-edited project) is treated as 'other' rather than producing NaN defaults.
  const soilType: SoilType = f.soilType && SOIL_TYPES.includes(f.soilType) ? f.soilType : 'other';
  const piGiven = typeof f.plasticityIndexPct === 'number' && Number.isFinite(f.plasticityIndexPct);
  const ocrGiven = typeof f.ocr === 'number' && Number.isFinite(f.ocr) && f.ocr >= 1;
  const ocr = ocrGiven ? (f.ocr as number) : 1;
  const k0Given = typeof f.k0 === 'number' && Number.isFinite(f.k0) && f.k0 > 0;
  const w = f.workingStrainPct;
  return {
    soilType,
    plasticityIndexPct: piGiven ? Math.max(0, f.plasticityIndexPct as number) : DEFAULT_PI_PCT[soilType],
    piSource: piGiven ? 'user' : 'default',
    ocr,
    ocrSource: ocrGiven ? 'user' : 'default',
    k0: k0Given ? (f.k0 as number) : defaultK0(ocr),
    k0Source: k0Given ? 'user' : 'default',
    workingStrainPct: typeof w === 'number' && Number.isFinite(w) && w > 0 ? w : null,
  };
}

/** Mean effective stress sigma'_m = sigma'_v (1 + 2 K0) / 3, kPa (isotropic in the horizontal plane). */
export function meanEffectiveStressKpa(sigmaVEffKpa: number, k0: number): number {
  return (sigmaVEffKpa * (1 + 2 * k0)) / 3;
}

// ------------------------------------------------------------------ strain grid

/** Strains from 0.0001 % to 1 %, log spaced, `perDecade` points a decade (inclusive ends). */
export function strainGridPct(perDecade = 10): number[] {
  const n = 4 * perDecade;
  return Array.from({ length: n + 1 }, (_, i) => 10 ** (-4 + (4 * i) / n));
}

// ------------------------------------------------------------------ Darendeli (2001)

/**
 * Darendeli (2001) calibrated coefficients for all soil types. phi1..phi5 as in the issue;
 * phi6..phi12 (from memory: check against the dissertation's table before relying on them).
 */
export const DARENDELI = {
  phi1: 0.0352,
  phi2: 0.001,
  phi3: 0.3246,
  phi4: 0.3483,
  phi5: 0.919, // curvature a
  phi6: 0.8005,
  phi7: 0.0129,
  phi8: -0.1069,
  phi9: -0.2889,
  phi10: 0.2919,
  phi11: 0.6329,
  phi12: -0.0057,
} as const;

export interface DarendeliInput {
  plasticityIndexPct: number;
  ocr: number;
  meanEffectiveStressKpa: number;
  loadingFrequencyHz: number;
  loadingCycles: number;
}

export interface DarendeliParams {
  referenceStrainPct: number;
  curvature: number;
  dminPct: number;
  /** Masing scaling b = phi11 + phi12 ln N. */
  scalingB: number;
}

function requirePositive(x: number, field: string): void {
  if (!Number.isFinite(x) || x <= 0)
    throw new BorewaveError('CURVE_INPUT', `${field} ${x} must be a positive number.`, 'curves', field);
}

/** gamma_r (%) = (phi1 + phi2 PI OCR^phi3) (sigma'_m / 1 atm)^phi4 (Darendeli 2001). */
export function darendeliReferenceStrainPct(piPct: number, ocr: number, sigmaMKpa: number): number {
  requirePositive(sigmaMKpa, 'meanEffectiveStressKpa');
  const { phi1, phi2, phi3, phi4 } = DARENDELI;
  return (phi1 + phi2 * piPct * ocr ** phi3) * (sigmaMKpa / ATM_KPA) ** phi4;
}

/** Dmin (%) = (phi6 + phi7 PI OCR^phi8) (sigma'_m / 1 atm)^phi9 (1 + phi10 ln f) (Darendeli 2001). */
export function darendeliDminPct(piPct: number, ocr: number, sigmaMKpa: number, frequencyHz: number): number {
  requirePositive(sigmaMKpa, 'meanEffectiveStressKpa');
  requirePositive(frequencyHz, 'frequencyHz');
  const { phi6, phi7, phi8, phi9, phi10 } = DARENDELI;
  return (phi6 + phi7 * piPct * ocr ** phi8) * (sigmaMKpa / ATM_KPA) ** phi9 * (1 + phi10 * Math.log(frequencyHz));
}

export function darendeliParams(i: DarendeliInput): DarendeliParams {
  requirePositive(i.loadingCycles, 'loadingCycles');
  return {
    referenceStrainPct: darendeliReferenceStrainPct(i.plasticityIndexPct, i.ocr, i.meanEffectiveStressKpa),
    curvature: DARENDELI.phi5,
    dminPct: darendeliDminPct(i.plasticityIndexPct, i.ocr, i.meanEffectiveStressKpa, i.loadingFrequencyHz),
    scalingB: DARENDELI.phi11 + DARENDELI.phi12 * Math.log(i.loadingCycles),
  };
}

/** Modified hyperbola G/Gmax = 1 / (1 + (gamma/gamma_r)^a). */
export function darendeliModulusRatio(strainPct: number, p: DarendeliParams): number {
  if (strainPct <= 0) return 1;
  return 1 / (1 + (strainPct / p.referenceStrainPct) ** p.curvature);
}

/**
 * Masing damping (%) of the hyperbola with a = 1 (Darendeli 2001):
 *   D_M,a=1 = (100/pi) [4 (g - gr ln((g + gr)/gr)) / (g^2 / (g + gr)) - 2]
 * then corrected to the curvature a with the polynomial c1 D + c2 D^2 + c3 D^3,
 *   c1 = -1.1143 a^2 + 1.8618 a + 0.2523, c2 = 0.0805 a^2 - 0.0710 a - 0.0095,
 *   c3 = -0.0005 a^2 + 0.0002 a + 0.0003 (from memory: check against the dissertation).
 */
export function masingDampingPct(strainPct: number, referenceStrainPct: number, curvature: number): number {
  if (strainPct <= 0) return 0;
  const g = strainPct;
  const gr = referenceStrainPct;
  const x = g / gr;
  // x = g/gr. For tiny x the closed form cancels; its series is (100/pi)(2x/3 - x^2/3 + x^3/5 - ...).
  const d1 =
    x < 1e-4
      ? (100 / Math.PI) * ((2 * x) / 3 - (x * x) / 3)
      : (100 / Math.PI) * ((4 * (g - gr * Math.log1p(x))) / ((g * g) / (g + gr)) - 2);
  const a = curvature;
  const c1 = -1.1143 * a * a + 1.8618 * a + 0.2523;
  const c2 = 0.0805 * a * a - 0.071 * a - 0.0095;
  const c3 = -0.0005 * a * a + 0.0002 * a + 0.0003;
  return c1 * d1 + c2 * d1 * d1 + c3 * d1 * d1 * d1;
}

/** D (%) = b (G/Gmax)^0.1 D_Masing + Dmin (Darendeli 2001). */
export function darendeliDampingPct(strainPct: number, p: DarendeliParams): number {
  const gg = darendeliModulusRatio(strainPct, p);
  return p.scalingB * gg ** 0.1 * masingDampingPct(strainPct, p.referenceStrainPct, p.curvature) + p.dminPct;
}

// ------------------------------------------------------------------ Ishibashi & Zhang (1993)

// n(PI) of Ishibashi & Zhang (1993); recalled (from memory): check against the paper.
export function ishibashiZhangN(piPct: number): number {
  if (piPct <= 0) return 0;
  if (piPct <= 15) return 3.37e-6 * piPct ** 1.404;
  if (piPct <= 70) return 7.0e-7 * piPct ** 1.976;
  return 2.7e-5 * piPct ** 1.115;
}

/**
 * Ishibashi & Zhang (1993), strain as a fraction inside (from memory: check against the paper):
 *   K = 0.5 {1 + tanh[ln(((0.000102 + n(PI)) / g)^0.492)]}
 *   m - m0 = 0.272 {1 - tanh[ln((0.000556 / g)^0.4)]} exp(-0.0145 PI^1.3)
 *   G/Gmax = K sigma'_m^(m - m0), sigma'_m in kPa
 */
export function ishibashiZhangModulusRatio(strainPct: number, piPct: number, sigmaMKpa: number): number {
  requirePositive(sigmaMKpa, 'meanEffectiveStressKpa');
  if (strainPct <= 0) return 1;
  const g = strainPct / 100;
  const k = 0.5 * (1 + Math.tanh(0.492 * Math.log((0.000102 + ishibashiZhangN(piPct)) / g)));
  const m = 0.272 * (1 - Math.tanh(0.4 * Math.log(0.000556 / g))) * Math.exp(-0.0145 * piPct ** 1.3);
  return Math.min(1, k * sigmaMKpa ** m);
}

// D (%) = 100 * 0.333 (1 + exp(-0.0145 PI^1.3))/2 [0.586 (G/Gmax)^2 - 1.547 G/Gmax + 1]; recalled (from memory).
export function ishibashiZhangDampingPct(modulusRatio: number, piPct: number): number {
  const r = modulusRatio;
  return 100 * ((0.333 * (1 + Math.exp(-0.0145 * piPct ** 1.3))) / 2) * (0.586 * r * r - 1.547 * r + 1);
}

// ------------------------------------------------------------------ per-layer curves

export interface CurveLayerInput extends LayerSoilFields {
  topM: number;
  bottomM: number;
  name: string;
  /** Vertical effective stress at the layer's mid-depth, kPa. */
  sigmaVEffKpa: number;
  /** Gmax of the layer from the measured Vs, kPa; null when no Vs covers the layer. */
  gmaxKpa: number | null;
  vsMps: number | null;
}

export interface CurveSettings {
  curveModel: CurveModel;
  loadingFrequencyHz: number;
  loadingCycles: number;
}

export interface CurvePoint {
  strainPct: number;
  modulusRatio: number;
  dampingPct: number;
}

export interface LayerCurves {
  topM: number;
  bottomM: number;
  name: string;
  soil: ResolvedSoilFields;
  sigmaVEffKpa: number;
  meanEffectiveStressKpa: number;
  vsMps: number | null;
  gmaxKpa: number | null;
  /** Darendeli parameters (always computed: gamma_r, Dmin are reported beside any model). */
  darendeli: DarendeliParams;
  /** The chosen model's curve and, for comparison, the other one. */
  model: CurveModel;
  curve: CurvePoint[];
  alternative: { model: CurveModel; curve: CurvePoint[] };
  /** At the working strain (if given): G/Gmax, G and D of the chosen model. */
  working: { strainPct: number; modulusRatio: number; gKpa: number | null; dampingPct: number } | null;
  flags: string[];
}

export const CURVE_FLAGS = {
  noEffectiveStress: "sigma'_m <= 0: no curve",
  rock: 'rock: soil curves do not apply',
  noVs: 'no Vs over this layer',
} as const;

function curveOf(model: CurveModel, grid: number[], p: DarendeliParams, piPct: number, sigmaM: number): CurvePoint[] {
  return grid.map((s) => {
    if (model === 'darendeli')
      return { strainPct: s, modulusRatio: darendeliModulusRatio(s, p), dampingPct: darendeliDampingPct(s, p) };
    const r = ishibashiZhangModulusRatio(s, piPct, sigmaM);
    return { strainPct: s, modulusRatio: r, dampingPct: ishibashiZhangDampingPct(r, piPct) };
  });
}

/** Curves per layer; layers with no positive effective stress are returned with a flag and empty curves. */
export function layerCurves(layers: CurveLayerInput[], s: CurveSettings, grid = strainGridPct()): LayerCurves[] {
  requirePositive(s.loadingFrequencyHz, 'loadingFrequencyHz');
  requirePositive(s.loadingCycles, 'loadingCycles');
  const other: CurveModel = s.curveModel === 'darendeli' ? 'ishibashi-zhang' : 'darendeli';
  return layers.map((l) => {
    const soil = resolveSoilFields(l);
    const flags: string[] = [];
    if (soil.soilType === 'rock') flags.push(CURVE_FLAGS.rock);
    if (l.gmaxKpa === null) flags.push(CURVE_FLAGS.noVs);
    const sigmaM = meanEffectiveStressKpa(l.sigmaVEffKpa, soil.k0);
    const base = {
      topM: l.topM,
      bottomM: l.bottomM,
      name: l.name,
      soil,
      sigmaVEffKpa: l.sigmaVEffKpa,
      meanEffectiveStressKpa: sigmaM,
      vsMps: l.vsMps,
      gmaxKpa: l.gmaxKpa,
      model: s.curveModel,
    };
    if (!(sigmaM > 0)) {
      flags.push(CURVE_FLAGS.noEffectiveStress);
      const p = {
        referenceStrainPct: Number.NaN,
        curvature: DARENDELI.phi5,
        dminPct: Number.NaN,
        scalingB: Number.NaN,
      };
      return { ...base, darendeli: p, curve: [], alternative: { model: other, curve: [] }, working: null, flags };
    }
    const p = darendeliParams({
      plasticityIndexPct: soil.plasticityIndexPct,
      ocr: soil.ocr,
      meanEffectiveStressKpa: sigmaM,
      loadingFrequencyHz: s.loadingFrequencyHz,
      loadingCycles: s.loadingCycles,
    });
    let working: LayerCurves['working'] = null;
    if (soil.workingStrainPct !== null) {
      const [pt] = curveOf(s.curveModel, [soil.workingStrainPct], p, soil.plasticityIndexPct, sigmaM);
      working = {
        strainPct: pt.strainPct,
        modulusRatio: pt.modulusRatio,
        gKpa: l.gmaxKpa === null ? null : l.gmaxKpa * pt.modulusRatio,
        dampingPct: pt.dampingPct,
      };
    }
    return {
      ...base,
      darendeli: p,
      curve: curveOf(s.curveModel, grid, p, soil.plasticityIndexPct, sigmaM),
      alternative: { model: other, curve: curveOf(other, grid, p, soil.plasticityIndexPct, sigmaM) },
      working,
      flags,
    };
  });
}

// ------------------------------------------------------------------ field damping

/** Field small-strain attenuation of a depth range (from the waveforms), Q with its one-sigma uncertainty. */
export interface FieldQ {
  topM: number;
  bottomM: number;
  q: number;
  qSd: number | null;
  /** Frequency the Q was measured at (the shear pulse's dominant frequency), Hz. */
  frequencyHz: number;
}

export interface FieldDamping {
  dampingPct: number;
  dampingSdPct: number | null;
  frequencyHz: number;
  /** Darendeli's Dmin at the field frequency, %. */
  labDminPct: number;
}

/** D = 1/(2Q) (as a percentage); sd by first-order propagation sd(D) = sd(Q) / (2 Q^2). */
export function dampingFromQ(q: number, qSd: number | null): { dampingPct: number; dampingSdPct: number | null } {
  requirePositive(q, 'q');
  return {
    dampingPct: 100 / (2 * q),
    dampingSdPct: qSd !== null && Number.isFinite(qSd) && qSd >= 0 ? (100 * qSd) / (2 * q * q) : null,
  };
}

/**
 * Field damping of a layer: the field Q whose depth range overlaps the layer most; null when none does.
 * Field D includes scattering and is an upper bound on the material damping (common practice).
 */
export function fieldDampingForLayer(layer: LayerCurves, fieldQ: readonly FieldQ[]): FieldDamping | null {
  let best: FieldQ | null = null;
  let bestOverlap = 0;
  for (const f of fieldQ) {
    const overlap = Math.min(f.bottomM, layer.bottomM) - Math.max(f.topM, layer.topM);
    if (overlap > bestOverlap && f.q > 0 && f.frequencyHz > 0) {
      best = f;
      bestOverlap = overlap;
    }
  }
  if (!best || !(layer.meanEffectiveStressKpa > 0)) return null;
  return {
    ...dampingFromQ(best.q, best.qSd),
    frequencyHz: best.frequencyHz,
    labDminPct: darendeliDminPct(
      layer.soil.plasticityIndexPct,
      layer.soil.ocr,
      layer.meanEffectiveStressKpa,
      best.frequencyHz,
    ),
  };
}

export const CURVE_CAUTIONS: string[] = [
  'Modulus reduction and damping curves are empirical correlations from laboratory tests, scaled to the measured Gmax; laboratory tests on site samples govern where available.',
  'Default soil inputs (plasticity index, OCR, K0) are placeholders; replace them with site data.',
  'Field damping D = 1/(2Q) includes scattering and geometric effects and is an upper bound on the material damping.',
];
