/**
 * Refracted (Snell's law) ray paths through flat layers between a source and a receiver.
 *
 * For the layers crossed, thickness h_j and velocity V_j, and ray parameter p = sin(theta_j)/V_j:
 *   X(p) = sum h_j p V_j / sqrt(1 - p^2 V_j^2)        (horizontal distance travelled)
 *   T(p) = sum h_j / (V_j sqrt(1 - p^2 V_j^2))        (travel time)
 * X rises monotonically with p on [0, 1/max V_j), so X(p) = x is solved by safeguarded Newton steps.
 * (Any seismology text, e.g. Shearer, Introduction to Seismology, ch. 4; formulas in docs/methods.md.)
 */

/** A layered velocity model: layer j spans [topM_j, topM_{j+1}); the last layer extends downwards without end. */
export interface VelocityLayer {
  topM: number;
  velocityMps: number;
}

/** One straight piece of a ray inside one layer. */
export interface RaySegment {
  thicknessM: number;
  velocityMps: number;
}

export interface RayResult {
  /** Travel time, s. */
  timeS: number;
  /** Ray parameter, s/m. */
  rayParameterSpM: number;
  /** Total ray path length, m. */
  pathLengthM: number;
  /** Length of the path inside each segment, m (same order as the segments). */
  segmentPathM: number[];
}

/** Thickness of each model layer between two depths (order top to bottom), skipping empty ones. */
export function segmentsBetween(model: readonly VelocityLayer[], depthAM: number, depthBM: number): RaySegment[] {
  const top = Math.min(depthAM, depthBM);
  const bottom = Math.max(depthAM, depthBM);
  const out: RaySegment[] = [];
  for (let j = 0; j < model.length; j++) {
    const layerTop = j === 0 ? -Infinity : model[j].topM;
    const layerBottom = j + 1 < model.length ? model[j + 1].topM : Infinity;
    const h = Math.min(bottom, layerBottom) - Math.max(top, layerTop);
    if (h > 0) out.push({ thicknessM: h, velocityMps: model[j].velocityMps });
  }
  return out;
}

/**
 * Ray through the given segments that covers horizontal distance offsetM (>= 0).
 * With no vertical extent (all segments empty) the ray is horizontal in the layer given by
 * `fallbackVelocityMps`.
 */
export function traceRay(segs: readonly RaySegment[], offsetM: number, fallbackVelocityMps?: number): RayResult {
  const x = Math.abs(offsetM);
  const used = segs.filter((s) => s.thicknessM > 0);
  if (used.length === 0) {
    const v = fallbackVelocityMps ?? NaN;
    return { timeS: x / v, rayParameterSpM: 1 / v, pathLengthM: x, segmentPathM: segs.map(() => 0) };
  }
  let vMax = 0;
  for (const s of used) vMax = Math.max(vMax, s.velocityMps);
  let p = 0;
  if (x > 0) {
    // Safeguarded Newton on q = p * vMax in [0, 1): X is monotone and convex in q and unbounded as
    // q -> 1; a Newton step that leaves the bracket is replaced by bisection. dX/dp = sum h V / c^3.
    let lo = 0;
    let hi = 1;
    let q = 0.5;
    for (let it = 0; it < 100; it++) {
      const pp = q / vMax;
      let xq = 0;
      let dxdp = 0;
      for (const s of used) {
        const pv = pp * s.velocityMps;
        const c = Math.sqrt(1 - pv * pv);
        xq += (s.thicknessM * pv) / c;
        dxdp += (s.thicknessM * s.velocityMps) / (c * c * c);
      }
      const f = xq - x;
      if (Math.abs(f) <= 1e-13 * x) break;
      if (f < 0) lo = q;
      else hi = q;
      let next = q - (f / dxdp) * vMax;
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      if (hi - lo < 1e-15) break;
      q = next;
    }
    p = q / vMax;
  }
  let t = 0;
  let len = 0;
  const segmentPathM = segs.map((s) => {
    if (s.thicknessM <= 0) return 0;
    const pv = p * s.velocityMps;
    const cos = Math.sqrt(1 - pv * pv);
    const l = s.thicknessM / cos;
    t += l / s.velocityMps;
    len += l;
    return l;
  });
  return { timeS: t, rayParameterSpM: p, pathLengthM: len, segmentPathM };
}

/** Velocity of the model layer that contains depth z. */
export function velocityAtDepth(model: readonly VelocityLayer[], depthM: number): number {
  let v = model[0].velocityMps;
  for (const l of model) if (depthM >= l.topM) v = l.velocityMps;
  return v;
}

/** Direct (refracted) ray time from a source at (0, sourceDepthM) to a receiver at (offsetM, receiverDepthM). */
export function layeredRay(
  model: readonly VelocityLayer[],
  sourceDepthM: number,
  receiverDepthM: number,
  offsetM: number,
): RayResult {
  const segs = segmentsBetween(model, sourceDepthM, receiverDepthM);
  return traceRay(segs, offsetM, velocityAtDepth(model, Math.min(sourceDepthM, receiverDepthM)));
}
