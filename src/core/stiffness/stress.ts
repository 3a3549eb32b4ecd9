/**
 * Vertical total stress, pore pressure and effective stress in a layered soil column.
 *   sigma_v(z) = sum gamma_i h_i over the layers above z
 *   u(z) = gamma_w (z - z_w) below the water table z_w, 0 above it
 *   sigma'_v = sigma_v - u   (Terzaghi's effective stress; any soil mechanics text)
 * Depth is positive downwards from the ground surface, m; unit weights kN/m3, stresses kPa.
 */
import { BorewaveError, type ErrorInfo } from '../errors';
import type { SoilColumn, SoilLayer } from '../model';

export interface StressAtDepth {
  totalKpa: number;
  poreKpa: number;
  effectiveKpa: number;
}

export const DEFAULT_WATER_UNIT_WEIGHT_KNM3 = 9.81;

function layerLabel(layer: SoilLayer, index: number): string {
  return `soil layer ${index + 1}${layer.name ? ` (${layer.name})` : ''}`;
}

/** Problems in a soil column, each naming the layer: gaps, overlaps, bad thickness, unit weight, n, nu. */
export function validateSoilColumn(soil: SoilColumn): ErrorInfo[] {
  const out: ErrorInfo[] = [];
  if (soil.layers.length === 0) {
    out.push({
      code: 'SOIL_NO_LAYERS',
      message: 'The soil column has no layers.',
      file: 'soil column',
      field: 'layers',
    });
    return out;
  }
  soil.layers.forEach((l, i) => {
    const item = layerLabel(l, i);
    if (!Number.isFinite(l.topM) || !Number.isFinite(l.bottomM) || l.topM < 0 || l.bottomM <= l.topM) {
      out.push({
        code: 'SOIL_THICKNESS',
        message: `${item}: top ${l.topM} m and bottom ${l.bottomM} m must satisfy 0 <= top < bottom.`,
        file: item,
        field: 'topM/bottomM',
      });
    }
    if (!Number.isFinite(l.unitWeightKnM3) || l.unitWeightKnM3 <= 0) {
      out.push({
        code: 'SOIL_UNIT_WEIGHT',
        message: `${item}: unit weight ${l.unitWeightKnM3} kN/m3 must be positive.`,
        file: item,
        field: 'unitWeightKnM3',
      });
    }
    if (!Number.isFinite(l.stressExponent) || l.stressExponent < 0 || l.stressExponent > 1) {
      out.push({
        code: 'SOIL_STRESS_EXPONENT',
        message: `${item}: stress exponent ${l.stressExponent} must be between 0 and 1.`,
        file: item,
        field: 'stressExponent',
      });
    }
    // Soils: 0 <= nu < 0.5 (an isotropic solid allows -1 < nu < 0.5; negative values are not soil).
    if (!Number.isFinite(l.poissonRatio) || l.poissonRatio < 0 || l.poissonRatio >= 0.5) {
      out.push({
        code: 'SOIL_POISSON',
        message: `${item}: Poisson's ratio ${l.poissonRatio} must be at least 0 and below 0.5.`,
        file: item,
        field: 'poissonRatio',
      });
    }
  });
  const order = soil.layers.map((l, i) => ({ l, i })).sort((a, b) => a.l.topM - b.l.topM);
  if (order[0].l.topM > 0) {
    const { l, i } = order[0];
    out.push({
      code: 'SOIL_GAP',
      message: `The soil column starts at ${l.topM} m, not at the ground surface (${layerLabel(l, i)}).`,
      file: layerLabel(l, i),
      field: 'topM',
    });
  }
  for (let k = 1; k < order.length; k++) {
    const a = order[k - 1];
    const b = order[k];
    const item = `${layerLabel(a.l, a.i)} / ${layerLabel(b.l, b.i)}`;
    if (b.l.topM > a.l.bottomM) {
      out.push({
        code: 'SOIL_GAP',
        message: `Gap between ${a.l.bottomM} m and ${b.l.topM} m: ${item}.`,
        file: item,
        field: 'topM',
      });
    } else if (b.l.topM < a.l.bottomM) {
      out.push({
        code: 'SOIL_OVERLAP',
        message: `Layers overlap between ${b.l.topM} m and ${a.l.bottomM} m: ${item}.`,
        file: item,
        field: 'topM',
      });
    }
  }
  if (soil.waterTableM !== null && !Number.isFinite(soil.waterTableM)) {
    out.push({
      code: 'SOIL_WATER_TABLE',
      message: `Water table depth ${soil.waterTableM} is not a number.`,
      file: 'soil column',
      field: 'waterTableM',
    });
  }
  if (!Number.isFinite(soil.waterUnitWeightKnM3) || soil.waterUnitWeightKnM3 <= 0) {
    out.push({
      code: 'SOIL_WATER_UNIT_WEIGHT',
      message: `Water unit weight ${soil.waterUnitWeightKnM3} kN/m3 must be positive.`,
      file: 'soil column',
      field: 'waterUnitWeightKnM3',
    });
  }
  return out;
}

