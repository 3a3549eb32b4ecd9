/**
 * Random layered earths for the accuracy bank (bench/bank.ts): 3-9 layers down to a set depth with
 * boundaries kept off the receiver grid, velocity inversions, linear gradients (drawn as thin
 * sub-layers), an optional water table and Q between 10 and 50. Deterministic for a seed.
 * Invented data for the bench and tests of the forward model only.
 */
import { mulberry32 } from '../random';
import type { EarthLayer, EarthModel } from './earth';

export interface RandomEarthOptions {
  /** Depth the layering reaches, m (the last layer is a half-space below it). */
  depthM: number;
  /** Receiver grid step, m: layer boundaries keep at least gridClearanceM from its multiples. */
  gridStepM: number;
  gridClearanceM?: number;
  minLayers?: number;
  maxLayers?: number;
}

export interface RandomEarth {
  model: EarthModel;
  /** Depths of the drawn layer boundaries (not the gradient sub-layers), m. */
  boundariesM: number[];
  /** Indexes (in the drawn layers) of layers with a gradient. */
  gradientLayers: number[];
}

/** Thickness of the thin sub-layers that represent a gradient, m. */
const GRADIENT_STEP_M = 0.25;

function offGrid(z: number, step: number, clearance: number): boolean {
  const r = z / step - Math.round(z / step);
  return Math.abs(r * step) >= clearance;
}

export function randomEarth(seed: number, o: RandomEarthOptions): RandomEarth {
  const rng = mulberry32(seed);
  const u = (a: number, b: number) => a + (b - a) * rng.uniform();
  const minL = o.minLayers ?? 3;
  const maxL = o.maxLayers ?? 9;
  const clearance = o.gridClearanceM ?? 0.1 * o.gridStepM;
  const nLayers = minL + Math.floor(rng.uniform() * (maxL - minL + 1));
  // Boundaries: sorted uniform draws, at least 1.2 m apart and off the grid.
  const boundaries: number[] = [];
  for (let tries = 0; boundaries.length < nLayers - 1 && tries < 10000; tries++) {
    const z = Math.round(u(1.0, o.depthM - 1) * 1000) / 1000;
    if (!offGrid(z, o.gridStepM, clearance)) continue;
    if (boundaries.some((b) => Math.abs(b - z) < 1.2)) continue;
    boundaries.push(z);
  }
  boundaries.sort((a, b) => a - b);
  const tops = [0, ...boundaries];
  // Vs: a stiffening trend with depth, with some layers softer than the one above (inversions).
  let vs = u(110, 220);
  const layers: EarthLayer[] = [];
  const gradientLayers: number[] = [];
  tops.forEach((top, j) => {
    const bottom = j + 1 < tops.length ? tops[j + 1] : Infinity;
    if (j > 0) vs = rng.uniform() < 0.25 ? vs * u(0.6, 0.85) : vs * u(1.1, 1.6);
    vs = Math.min(Math.max(vs, 90), 900);
    const vpRatio = u(1.7, 2.4);
    const qS = Math.round(u(10, 50));
    const unitWeight = Math.round(u(16.5, 20.5) * 10) / 10;
    const behaviour = rng.uniform() < 0.5 ? 'sand-like' : 'clay-like';
    const gradient = Number.isFinite(bottom) && bottom - top >= 2 && rng.uniform() < 0.3;
    const base = { unitWeightKnM3: unitWeight, qS, qP: qS * 2, behaviour } as const;
    if (!gradient) {
      layers.push({ name: `L${j + 1}`, topM: top, thicknessM: bottom - top, vsMps: vs, vpMps: vs * vpRatio, ...base });
      return;
    }
    gradientLayers.push(j);
    // Linear gradient from vs at the top to vs * g at the bottom, in thin sub-layers (mid-point values).
    const g = u(1.15, 1.5);
    const n = Math.max(1, Math.round((bottom - top) / GRADIENT_STEP_M));
    const h = (bottom - top) / n;
    for (let k = 0; k < n; k++) {
      const v = vs * (1 + ((g - 1) * (k + 0.5)) / n);
      layers.push({
        name: `L${j + 1}.${k + 1}`,
        topM: top + k * h,
        thicknessM: h,
        vsMps: v,
        vpMps: v * vpRatio,
        ...base,
      });
    }
    vs *= g;
  });
  // Contiguous tops (sub-layer sums can drift by rounding).
  for (let k = 1; k < layers.length; k++) layers[k].topM = layers[k - 1].topM + layers[k - 1].thicknessM;
  layers[layers.length - 1].thicknessM = Infinity;
  const waterTableM = rng.uniform() < 0.7 ? Math.round(u(0.5, 8) * 100) / 100 : null;
  return {
    model: { name: `random earth ${seed}`, layers, waterTableM },
    boundariesM: boundaries,
    gradientLayers,
  };
}

/** Vertical S travel time through the model between two depths, s (phase velocity at the reference frequency). */
export function verticalTimeS(model: EarthModel, topM: number, bottomM: number): number {
  let t = 0;
  const a = Math.min(topM, bottomM);
  const b = Math.max(topM, bottomM);
  model.layers.forEach((l) => {
    const h = Math.min(b, l.topM + l.thicknessM) - Math.max(a, l.topM);
    if (h > 0) t += h / l.vsMps;
  });
  return t;
}

/** Path-integrated attenuation t* = sum h / (Vs Q) on the vertical between two depths, s. */
export function verticalTStarS(model: EarthModel, topM: number, bottomM: number): number {
  let t = 0;
  const a = Math.min(topM, bottomM);
  const b = Math.max(topM, bottomM);
  model.layers.forEach((l) => {
    const h = Math.min(b, l.topM + l.thicknessM) - Math.max(a, l.topM);
    if (h > 0) t += h / l.vsMps / l.qS;
  });
  return t;
}

/** The true interval Vs: the interval length over the true vertical travel time (a harmonic average). */
export function trueIntervalVsMps(model: EarthModel, topM: number, bottomM: number): number {
  return Math.abs(bottomM - topM) / verticalTimeS(model, topM, bottomM);
}
