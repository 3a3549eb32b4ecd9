/**
 * Automatic layering of downhole travel times and the layered refracted-ray fit behind it.
 *
 * Observations are direct S times to receivers (one receiver per hit: absolute times, with a fitted
 * common intercept that absorbs the mean trigger offset) or time differences between two receivers of
 * the same hit (two-receiver surveys: the trigger cancels). With the ray paths held fixed the times are
 * linear in the layer slownesses (by Fermat's principle the path lengths are the partial derivatives),
 * so the fit alternates Snell's-law ray tracing (survey/rays.ts) and weighted least squares, as in
 * velocity/rayfit.ts.
 *
 * Boundaries (mode 'auto'): candidates lie in the gaps between successive receiver depths. For the
 * times reduced to vertical paths through the current model, the layers are found by an exact optimal
 * segmentation (dynamic programming over receivers; Bellman 1961, "On the approximation of curves by
 * line segments using dynamic programming", Comm. ACM 4(6), from memory): each layer is a straight
 * line in the depth-time plot (absolute times, with its own intercept) or one slowness (differences),
 * its cost the weighted sum of squared residuals; the number of layers is chosen by the Bayesian
 * information criterion (Schwarz 1978, Ann. Stat. 6(2)): chi2 + penaltyScale * k ln N. Then each
 * boundary is placed inside its gap by a one-dimensional search of the ray-fit misfit, and the fit is
 * repeated with the new vertical reductions until the layering stops changing.
 *
 * Uncertainty: the ordinary least-squares covariance (A^T W A)^-1 scaled by the reduced chi-square when
 * that exceeds 1 (any regression text), plus, for an interval that holds a boundary, the spread of the
 * boundary inside its gap (uniform: sd = gap / sqrt 12).
 *
 * The intercept (absolute times): a free common intercept and the top layer's slowness are nearly
 * collinear. From a source offset x of 2-2.5 m the shallow rays are oblique: the slant path grows with
 * receiver depth z only by z / sqrt(z^2 + x^2) per metre (0.4 at 1 m), so the top receivers give a line of
 * time against path with a short lever arm and a poorly fixed intercept. Any curvature there (a
 * boundary between the first two receivers, which a layer of two or more receivers cannot hold) then
 * moves the intercept by several ms and the top layer's Vs by tens of per cent. But the intercept is
 * only the error common to all times (times built from one first onset and correlation delays: that
 * hit's trigger offset and the onset's pick bias, a fraction of a millisecond), so it takes a prior
 * (mean 0); and in the segmentation the top layer's line passes through the source at time 0 with that
 * sd, so a top layer may hold a single receiver and reaches up to the source for its thickness.
 *
 * Layers that do not represent the ground (user boundaries across a velocity change): the misfit of a
 * deep layer would pass into a thin top layer's slowness, which every deeper ray crosses, and could make
 * it negative, or, the misfit being far above the times' sds, override the intercept's prior (an
 * intercept beyond 3 prior sds; interceptImplausible). Then the fit is repeated on successive time
 * differences (generalised least squares for a model error that accumulates with depth), their sds
 * scaled by the reduced chi-square, with the prior on the common intercept (successiveDifferences).
 *
 * The fit never disappears silently: every failure comes back with the reason.
 */
import { layeredRay, type VelocityLayer } from '../survey/rays';
import { solveSpd } from './linalg';

export interface TimeObservation {
  /** Upper receiver depth for a difference T(b) - T(a) of one hit; null = absolute time to b. */
  depthAM: number | null;
  depthBM: number;
  /** Horizontal source-receiver offset, m (both receivers of a difference share it unless offsetAM is set). */
  offsetM: number;
  /** Horizontal offset of the upper end of a difference, m (default offsetM; 0 with depthAM at the source: the time from the source). */
  offsetAM?: number;
  timeS: number;
  sdS: number;
}

export interface LayeringOptions {
  sourceDepthM: number;
  /** 'auto': boundaries from the data; 'user': the given boundaries. */
  mode: 'auto' | 'user';
  boundariesM?: number[];
  minThicknessM: number;
  /** Absolute times: fit a common intercept (the mean trigger offset); ignored for differences. */
  intercept: boolean;
  /**
   * Prior sd of the common intercept, s (mean 0: the trigger delay is already taken off the times),
   * applied to every fit of absolute times and, in the automatic layering, to the top layer's line
   * (module comment "The intercept"). Absent: a free intercept.
   */
  interceptPriorSdS?: number;
  /** Multiplies the BIC penalty k ln N (1 = BIC). */
  penaltyScale?: number;
  maxLayers?: number;
  /** Let boundaries move to a neighbouring gap when the continuous ray fit prefers it (default on). */
  hop?: boolean;
  /** Final coordinate-descent search of the boundaries on the ray-fit misfit (slower). */
  refine?: boolean;
}

export interface FittedLayer {
  topM: number;
  /** The last layer's bottom is the deepest receiver. */
  bottomM: number;
  vsMps: number;
  vsSdMps: number;
  /** Observations whose deepest receiver lies in the layer. */
  receivers: number;
}

