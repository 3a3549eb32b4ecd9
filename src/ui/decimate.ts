/**
 * Display decimation (view shaping only): each trace is reduced to the min and max of the samples in
 * every pixel column, in the order they occur, so peaks survive at any zoom and a 300 x 4096 board draws
 * as fast as a small one.
 */

export interface Decimated {
  /** Times, s. */
  t: Float64Array;
  v: Float64Array;
  length: number;
}

/** Min/max per pixel column over [t0S, t1S]; when a column holds fewer than 3 samples the samples are kept. */
export function decimateMinMax(
  samples: ArrayLike<number>,
  delayS: number,
  dtS: number,
  t0S: number,
  t1S: number,
  columns: number,
): Decimated {
  const n = samples.length;
  const i0 = Math.max(0, Math.floor((t0S - delayS) / dtS));
  const i1 = Math.min(n - 1, Math.ceil((t1S - delayS) / dtS));
  if (i1 < i0) return { t: new Float64Array(0), v: new Float64Array(0), length: 0 };
  const count = i1 - i0 + 1;
  const cols = Math.max(1, Math.floor(columns));
  if (count <= 3 * cols) {
    const t = new Float64Array(count);
    const v = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      t[i] = delayS + (i0 + i) * dtS;
      v[i] = samples[i0 + i];
    }
    return { t, v, length: count };
  }
  const t = new Float64Array(2 * cols);
  const v = new Float64Array(2 * cols);
  let k = 0;
  const per = count / cols;
  for (let c = 0; c < cols; c++) {
    const a = i0 + Math.floor(c * per);
    const b = Math.min(i1, i0 + Math.floor((c + 1) * per) - 1);
    let lo = a;
    let hi = a;
    for (let i = a + 1; i <= b; i++) {
      if (samples[i] < samples[lo]) lo = i;
      if (samples[i] > samples[hi]) hi = i;
    }
    const first = Math.min(lo, hi);
    const second = Math.max(lo, hi);
    t[k] = delayS + first * dtS;
    v[k++] = samples[first];
    t[k] = delayS + second * dtS;
    v[k++] = samples[second];
  }
  return { t, v, length: k };
}

/** Largest absolute value (0 for an empty or all-zero trace). */
export function peakAbs(samples: ArrayLike<number>): number {
  let p = 0;
  for (let i = 0; i < samples.length; i++) {
    const a = Math.abs(samples[i]);
    if (a > p) p = a;
  }
  return p;
}

/** Median spacing of sorted distinct values (the trace spacing on the board); fallback when fewer than two. */
export function medianStep(values: number[], fallback: number): number {
  const u = [...new Set(values.map((v) => Math.round(v * 1e6) / 1e6))].sort((a, b) => a - b);
  const d: number[] = [];
  for (let i = 1; i < u.length; i++) d.push(u[i] - u[i - 1]);
  if (!d.length) return fallback;
  d.sort((a, b) => a - b);
  return d[Math.floor(d.length / 2)] || fallback;
}

/** Mean of a trace (removed from raw hits for display only). */
export function mean(samples: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < samples.length; i++) s += samples[i];
  return samples.length ? s / samples.length : 0;
}

/**
 * Drops the inner points of flat runs: a point is left out when it and the next point both lie within
 * tol of the last point kept, so the drawn line is never more than tol away from the decimated one
 * (tol is a fraction of a pixel in data units). Compacts t and y in place; returns the new length.
 */
export function dropFlatRuns(t: Float64Array, y: Float64Array, n: number, tol: number): number {
  if (n <= 2 || !(tol > 0)) return n;
  let k = 1;
  let last = y[0];
  for (let i = 1; i < n - 1; i++) {
    if (Math.abs(y[i] - last) < tol && Math.abs(y[i + 1] - last) < tol) continue;
    t[k] = t[i];
    y[k++] = y[i];
    last = y[i];
  }
  t[k] = t[n - 1];
  y[k++] = y[n - 1];
  return k;
}
