/**
 * The layered earth of the forward model: flat layers with Vs, Vp, unit weight and Q, and a water
 * table below which Vp is at least that of the pore water.
 */
import { BorewaveError } from '../errors';
import type { SoilColumn, SoilLayer } from '../model';
import type { RaySegment } from '../survey/rays';

export interface EarthLayer {
  name: string;
  /** Depth of the layer top below ground, m. The first layer starts at 0. */
  topM: number;
  /** Thickness, m. The last layer may be Infinity (a half-space); a finite last layer continues below its bottom. */
  thicknessM: number;
  /** Shear-wave velocity, m/s (phase velocity at the reference frequency when attenuation is on). */
  vsMps: number;
  /** P-wave velocity of the soil skeleton (unsaturated), m/s. */
  vpMps: number;
  /** Total unit weight, kN/m3. */
  unitWeightKnM3: number;
  /** Quality factors for S and P (constant Q). */
  qS: number;
  qP: number;
  /** Sets the Vs1 stress exponent of the survey's soil column: 0.25 sand-like, 0.5 clay-like (docs/methods.md section 4). */
  behaviour: 'sand-like' | 'clay-like';
  /** Soil fields copied to the survey's soil column (curves, liquefaction screen); absent = not given. */
  soil?: Pick<SoilLayer, 'soilType' | 'plasticityIndexPct' | 'finesContentPct'>;
}

export interface EarthModel {
  name: string;
  layers: EarthLayer[];
  /** Water-table depth, m; null = dry. */
  waterTableM: number | null;
  /** P velocity of the pore water, m/s (default 1500). Below the water table Vp = max(skeleton Vp, this). */
  waterVpMps?: number;
}

/** One interval of constant properties for ray tracing (layers split at the water table). */
export interface ModelSegment extends RaySegment {
  q: number;
}

const DEFAULT_WATER_VP_MPS = 1500;
const SAME_DEPTH_TOL_M = 1e-9;

function positive(x: number): boolean {
  return Number.isFinite(x) && x > 0;
}

/** Throws BorewaveError naming the layer and field when the model is not usable. */
export function validateEarthModel(model: EarthModel): void {
  const item = `earth model "${model.name}"`;
  const bad = (field: string, problem: string): never => {
    throw new BorewaveError('SYNTH_BAD_MODEL', `${item}: ${field} ${problem}.`, item, field);
  };
  if (model.layers.length === 0) bad('layers', 'is empty');
  model.layers.forEach((l, j) => {
    const f = (name: string) => `layers[${j}] (${l.name}).${name}`;
    const expectedTop = j === 0 ? 0 : model.layers[j - 1].topM + model.layers[j - 1].thicknessM;
    if (Math.abs(l.topM - expectedTop) > SAME_DEPTH_TOL_M)
      bad(f('topM'), `is ${l.topM} m, expected ${expectedTop} m (layers must be contiguous from 0)`);
    const last = j === model.layers.length - 1;
    if (!(l.thicknessM > 0) || (!last && !Number.isFinite(l.thicknessM))) bad(f('thicknessM'), `is ${l.thicknessM}`);
    for (const k of ['vsMps', 'vpMps', 'unitWeightKnM3', 'qS', 'qP'] as const)
      if (!positive(l[k])) bad(f(k), `is ${l[k]}, must be a positive number`);
    if (l.vpMps <= l.vsMps) bad(f('vpMps'), `(${l.vpMps}) must exceed vsMps (${l.vsMps})`);
  });
  if (model.waterTableM !== null && !(model.waterTableM >= 0)) bad('waterTableM', `is ${model.waterTableM}`);
  if (model.waterVpMps !== undefined && !positive(model.waterVpMps)) bad('waterVpMps', `is ${model.waterVpMps}`);
}

/** Index of the layer holding depthM (a depth on an interface belongs to the layer below). */
export function layerIndexAt(model: EarthModel, depthM: number): number {
  let idx = 0;
  for (let j = 0; j < model.layers.length; j++) if (depthM >= model.layers[j].topM) idx = j;
  return idx;
}

/** True (model) shear-wave velocity at a depth, m/s. */
export function trueVsAt(model: EarthModel, depthM: number): number {
  return model.layers[layerIndexAt(model, depthM)].vsMps;
}

/** True P-wave velocity at a depth, m/s: below the water table at least the pore-water value (ASTM D7400 note, docs/methods.md section 2). */
export function trueVpAt(model: EarthModel, depthM: number): number {
  const vp = model.layers[layerIndexAt(model, depthM)].vpMps;
  const wt = model.waterTableM;
  return wt !== null && depthM >= wt ? Math.max(vp, model.waterVpMps ?? DEFAULT_WATER_VP_MPS) : vp;
}

/** Quality factor for a wave at a depth. */
export function trueQAt(model: EarthModel, depthM: number, wave: 'S' | 'P'): number {
  const l = model.layers[layerIndexAt(model, depthM)];
  return wave === 'S' ? l.qS : l.qP;
}

/** Depths where properties change (layer tops and the water table), sorted, without duplicates. */
function interfacesM(model: EarthModel): number[] {
  const set = new Set<number>(model.layers.map((l) => l.topM));
  if (model.waterTableM !== null) set.add(model.waterTableM);
  return [...set].sort((a, b) => a - b);
}

/**
 * Constant-property pieces of the vertical interval between two depths (top to bottom), with the
 * wave velocity and Q of each. Empty intervals give an empty list.
 */
export function modelSegments(model: EarthModel, wave: 'S' | 'P', depthAM: number, depthBM: number): ModelSegment[] {
  const top = Math.min(depthAM, depthBM);
  const bottom = Math.max(depthAM, depthBM);
  const cuts = interfacesM(model).filter((z) => z > top && z < bottom);
  const bounds = [top, ...cuts, bottom];
  const out: ModelSegment[] = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const h = bounds[k + 1] - bounds[k];
    if (!(h > 0)) continue;
    const mid = 0.5 * (bounds[k] + bounds[k + 1]);
    const v = wave === 'S' ? trueVsAt(model, mid) : trueVpAt(model, mid);
    out.push({ thicknessM: h, velocityMps: v, q: trueQAt(model, mid, wave) });
  }
  return out;
}

/**
 * The survey's soil column from the model: unit weights and water table as in the model; stress
 * exponent 0.25 for sand-like and 0.5 for clay-like layers (docs/methods.md section 4); Poisson's ratio
 * 0.3 (common practice default). A half-space last layer ends at bottomM = deepestM.
 */
export function soilColumnFromModel(model: EarthModel, deepestM: number): SoilColumn {
  const layers: SoilLayer[] = model.layers
    .filter((l) => l.topM < deepestM || l === model.layers[0])
    .map((l, j, arr) => ({
      topM: l.topM,
      bottomM:
        j === arr.length - 1
          ? Math.max(deepestM, Number.isFinite(l.thicknessM) ? l.topM + l.thicknessM : deepestM)
          : l.topM + l.thicknessM,
      name: l.name,
      unitWeightKnM3: l.unitWeightKnM3,
      stressExponent: l.behaviour === 'sand-like' ? 0.25 : 0.5,
      poissonRatio: 0.3,
      ...(l.soil ?? {}),
    }));
  return { layers, waterTableM: model.waterTableM, waterUnitWeightKnM3: 9.81 };
}