export interface LayeredFit {
  layers: FittedLayer[];
  /** Covariance of the layer slownesses, (s/m)^2, row-major m x m. */
  slownessCovariance: number[];
  /** Sd of each fitted boundary (between layers j and j+1), m. */
  boundarySdM: number[];
  interceptS: number | null;
  chi2: number;
  dof: number;
  rmsMisfitS: number;
  residualsS: number[];
  bic: number;
  notes: string[];
}

export type LayeringResult = { ok: true; fit: LayeredFit } | { ok: false; reason: string };

interface Problem {
  obs: TimeObservation[];
  sourceDepthM: number;
  intercept: boolean;
  /** Prior sd of the intercept (s), else undefined (LayeringOptions.interceptPriorSdS). */
  interceptPriorSdS?: number;
}

// ---------------------------------------------------------------- the ray fit for fixed boundaries

/** Path length of the ray to depth z inside each layer (tops sorted, first = source depth). */
export function pathsPerLayer(model: VelocityLayer[], sourceDepthM: number, z: number, offsetM: number): Float64Array {
  const m = model.length;
  const out = new Float64Array(m);
  const ray = layeredRay(model, sourceDepthM, z, offsetM);
  // segmentsBetween returns one segment per layer crossed, top to bottom
  let k = 0;
  for (let j = 0; j < m; j++) {
    const top = j === 0 ? -Infinity : model[j].topM;
    const bottom = j + 1 < m ? model[j + 1].topM : Infinity;
    const h = Math.min(Math.max(z, sourceDepthM), bottom) - Math.max(Math.min(z, sourceDepthM), top);
    if (h > 0) out[j] = ray.segmentPathM[k++] ?? 0;
  }
  if (ray.segmentPathM.length === 0) out[0] = Math.hypot(offsetM, z - sourceDepthM);
  return out;
}

interface RawFit {
  slowness: Float64Array;
  interceptS: number | null;
  cov: Float64Array;
  chi2: number;
  dof: number;
  residualsS: number[];
}

function fitFixed(
  p: Problem,
  topsM: number[],
  maxIterations = 20,
  start?: Float64Array,
): RawFit | { reason: string; nonPositive?: boolean } {
  const m = topsM.length;
  const useIntercept = p.intercept && p.obs.some((o) => o.depthAM === null);
  const np = m + (useIntercept ? 1 : 0);
  const n = p.obs.length;
  if (n < np)
    return {
      reason: `${n} travel times cannot fix ${np} unknowns (${m} layers${useIntercept ? ' and the trigger offset' : ''})`,
    };
  // Start: the average vertical slowness of all observations.
  let sum = 0;
  let len = 0;
  for (const o of p.obs) {
    const za = o.depthAM ?? p.sourceDepthM;
    sum += Math.abs(o.timeS);
    len += Math.abs(o.depthBM - za);
  }
  let slowness = start && start.length === m ? start.slice() : new Float64Array(m).fill(len > 0 ? sum / len : 1 / 200);
  let intercept = 0;
  let last: RawFit | null = null;
  for (let it = 0; it < maxIterations; it++) {
    const model: VelocityLayer[] = topsM.map((t, j) => ({ topM: t, velocityMps: 1 / slowness[j] }));
    const A = new Float64Array(n * np);
    p.obs.forEach((o, i) => {
      const pb = pathsPerLayer(model, p.sourceDepthM, o.depthBM, o.offsetM);
      const pa = o.depthAM === null ? null : pathsPerLayer(model, p.sourceDepthM, o.depthAM, o.offsetAM ?? o.offsetM);
      for (let j = 0; j < m; j++) A[i * np + j] = pb[j] - (pa ? pa[j] : 0);
      if (useIntercept && o.depthAM === null) A[i * np + m] = 1;
    });
    const ata = new Float64Array(np * np);
    const atb = new Float64Array(np);
    p.obs.forEach((o, i) => {
      const w = 1 / (o.sdS * o.sdS);
      for (let a = 0; a < np; a++) {
        const va = A[i * np + a];
        if (va === 0) continue;
        atb[a] += w * va * o.timeS;
        for (let b = 0; b < np; b++) ata[a * np + b] += w * va * A[i * np + b];
      }
    });
    // the intercept's prior (mean 0) as one more observation of it
    const prior = useIntercept && p.interceptPriorSdS && p.interceptPriorSdS > 0 ? p.interceptPriorSdS : 0;
    if (prior) ata[m * np + m] += 1 / (prior * prior);
    const sol = solveSpd(ata, atb, np);
    if (!sol) return { reason: 'the layers are not all crossed by the rays (a layer without receivers)' };
    const next = sol.x.slice(0, m);
    for (let j = 0; j < m; j++)
      if (!(next[j] > 0))
        return {
          reason: `layer ${j + 1} (from ${topsM[j].toFixed(2)} m) would need a negative or infinite travel time: its times are out of order`,
          nonPositive: true,
        };
    let change = 0;
    for (let j = 0; j < m; j++) change = Math.max(change, Math.abs(next[j] - slowness[j]) / slowness[j]);
    slowness = next;
    intercept = useIntercept ? sol.x[m] : 0;
    // residuals with the solved slownesses on these paths (Fermat: first-order exact)
    const residualsS = p.obs.map((o, i) => {
      let t = useIntercept && o.depthAM === null ? intercept : 0;
      for (let j = 0; j < m; j++) t += A[i * np + j] * slowness[j];
      return o.timeS - t;
    });
    const chi2 =
      residualsS.reduce((s, r, i) => s + (r / p.obs[i].sdS) ** 2, 0) + (prior ? (intercept / prior) ** 2 : 0);
    const dof = n - np + (prior ? 1 : 0);
    last = { slowness, interceptS: useIntercept ? intercept : null, cov: sol.inv, chi2, dof, residualsS };
    if (change < 1e-7) break;
  }
  return last!;
}

