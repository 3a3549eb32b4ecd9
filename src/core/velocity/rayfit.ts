/**
 * Layer velocities from downhole direct times with refracted rays (the ray-path approach compared by
 * Kim, Bang & Kim 2004, Geotech. Testing J. 27(6)): layers between successive receiver depths; for
 * fixed ray paths the times are linear in the layer slownesses, T_i = sum_j L_ij s_j, and the ray to
 * depth i crosses layers 0..i only, so L is lower triangular. We alternate (1) tracing Snell's-law rays
 * through the current model and (2) solving L s = T by forward substitution (layer stripping, top down),
 * until the slownesses change by less than `tolerance` (relative) or `maxIterations` runs out. A layer
 * whose time is not later than the layers above allow gets a ceiling velocity and the flag 'inverted
 * time' (its pick is out of order). The misfit reported is the RMS time residual.
 */
import { layeredRay, traceRay, segmentsBetween, type VelocityLayer } from '../survey/rays';
import { choleskyFactor, choleskySolve } from './linalg';

export interface RayFitInput {
  /** Receiver depths, m, strictly increasing. */
  depthsM: number[];
  /** Direct travel times, s (from the trigger). */
  timesS: number[];
  /** Horizontal source-receiver offset at each depth, m. */
  offsetsM: number[];
  sourceDepthM: number;
}

export interface RayFitResult {
  /** Layer j spans depthsM[j-1] (or the source depth) to depthsM[j]. */
  /** pathInLayerM: length of the ray to the layer's bottom inside the layer (for uncertainty, sV = V^2 s_dt / path).
   * outOfOrder: the time to this depth is not later than the layers above allow (velocity set to a ceiling). */
  layers: { topM: number; bottomM: number; velocityMps: number; pathInLayerM: number; outOfOrder: boolean }[];
  iterations: number;
  converged: boolean;
  rmsMisfitS: number;
  residualsS: number[];
}

/** Ceiling velocity for a layer whose time is out of order, m/s (far above any soil or rock Vs). */
const CEILING_VELOCITY_MPS = 1e5;

export function fitLayersWithRays(
  input: RayFitInput,
  o: { maxIterations?: number; tolerance?: number } = {},
): RayFitResult | null {
  const { depthsM, timesS, offsetsM, sourceDepthM } = input;
  const n = depthsM.length;
  if (n < 2) return null;
  const maxIterations = o.maxIterations ?? 30;
  const tolerance = o.tolerance ?? 1e-6;
  const tops = depthsM.map((_, j) => (j === 0 ? sourceDepthM : depthsM[j - 1]));
  // Start from straight vertical-ish rays: the average slowness to each depth.
  let slowness: Float64Array = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const r = Math.hypot(offsetsM[j], depthsM[j] - sourceDepthM);
    slowness[j] = Math.max(timesS[j] / r, 1 / CEILING_VELOCITY_MPS);
  }
  const outOfOrder = new Array<boolean>(n).fill(false);
  let iterations = 0;
  let converged = false;
  const L = new Float64Array(n * n);
  for (; iterations < maxIterations; iterations++) {
    const model: VelocityLayer[] = tops.map((t, j) => ({ topM: t, velocityMps: 1 / slowness[j] }));
    L.fill(0);
    for (let i = 0; i < n; i++) {
      const segs = segmentsBetween(model, sourceDepthM, depthsM[i]);
      const ray = traceRay(segs, offsetsM[i], model[0].velocityMps);
      // segments come out top to bottom, one per layer crossed (layers 0..i)
      let k = 0;
      for (let j = 0; j <= i && k < ray.segmentPathM.length; j++) {
        if (depthsM[j] - tops[j] > 0) L[i * n + j] = ray.segmentPathM[k++];
      }
    }
    const next = new Float64Array(n);
    let change = 0;
    for (let i = 0; i < n; i++) {
      let rest = timesS[i];
      for (let j = 0; j < i; j++) rest -= L[i * n + j] * next[j];
      const lii = L[i * n + i];
      // Keep slownesses physical (positive) for the next ray trace.
      outOfOrder[i] = lii > 0 && rest / lii < 1 / CEILING_VELOCITY_MPS;
      next[i] = lii > 0 ? Math.max(rest / lii, 1 / CEILING_VELOCITY_MPS) : slowness[i];
      change = Math.max(change, Math.abs(next[i] - slowness[i]) / slowness[i]);
    }
    slowness = next;
    if (change < tolerance) {
      converged = true;
      iterations++;
      break;
    }
  }
  const model: VelocityLayer[] = tops.map((t, j) => ({ topM: t, velocityMps: 1 / slowness[j] }));
  const residualsS = depthsM.map((z, i) => timesS[i] - layeredRay(model, sourceDepthM, z, offsetsM[i]).timeS);
  const rms = Math.sqrt(residualsS.reduce((s, r) => s + r * r, 0) / n);
  return {
    layers: model.map((m, j) => ({
      topM: tops[j],
      bottomM: depthsM[j],
      velocityMps: m.velocityMps,
      pathInLayerM: L[j * n + j],
      outOfOrder: outOfOrder[j],
    })),
    iterations,
    converged,
    rmsMisfitS: rms,
    residualsS,
  };
}