/**
 * One layer from the surface to bottomM: 19 kN/m3, n = 0.25, nu = 0.3, no water table.
 * These are common-practice placeholders for a medium-dense soil, to be replaced by the site's values.
 */
export function defaultSoilColumn(bottomM: number): SoilColumn {
  const bottom = Number.isFinite(bottomM) && bottomM > 0 ? bottomM : 30;
  return {
    layers: [
      { topM: 0, bottomM: bottom, name: 'default', unitWeightKnM3: 19, stressExponent: 0.25, poissonRatio: 0.3 },
    ],
    waterTableM: null,
    waterUnitWeightKnM3: DEFAULT_WATER_UNIT_WEIGHT_KNM3,
  };
}

/**
 * The layer that governs depth z: the first (by top) layer containing z; in a gap or above the first
 * layer, the nearest layer below; below the deepest layer, the deepest layer (its properties extend down).
 */
export function layerAt(soil: SoilColumn, depthM: number): SoilLayer {
  if (soil.layers.length === 0)
    throw new BorewaveError('SOIL_NO_LAYERS', 'The soil column has no layers.', 'soil column', 'layers');
  const sorted = [...soil.layers].sort((a, b) => a.topM - b.topM);
  for (const l of sorted) if (depthM >= l.topM && depthM < l.bottomM) return l;
  for (const l of sorted) if (l.topM >= depthM) return l;
  return sorted.reduce((a, b) => (b.bottomM > a.bottomM ? b : a));
}

/** Deepest layer bottom, m. */
export function soilColumnBottomM(soil: SoilColumn): number {
  return soil.layers.reduce((m, l) => Math.max(m, l.bottomM), 0);
}

/**
 * Vertical stresses at depthM (kPa). Layer properties fill gaps as in layerAt. A water table above the
 * ground (negative depth, ponded water) adds the water's weight to the total stress; u = gamma_w (z - z_w).
 */
export function verticalStressAt(soil: SoilColumn, depthM: number): StressAtDepth {
  if (!Number.isFinite(depthM) || depthM < 0) {
    throw new BorewaveError(
      'STRESS_DEPTH',
      `Depth ${depthM} m must be a number at or below the ground surface.`,
      'soil column',
      'depthM',
    );
  }
  if (soil.layers.length === 0)
    throw new BorewaveError('SOIL_NO_LAYERS', 'The soil column has no layers.', 'soil column', 'layers');
  const breaks = new Set<number>([0, depthM]);
  for (const l of soil.layers) {
    if (l.topM > 0 && l.topM < depthM) breaks.add(l.topM);
    if (l.bottomM > 0 && l.bottomM < depthM) breaks.add(l.bottomM);
  }
  const z = [...breaks].sort((a, b) => a - b);
  let totalKpa = 0;
  for (let k = 1; k < z.length; k++) {
    const h = z[k] - z[k - 1];
    totalKpa += layerAt(soil, 0.5 * (z[k] + z[k - 1])).unitWeightKnM3 * h;
  }
  const gammaW = soil.waterUnitWeightKnM3;
  const zw = soil.waterTableM;
  if (zw !== null && zw < 0) totalKpa += gammaW * -zw;
  const poreKpa = zw !== null && depthM > zw ? gammaW * (depthM - zw) : 0;
  return { totalKpa, poreKpa, effectiveKpa: totalKpa - poreKpa };
}