// ---------------------------------------------------------------- segmentation

/** Vertical reductions: each observation's time minus (ray time - vertical time) through the model. */
function verticalReduced(p: Problem, topsM: number[], slowness: Float64Array | null): TimeObservation[] {
  return p.obs.map((o) => {
    const za = o.depthAM ?? p.sourceDepthM;
    let corr: number;
    if (!slowness) {
      // straight rays at one velocity: vertical time = time x vertical / slant
      const sb = Math.hypot(o.offsetM, o.depthBM - p.sourceDepthM);
      const sa = Math.hypot(o.offsetAM ?? o.offsetM, za - p.sourceDepthM);
      const vert = o.depthBM - za;
      const slant = sb - sa;
      return { ...o, timeS: slant > 0 ? (o.timeS * vert) / slant : o.timeS };
    }
    const model: VelocityLayer[] = topsM.map((t, j) => ({ topM: t, velocityMps: 1 / slowness[j] }));
    const rb = layeredRay(model, p.sourceDepthM, o.depthBM, o.offsetM).timeS;
    const vb = layeredRay(model, p.sourceDepthM, o.depthBM, 0).timeS;
    corr = rb - vb;
    if (o.depthAM !== null) {
      const ra = layeredRay(model, p.sourceDepthM, o.depthAM, o.offsetAM ?? o.offsetM).timeS;
      const va = layeredRay(model, p.sourceDepthM, o.depthAM, 0).timeS;
      corr -= ra - va;
    }
    return { ...o, timeS: o.timeS - corr };
  });
}

/**
 * Exact optimal segmentation of the receivers into 1..maxLayers layers (dynamic programming), the
 * number chosen by the penalised chi-square. Returns the index of the last receiver of each layer.
 */