/**
 * Layer model from downhole direct times over chosen layers (fewer layers than receivers): the same
 * alternation of Snell's-law ray tracing and a linear solve, here least squares on T_i = sum_j L_ij s_j
 * (normal equations, Cholesky), stopped when the slownesses change by less than `tolerance` (relative)
 * or after `maxIterations`. Reports the RMS time misfit and, per layer, the one-sigma velocity from the
 * residual variance and (L^T L)^-1 (ordinary least-squares covariance, any regression text).
 * The last layer extends below the deepest receiver.
 */
export interface LayerModelFit {
  layers: { topM: number; bottomM: number; velocityMps: number; velocitySdMps: number | null; receivers: number }[];
  iterations: number;
  converged: boolean;
  rmsMisfitS: number;
  residualsS: number[];
}

export function fitLayerModel(
  input: RayFitInput,
  layerTopsM: number[],
  o: { maxIterations?: number; tolerance?: number } = {},
): LayerModelFit | null {
  const { depthsM, timesS, offsetsM, sourceDepthM } = input;
  const n = depthsM.length;
  const deepest = Math.max(...depthsM);
  // Layers that hold at least one receiver depth (others cannot be resolved and are merged upward).
  const tops = [...new Set([sourceDepthM, ...layerTopsM.filter((t) => t > sourceDepthM && t < deepest)])].sort(
    (a, b) => a - b,
  );
  const receiversIn = tops.map(
    (t, j) => depthsM.filter((z) => z > t && z <= (j + 1 < tops.length ? tops[j + 1] : Infinity)).length,
  );
  const kept = tops.filter((_, j) => receiversIn[j] > 0 || j === 0);
  const m = kept.length;
  if (n < m + 1 || m < 1) return null;
  const maxIterations = o.maxIterations ?? 30;
  const tolerance = o.tolerance ?? 1e-6;
  let slowness: Float64Array = new Float64Array(m).fill(
    timesS.reduce((s, t, i) => s + t / Math.hypot(offsetsM[i], depthsM[i] - sourceDepthM), 0) / n,
  );
  for (let j = 0; j < m; j++) slowness[j] = Math.max(slowness[j], 1 / CEILING_VELOCITY_MPS);
  const L = new Float64Array(n * m);
  let iterations = 0;
  let converged = false;
  let factor: Float64Array | null = null;
  const buildL = (s: Float64Array) => {
    const model: VelocityLayer[] = kept.map((t, j) => ({ topM: t, velocityMps: 1 / s[j] }));
    L.fill(0);
    for (let i = 0; i < n; i++) {
      const segs = segmentsBetween(model, sourceDepthM, depthsM[i]);
      const ray = traceRay(segs, offsetsM[i], model[0].velocityMps);
      // segments come out top to bottom; map each to its layer by depth
      let top = Math.min(sourceDepthM, depthsM[i]);
      segs.forEach((seg, k) => {
        let j = 0;
        while (j + 1 < m && kept[j + 1] <= top + 1e-9) j++;
        L[i * m + j] += ray.segmentPathM[k];
        top += seg.thicknessM;
      });
    }
    return model;
  };
  for (; iterations < maxIterations; iterations++) {
    buildL(slowness);
    const ata = new Float64Array(m * m);
    const atb = new Float64Array(m);
    for (let a = 0; a < m; a++) {
      for (let b = 0; b <= a; b++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += L[i * m + a] * L[i * m + b];
        ata[a * m + b] = s;
        ata[b * m + a] = s;
      }
      let s = 0;
      for (let i = 0; i < n; i++) s += L[i * m + a] * timesS[i];
      atb[a] = s;
    }
    factor = choleskyFactor(ata, m);
    if (!factor) return null;
    const next = choleskySolve(factor, atb, m);
    let change = 0;
    for (let j = 0; j < m; j++) {
      next[j] = Math.max(next[j], 1 / CEILING_VELOCITY_MPS);
      change = Math.max(change, Math.abs(next[j] - slowness[j]) / slowness[j]);
    }
    slowness = next;
    if (change < tolerance) {
      converged = true;
      iterations++;
      break;
    }
  }
  const model = buildL(slowness);
  const residualsS = depthsM.map((z, i) => timesS[i] - layeredRay(model, sourceDepthM, z, offsetsM[i]).timeS);
  const sse = residualsS.reduce((s, r) => s + r * r, 0);
  const variance = n > m ? sse / (n - m) : NaN;
  // Covariance of the slownesses: variance (L^T L)^-1; its diagonal by solving for unit vectors.
  const sdOf = (j: number): number | null => {
    if (!factor || !Number.isFinite(variance)) return null;
    const e = new Float64Array(m);
    e[j] = 1;
    const col = choleskySolve(factor, e, m);
    const sdS = Math.sqrt(Math.max(0, variance * col[j]));
    return sdS / (slowness[j] * slowness[j]);
  };
  return {
    layers: kept.map((t, j) => ({
      topM: t,
      bottomM: j + 1 < m ? kept[j + 1] : deepest,
      velocityMps: 1 / slowness[j],
      velocitySdMps: sdOf(j),
      receivers: depthsM.filter((z) => z > t && z <= (j + 1 < m ? kept[j + 1] : Infinity)).length,
    })),
    iterations,
    converged,
    rmsMisfitS: Math.sqrt(sse / n),
    residualsS,
  };
}
