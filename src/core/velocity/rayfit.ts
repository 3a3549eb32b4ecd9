/**
 * Layer velocities from downhole direct times with refracted rays (the ray-path approach compared by
 * Kim, Bang & Kim 2004, Geotech. Testing J. 27(6)): layers between successive receiver depths; for
 * fixed ray paths the times are linear in the layer slownesses, T_i = sum_j L_ij s_j, so we alternate
 * (1) tracing Snell's-law rays through the current model and (2) a damped least-squares solve for the
 * slownesses, until the slownesses change by less than `tolerance` (relative) or `maxIterations` runs out.
 * The misfit reported is the RMS time residual.
 */
import { traceRay, segmentsBetween, type VelocityLayer } from '../survey/rays';

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
  layers: { topM: number; bottomM: number; velocityMps: number }[];
  iterations: number;
  converged: boolean;
  rmsMisfitS: number;
  residualsS: number[];
}

/** Solves the symmetric positive-definite system A x = b (Cholesky); returns null when A is not SPD. */
function choleskySolve(a: Float64Array, b: Float64Array, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j];
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * y[k];
    y[i] = s / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * x[k];
    x[i] = s / l[i * n + i];
  }
  return x;
}

export function fitLayersWithRays(input: RayFitInput, o: { maxIterations?: number; tolerance?: number; damping?: number } = {}): RayFitResult | null {
  const { depthsM, timesS, offsetsM, sourceDepthM } = input;
  const n = depthsM.length;
  if (n < 2) return null;
  const maxIterations = o.maxIterations ?? 30;
  const tolerance = o.tolerance ?? 1e-6;
  const damping = o.damping ?? 1e-6;
  const tops = depthsM.map((_, j) => (j === 0 ? sourceDepthM : depthsM[j - 1]));
  // Start from straight vertical-ish rays: the average slowness to each depth.
  let slowness: Float64Array = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const r = Math.hypot(offsetsM[j], depthsM[j] - sourceDepthM);
    slowness[j] = timesS[j] / r;
  }
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
    // Normal equations with a small damping towards the current model: (L^T L + eps I) s = L^T t + eps s0.
    const ata = new Float64Array(n * n);
    const atb = new Float64Array(n);
    let scale = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) scale = Math.max(scale, L[i * n + j] ** 2);
    const eps = damping * scale;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += L[k * n + i] * L[k * n + j];
        ata[i * n + j] = s + (i === j ? eps : 0);
      }
      let s = 0;
      for (let k = 0; k < n; k++) s += L[k * n + i] * timesS[k];
      atb[i] = s + eps * slowness[i];
    }
    const next = choleskySolve(ata, atb, n);
    if (!next) return null;
    // Keep slownesses physical (positive) for the next ray trace.
    let change = 0;
    for (let j = 0; j < n; j++) {
      const s = Math.max(next[j], 1e-6);
      change = Math.max(change, Math.abs(s - slowness[j]) / slowness[j]);
      next[j] = s;
    }
    slowness = next;
    if (change < tolerance) {
      converged = true;
      iterations++;
      break;
    }
  }
  const model: VelocityLayer[] = tops.map((t, j) => ({ topM: t, velocityMps: 1 / slowness[j] }));
  const residualsS = depthsM.map((z, i) => {
    const ray = traceRay(segmentsBetween(model, sourceDepthM, z), offsetsM[i], model[0].velocityMps);
    return timesS[i] - ray.timeS;
  });
  const rms = Math.sqrt(residualsS.reduce((s, r) => s + r * r, 0) / n);
  return {
    layers: model.map((m, j) => ({ topM: tops[j], bottomM: depthsM[j], velocityMps: m.velocityMps })),
    iterations,
    converged,
    rmsMisfitS: rms,
    residualsS,
  };
}