export function segmentReceivers(
  depthsM: number[],
  obs: TimeObservation[],
  o: {
    absolute: boolean;
    minThicknessM: number;
    penaltyScale: number;
    maxLayers: number;
    /** Absolute times: the top layer's line passes through the source (time 0 ± sdS at depthM). */
    origin?: { depthM: number; sdS: number };
  },
): { ends: number[]; lines: { interceptS: number; slownessSpM: number }[]; chi2: number; bic: number } | null {
  const n = depthsM.length;
  if (n < 2) return null;
  const idx = new Map(depthsM.map((z, i) => [z, i]));
  // cost[i][j]: layer holding receivers i..j
  const cost: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(Infinity));
  // fitted line of each candidate layer: t = intercept + slowness z (differences: slowness only)
  const slopeOf: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(NaN));
  const interceptOf: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const gapBelow = (j: number) => (j + 1 < n ? depthsM[j + 1] - depthsM[j] : 0);
  const gapAbove = (i: number) => (i > 0 ? depthsM[i] - depthsM[i - 1] : 0);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      // with the source pinned, the top layer reaches up to the source
      const pin = i === 0 && o.absolute && o.origin ? o.origin : null;
      const thick = pin
        ? depthsM[j] + 0.5 * gapBelow(j) - pin.depthM
        : depthsM[j] - depthsM[i] + 0.5 * (gapAbove(i) + gapBelow(j));
      if (thick + 1e-9 < o.minThicknessM && !(i === 0 && j === n - 1)) continue;
      if (o.absolute) {
        if (j - i < (pin ? 0 : 1)) continue;
        // weighted straight-line fit t = a + s z over receivers i..j (and the source point, pin)
        const w0 = pin ? 1 / (pin.sdS * pin.sdS) : 0;
        let sw = w0;
        let sz = pin ? w0 * pin.depthM : 0;
        let st = 0;
        let szz = pin ? w0 * pin.depthM * pin.depthM : 0;
        let szt = 0;
        let stt = 0;
        for (const ob of obs) {
          const k = idx.get(ob.depthBM)!;
          if (k < i || k > j) continue;
          const w = 1 / (ob.sdS * ob.sdS);
          sw += w;
          sz += w * ob.depthBM;
          st += w * ob.timeS;
          szz += w * ob.depthBM * ob.depthBM;
          szt += w * ob.depthBM * ob.timeS;
          stt += w * ob.timeS * ob.timeS;
        }
        const det = sw * szz - sz * sz;
        if (!(det > 0)) continue;
        const s = (sw * szt - sz * st) / det;
        const a = (st - s * sz) / sw;
        cost[i][j] = Math.max(0, stt - 2 * a * st - 2 * s * szt + a * a * sw + 2 * a * s * sz + s * s * szz);
        slopeOf[i][j] = s;
        interceptOf[i][j] = a;
      } else {
        // one slowness for the differences wholly inside receivers i..j
        let shh = 0;
        let sht = 0;
        let stt = 0;
        let count = 0;
        for (const ob of obs) {
          const a = idx.get(ob.depthAM!)!;
          const b = idx.get(ob.depthBM)!;
          if (a < i || b > j) continue;
          const w = 1 / (ob.sdS * ob.sdS);
          const h = ob.depthBM - ob.depthAM!;
          shh += w * h * h;
          sht += w * h * ob.timeS;
          stt += w * ob.timeS * ob.timeS;
          count++;
        }
        if (!count) continue;
        cost[i][j] = Math.max(0, stt - (sht * sht) / shh);
        slopeOf[i][j] = sht / shh;
      }
    }
  }
  const maxK = Math.min(o.maxLayers, n);
  // best[k][j]: min cost of receivers 0..j in k+1 layers; from[k][j]: start of the last layer
  const best: number[][] = Array.from({ length: maxK }, () => new Array<number>(n).fill(Infinity));
  const from: number[][] = Array.from({ length: maxK }, () => new Array<number>(n).fill(-1));
  for (let j = 0; j < n; j++) best[0][j] = cost[0][j];
  for (let k = 1; k < maxK; k++)
    for (let j = 0; j < n; j++)
      for (let i = 1; i <= j; i++) {
        const c = best[k - 1][i - 1] + cost[i][j];
        if (c < best[k][j]) {
          best[k][j] = c;
          from[k][j] = i;
        }
      }
  const N = obs.length;
  let choice = -1;
  let bestBic = Infinity;
  for (let k = 0; k < maxK; k++) {
    if (!Number.isFinite(best[k][n - 1])) continue;
    const params = o.absolute ? 2 * (k + 1) : 2 * (k + 1) - 1;
    const bic = best[k][n - 1] + o.penaltyScale * params * Math.log(Math.max(N, 2));
    if (bic < bestBic - 1e-9) {
      bestBic = bic;
      choice = k;
    }
  }
  if (choice < 0) return null;
  const ends: number[] = [];
  let j = n - 1;
  for (let k = choice; k >= 0; k--) {
    ends.unshift(j);
    j = k > 0 ? from[k][j] - 1 : -1;
  }
  const lines = ends.map((e, k) => {
    const start = k === 0 ? 0 : ends[k - 1] + 1;
    return { interceptS: interceptOf[start][e], slownessSpM: slopeOf[start][e] };
  });
  return { ends, lines, chi2: best[choice][n - 1], bic: bestBic };
}

/**
 * Each boundary inside its gap, from the layers' lines on the vertically reduced times: where the
 * lines of the layers above and below cross (absolute times), or where the one difference that
 * straddles the gap is matched by the two slownesses (two receivers); the gap's middle otherwise.
 */
function placeBoundaries(
  reduced: TimeObservation[],
  gaps: [number, number][],
  lines: { interceptS: number; slownessSpM: number }[],
  absolute: boolean,
): number[] {
  return gaps.map(([lo, hi], b) => {
    const up = lines[b];
    const down = lines[b + 1];
    const ds = up.slownessSpM - down.slownessSpM;
    let z = 0.5 * (lo + hi);
    if (Math.abs(ds) > 1e-12) {
      if (absolute) z = (down.interceptS - up.interceptS) / ds;
      else {
        const o = reduced.find((x) => x.depthAM !== null && x.depthAM <= lo + 1e-9 && x.depthBM >= hi - 1e-9);
        if (o) {
          const a = o.depthAM!;
          const g = o.depthBM - a;
          z = a + (o.timeS - g * down.slownessSpM) / ds;
        }
      }
    }
    return Math.min(hi, Math.max(lo, Number.isFinite(z) ? z : 0.5 * (lo + hi)));
  });
}

function chi2Of(p: Problem, tops: number[], start?: Float64Array, maxIterations = 20): number {
  const f = fitFixed(p, tops, maxIterations, start);
  return 'reason' in f ? Infinity : f.chi2;
}

/**
 * The segmentation's cost lets each layer's line start afresh; the ray fit makes travel time
 * continuous across a boundary. So each boundary may move to the neighbouring gap, or within its gap,
 * when that lowers the ray-fit chi-square (coordinate descent over the boundaries, a few sweeps).
 */
function hopBoundaries(
  p: Problem,
  tops: number[],
  gaps: [number, number][],
  depthsM: number[],
  start: Float64Array,
): { tops: number[]; gaps: [number, number][] } {
  const out = [...tops];
  const g = gaps.map((x) => [...x] as [number, number]);
  let best = chi2Of(p, out, start, 4);
  for (let sweep = 0; sweep < 3; sweep++) {
    let improved = false;
    for (let b = 1; b < out.length; b++) {
      const k = depthsM.indexOf(g[b - 1][0]);
      for (const dk of [-1, 0, 1]) {
        const lo = depthsM[k + dk];
        const hi = depthsM[k + dk + 1];
        if (lo === undefined || hi === undefined) continue;
        const above = b > 1 ? out[b - 1] : p.sourceDepthM;
        const below = b + 1 < out.length ? out[b + 1] : Infinity;
        if (!(lo >= above) || !(hi <= below)) continue;
        // the layers either side must keep a receiver each
        if (!depthsM.some((z) => z > above && z <= lo) || !depthsM.some((z) => z >= hi && z < below)) continue;
        for (const f of [0.2, 0.5, 0.8]) {
          const z = lo + f * (hi - lo);
          const t = [...out];
          t[b] = z;
          const c = chi2Of(p, t, start, 4);
          if (c < best - 1e-9) {
            best = c;
            out[b] = z;
            g[b - 1] = [lo, hi];
            improved = true;
          }
        }
      }
    }
    if (!improved) break;
  }
  return { tops: out, gaps: g };
}

/** Places each boundary inside its gap by golden-section search of the ray-fit chi-square. */
function refineBoundaries(p: Problem, tops: number[], gaps: [number, number][]): number[] {
  const out = [...tops];
  const r = (Math.sqrt(5) - 1) / 2;
  const first = fitFixed(p, out);
  const start = 'reason' in first ? undefined : first.slowness;
  // coordinate descent: sweeps over the boundaries until none moves by more than 1 mm
  for (let sweep = 0, moved = Infinity; sweep < 8 && moved > 1e-3; sweep++) {
    moved = 0;
    for (let b = 1; b < out.length; b++) {
      let [lo, hi] = gaps[b - 1];
      const at = (z: number) => {
        const t = [...out];
        t[b] = z;
        return chi2Of(p, t, start);
      };
      let x1 = hi - r * (hi - lo);
      let x2 = lo + r * (hi - lo);
      let f1 = at(x1);
      let f2 = at(x2);
      for (let it = 0; it < 22; it++) {
        if (f1 <= f2) {
          hi = x2;
          x2 = x1;
          f2 = f1;
          x1 = hi - r * (hi - lo);
          f1 = at(x1);
        } else {
          lo = x1;
          x1 = x2;
          f1 = f2;
          x2 = lo + r * (hi - lo);
          f2 = at(x2);
        }
      }
      moved = Math.max(moved, Math.abs(out[b] - 0.5 * (lo + hi)));
      out[b] = 0.5 * (lo + hi);
    }
  }
  return out;
}

/**
 * Absolute times as successive differences (the shallowest time kept absolute). When the layers do
 * not represent the ground (user boundaries across a velocity change), the misfit of a layer carries
 * into every deeper time, and every deeper ray crosses the top layer, so a thin top layer's slowness
 * (collinear with the common intercept for near-vertical rays) absorbs the deeper layers' misfit and
 * can go negative. The travel time error of a layered model accumulates with depth like a random walk;
 * generalised least squares under such errors is ordinary least squares on the successive differences
 * (each layer's slowness then rests on the receivers about it). Each difference of two times that each
 * carry the trigger prior has sd sqrt(sa^2 + sb^2).
 */
function successiveDifferences(obs: readonly TimeObservation[]): TimeObservation[] {
  const s = [...obs].sort((a, b) => a.depthBM - b.depthBM);
  return s.map((o, i) =>
    i === 0
      ? o
      : {
          depthAM: s[i - 1].depthBM,
          depthBM: o.depthBM,
          offsetM: o.offsetM,
          timeS: o.timeS - s[i - 1].timeS,
          sdS: Math.hypot(o.sdS, s[i - 1].sdS),
        },
  );
}

/** Residuals of the original absolute times for slownesses and an intercept fitted otherwise. */
function absoluteResiduals(p: Problem, topsM: number[], f: RawFit): number[] {
  const model: VelocityLayer[] = topsM.map((t, j) => ({ topM: t, velocityMps: 1 / f.slowness[j] }));
  return p.obs.map((o) => {
    const pb = pathsPerLayer(model, p.sourceDepthM, o.depthBM, o.offsetM);
    let t = f.interceptS ?? 0;
    for (let j = 0; j < topsM.length; j++) t += pb[j] * f.slowness[j];
    return o.timeS - t;
  });
}

/**
 * The fitted intercept lies more than 3 prior sds from 0: the layers leave a misfit far above the
 * times' sds (layers that do not represent the ground) that overrides the prior and passes into the top
 * layer through the intercept, the same symptom as a non-positive slowness (module comment).
 */
function interceptImplausible(p: Problem, f: RawFit): boolean {
  const sd = p.interceptPriorSdS;
  return f.interceptS !== null && sd !== undefined && sd > 0 && Math.abs(f.interceptS) > 3 * sd;
}

function finish(p: Problem, tops: number[], gaps: [number, number][], bic: number, notes: string[]): LayeringResult {
  let f = fitFixed(p, tops);
  const absolute = p.obs.every((o) => o.depthAM === null);
  if (absolute && p.obs.length > 2 && ('reason' in f ? f.nonPositive : interceptImplausible(p, f))) {
    // the layers leave a misfit that a thin layer above absorbs: fit on successive differences instead
    // the differences' sds take the model error (reduced chi-square of a first fit) so that the
    // intercept's prior keeps its weight against a misfit the sds of the times do not hold
    let diffs = successiveDifferences(p.obs);
    let d = fitFixed({ ...p, obs: diffs }, tops);
    for (let pass = 0; pass < 3 && !('reason' in d) && d.dof > 0 && d.chi2 / d.dof > 1.01; pass++) {
      const inflate = Math.sqrt(d.chi2 / d.dof);
      diffs = diffs.map((o) => ({ ...o, sdS: o.sdS * inflate }));
      d = fitFixed({ ...p, obs: diffs }, tops);
    }
    if (!('reason' in d)) {
      // chi-square of the inflated differences (the covariance already holds the model error);
      // residuals of the absolute times, for the local misfit about each interval
      f = { ...d, residualsS: absoluteResiduals(p, tops, d) };
      notes.push(
        'the layers do not represent the travel times well (a layer spans a velocity change): fitted on successive time differences, so each layer rests on its own receivers',
      );
    }
  }
  if ('reason' in f) return { ok: false, reason: f.reason };
  const m = tops.length;
  const np = f.cov.length === m * m ? m : m + 1;
  const scale = f.dof > 0 ? Math.max(1, f.chi2 / f.dof) : 1;
  const cov: number[] = [];
  for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) cov.push(f.cov[a * np + b] * scale);
  const depths = p.obs.map((o) => o.depthBM);
  const deepest = Math.max(...depths);
  const layers: FittedLayer[] = tops.map((t, j) => {
    const bottom = j + 1 < m ? tops[j + 1] : deepest;
    const s = f.slowness[j];
    return {
      topM: t,
      bottomM: bottom,
      vsMps: 1 / s,
      vsSdMps: Math.sqrt(Math.max(0, cov[j * m + j])) / (s * s),
      receivers: new Set(depths.filter((z) => z > t && (j + 1 >= m || z <= tops[j + 1]))).size,
    };
  });
  const interceptSd = f.interceptS === null ? null : Math.sqrt(f.cov[m * np + m] * scale);
  if (f.interceptS !== null && interceptSd !== null)
    notes.push(
      `trigger offset absorbed: fitted common intercept ${(f.interceptS * 1000).toFixed(3)} ± ${(interceptSd * 1000).toFixed(3)} ms`,
    );
  return {
    ok: true,
    fit: {
      layers,
      slownessCovariance: cov,
      boundarySdM: gaps.map(([lo, hi]) => (hi - lo) / Math.sqrt(12)),
      interceptS: f.interceptS,
      chi2: f.chi2,
      dof: f.dof,
      rmsMisfitS: Math.sqrt(f.residualsS.reduce((s, r) => s + r * r, 0) / f.residualsS.length),
      residualsS: f.residualsS,
      bic,
      notes,
    },
  };
}

/** The layered S model from travel times: boundaries automatic or the user's, per-layer Vs and sd. */
export function fitLayering(observations: TimeObservation[], o: LayeringOptions): LayeringResult {
  const obs = observations.filter((x) => Number.isFinite(x.timeS) && x.sdS > 0);
  const dropped = observations.length - obs.length;
  const notes: string[] = dropped ? [`${dropped} travel times without a value or sd left out`] : [];
  if (obs.length < 2) return { ok: false, reason: `only ${obs.length} usable travel times (2 or more needed)` };
  const absolute = obs.every((x) => x.depthAM === null);
  const differences = obs.every((x) => x.depthAM !== null);
  if (!absolute && !differences)
    return { ok: false, reason: 'absolute times and two-receiver differences cannot be mixed in one fit' };
  const p: Problem = {
    obs,
    sourceDepthM: o.sourceDepthM,
    intercept: o.intercept,
    interceptPriorSdS: o.interceptPriorSdS,
  };
  const depthsM = [...new Set(obs.flatMap((x) => (x.depthAM === null ? [x.depthBM] : [x.depthAM, x.depthBM])))].sort(
    (a, b) => a - b,
  );
  const top0 = o.sourceDepthM;
  const gapOf = (z: number): [number, number] => {
    let lo = top0;
    let hi = depthsM[depthsM.length - 1];
    for (const d of depthsM) {
      if (d <= z) lo = d;
      else {
        hi = d;
        break;
      }
    }
    return [lo, hi];
  };
  if (o.mode === 'user') {
    const wanted = [...new Set(o.boundariesM ?? [])].sort((a, b) => a - b);
    const tops = [top0];
    for (const b of wanted) {
      if (!(b > top0) || b >= depthsM[depthsM.length - 1]) {
        notes.push(`boundary at ${b} m ignored: outside the receivers (${top0}-${depthsM[depthsM.length - 1]} m)`);
        continue;
      }
      const prev = tops[tops.length - 1];
      if (!depthsM.some((z) => z > prev && z <= b)) {
        notes.push(`boundary at ${b} m merged with the one above: no receiver between them`);
        continue;
      }
      tops.push(b);
    }
    const gaps = tops.slice(1).map(gapOf);
    return finish(p, tops, gaps, NaN, notes);
  }
  // auto: segmentation on vertical reductions, repeated until the layering is stable
  let tops = [top0];
  let slowness: Float64Array | null = null;
  let bic = NaN;
  let gaps: [number, number][] = [];
  let previous = '';
  for (let pass = 0; pass < 12; pass++) {
    const reduced = verticalReduced(p, tops, slowness);
    const seg = segmentReceivers(depthsM, reduced, {
      absolute,
      minThicknessM: o.minThicknessM,
      penaltyScale: o.penaltyScale ?? 1,
      maxLayers: o.maxLayers ?? 12,
      // the top layer's line passes through the source within the intercept's prior (module comment)
      origin: absolute && o.intercept && o.interceptPriorSdS ? { depthM: top0, sdS: o.interceptPriorSdS } : undefined,
    });
    if (!seg) return { ok: false, reason: 'too few receivers for a layering' };
    bic = seg.bic;
    gaps = seg.ends.slice(0, -1).map((e) => [depthsM[e], depthsM[e + 1]] as [number, number]);
    const next = [top0, ...placeBoundaries(reduced, gaps, seg.lines, absolute)];
    const signature = seg.ends.join(',');
    const moved = signature === previous ? Math.max(...next.map((z, k) => Math.abs(z - tops[k]))) : Infinity;
    tops = next;
    const f = fitFixed(p, tops, 20, signature === previous ? (slowness ?? undefined) : undefined);
    if ('reason' in f) return { ok: false, reason: f.reason };
    slowness = f.slowness;
    if (moved < 1e-4) break;
    previous = signature;
  }
  if (o.hop !== false && slowness && tops.length > 1) {
    const h = hopBoundaries(p, tops, gaps, depthsM, slowness);
    tops = h.tops;
    gaps = h.gaps;
    // back into closed-form placement within the chosen gaps is not repeated: the search set the position
  }
  if (o.refine) tops = refineBoundaries(p, tops, gaps);
  return finish(p, tops, gaps, bic, notes);
}

/**
 * An interval's Vs from the layered model: length / vertical time through the fitted layers, with sd
 * from the slowness covariance and the spread of any boundary inside the interval.
 */
export function layerIntervalVs(
  fit: LayeredFit,
  topM: number,
  bottomM: number,
  boundarySdScale = 1,
): { vsMps: number; vsSdMps: number } {
  const m = fit.layers.length;
  const h = new Array<number>(m).fill(0);
  fit.layers.forEach((l, j) => {
    const lt = j === 0 ? -Infinity : l.topM;
    const lb = j + 1 < m ? fit.layers[j + 1].topM : Infinity;
    h[j] = Math.max(0, Math.min(bottomM, lb) - Math.max(topM, lt));
  });
  let t = 0;
  for (let j = 0; j < m; j++) t += h[j] / fit.layers[j].vsMps;
  let varT = 0;
  for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) varT += h[a] * h[b] * fit.slownessCovariance[a * m + b];
  // each boundary's position: dT/dz = s_above - s_below times the length of the interval that would
  // change sides were the boundary elsewhere (Gaussian, sd boundarySdM x boundarySdScale); for an
  // interval that holds the boundary this is the boundary's own sd
  for (let j = 1; j < m; j++) {
    const sdB = fit.boundarySdM[j - 1] * boundarySdScale;
    if (!(sdB > 0)) continue;
    const ds = 1 / fit.layers[j - 1].vsMps - 1 / fit.layers[j].vsMps;
    varT += ds * ds * switchedLengthVar(fit.layers[j].topM, sdB, topM, bottomM);
  }
  const len = bottomM - topM;
  const v = len / t;
  return { vsMps: v, vsSdMps: (len * Math.sqrt(varT)) / (t * t) };
}

/** E[(length of [top, bottom] between zb and z)^2] for z ~ N(zb, sd^2) (41-point rule over +-4 sd). */
function switchedLengthVar(zb: number, sd: number, topM: number, bottomM: number): number {
  if (zb + 4 * sd <= topM || zb - 4 * sd >= bottomM) return 0;
  const clip = (z: number) => Math.min(bottomM, Math.max(topM, z));
  let sw = 0;
  let acc = 0;
  for (let k = -20; k <= 20; k++) {
    const u = k / 5;
    const w = Math.exp(-0.5 * u * u);
    const d = clip(zb + u * sd) - clip(zb);
    sw += w;
    acc += w * d * d;
  }
  return acc / sw;
}

export interface BlendInput {
  topM: number;
  bottomM: number;
  /** From the layered model. */
  layerVsMps: number;
  layerSdMps: number;
  /** The interval's own measurement (e.g. the correlation delay), when it has one. */
  ownVsMps: number | null;
  ownSdMps: number | null;
}

/**
 * Each interval's Vs from the layered model used as a prior and the interval's own measurement as
 * data (precision-weighted, in slowness). The model error, the spread of true interval slownesses
 * about their layer's, is estimated from the data by the method of moments (the mean squared
 * difference between the two less the variance both claim; DerSimonian & Laird 1986, Control. Clin.
 * Trials 7(3), from memory) and added to the prior's variance, so an interval that the layers do not
 * represent (a thin layer between two receivers) follows its own measurement, with an sd that says so.
 * `modelSdShare` sets a floor on the model error as a share of the layer slowness (tuned on training seeds).
 */
export function blendIntervals(
  rows: BlendInput[],
  o: { modelSdShare?: number } = {},
): { vsMps: number; vsSdMps: number; layerWithModelSdMps: number; modelSdSpM: number }[] {
  const sl = rows.map((r) => {
    const sLayer = 1 / r.layerVsMps;
    const vLayer = (r.layerSdMps * sLayer * sLayer) ** 2;
    const own = r.ownVsMps !== null && r.ownVsMps > 0 && r.ownSdMps !== null && r.ownSdMps > 0;
    const sOwn = own ? 1 / r.ownVsMps! : NaN;
    const vOwn = own ? (r.ownSdMps! * sOwn * sOwn) ** 2 : NaN;
    return { sLayer, vLayer, sOwn, vOwn, own };
  });
  const withOwn = sl.filter((x) => x.own);
  let tau2 = 0;
  if (withOwn.length >= 3) {
    const excess = withOwn.map((x) => (x.sOwn - x.sLayer) ** 2 - x.vOwn - x.vLayer);
    tau2 = Math.max(0, excess.reduce((s, e) => s + e, 0) / excess.length);
  }
  // a floor on the model error: a share of the layer's slowness (an interval inside a layer need not
  // share its value exactly even where the data cannot tell)
  const share = o.modelSdShare ?? 0;
  return sl.map((x) => {
    const vPrior = x.vLayer + Math.max(tau2, (share * x.sLayer) ** 2);
    let s = x.sLayer;
    let v = vPrior;
    // where this interval's own measurement disagrees with the layers by more than both claim, the
    // layers' sd takes the excess (a local method-of-moments estimate, never below the pooled one)
    let vLocal = vPrior;
    if (x.own) {
      vLocal = Math.max(vPrior, x.vLayer + (x.sOwn - x.sLayer) ** 2 - x.vOwn);
      const w1 = 1 / vLocal;
      const w2 = 1 / x.vOwn;
      s = (w1 * x.sLayer + w2 * x.sOwn) / (w1 + w2);
      v = 1 / (w1 + w2);
    }
    return {
      vsMps: 1 / s,
      vsSdMps: Math.sqrt(v) / (s * s),
      layerWithModelSdMps: Math.sqrt(vLocal) / (x.sLayer * x.sLayer),
      modelSdSpM: Math.sqrt(tau2),
    };
  });
}

/**
 * Local misfit of the layered model about an interval, as a slowness sd (s/m): the drift of the fit's
 * time residuals over the receivers within windowM of the interval, less what the times' own sds
 * explain. A layer the model missed (a thin layer, a gradient) leaves residuals that drift across
 * it; inside a well-fitted layer they do not. Absolute times: the weighted least-squares slope of
 * residual against depth and its variance; differences: the summed residual over the summed length.
 * 0 when the window holds too little to tell.
 */
export function localMisfitSlownessSd(
  obs: readonly TimeObservation[],
  residualsS: readonly number[],
  topM: number,
  bottomM: number,
  windowM: number,
): number {
  if (obs.length !== residualsS.length) return 0;
  const lo = topM - windowM - 1e-9;
  const hi = bottomM + windowM + 1e-9;
  const idx = obs.map((_, i) => i).filter((i) => obs[i].depthBM >= lo && (obs[i].depthAM ?? obs[i].depthBM) <= hi);
  if (obs.every((o) => o.depthAM === null)) {
    if (idx.length < 3) return 0;
    let sw = 0;
    let sz = 0;
    let sr = 0;
    for (const i of idx) {
      const w = 1 / obs[i].sdS ** 2;
      sw += w;
      sz += w * obs[i].depthBM;
      sr += w * residualsS[i];
    }
    const zm = sz / sw;
    const rm = sr / sw;
    let szz = 0;
    let szr = 0;
    for (const i of idx) {
      const w = 1 / obs[i].sdS ** 2;
      szz += w * (obs[i].depthBM - zm) ** 2;
      szr += w * (obs[i].depthBM - zm) * (residualsS[i] - rm);
    }
    if (!(szz > 0)) return 0;
    const slope = szr / szz;
    return Math.sqrt(Math.max(0, slope * slope - 1 / szz));
  }
  if (idx.length < 2) return 0;
  let len = 0;
  let sum = 0;
  let v = 0;
  for (const i of idx) {
    len += obs[i].depthBM - (obs[i].depthAM ?? 0);
    sum += residualsS[i];
    v += obs[i].sdS ** 2;
  }
  if (!(len > 0)) return 0;
  return Math.sqrt(Math.max(0, (sum * sum - v) / (len * len)));
}
