/**
 * Horizontal rotation of a 3-component receiver: the azimuth of largest shear energy from the 2x2
 * covariance of the two horizontals (principal axis, as in particle-motion polarisation analysis;
 * e.g. Jurkevics 1988, BSSA 78(5), for the covariance-eigenvector idea (from memory)).
 *
 * Angles are in the receiver's own frame: 0 along H1, +90 degrees along H2. The covariance has no
 * sign, so the axis is found modulo 180 degrees; the sign is settled elsewhere (hits.ts) together
 * with the hit directions, because flipping the axis and swapping left/right at a depth are the same
 * unknown.
 */

/** Sums of products of two horizontals over a window: [sum h1^2, sum h1 h2, sum h2^2]. */
export interface Cov2 {
  xx: number;
  xy: number;
  yy: number;
}

export function zeroCov(): Cov2 {
  return { xx: 0, xy: 0, yy: 0 };
}

/** Adds the products of h1 and h2 over samples [fromIdx, toIdx) into acc (returns acc). */
export function accumulateCov(
  acc: Cov2,
  h1: ArrayLike<number>,
  h2: ArrayLike<number>,
  fromIdx: number,
  toIdx: number,
): Cov2 {
  const a = Math.max(0, fromIdx);
  const b = Math.min(h1.length, h2.length, toIdx);
  for (let i = a; i < b; i++) {
    acc.xx += h1[i] * h1[i];
    acc.xy += h1[i] * h2[i];
    acc.yy += h2[i] * h2[i];
  }
  return acc;
}

/**
 * Principal axis of a 2x2 covariance: azimuth (rad, in (-pi/2, pi/2]) of the larger eigenvector,
 * tan(2 theta) = 2 xy / (xx - yy), and linearity (l1 - l2)/(l1 + l2) in [0, 1] (1 = motion on a line).
 */
export function principalAxis(c: Cov2): { azimuthRad: number; linearity: number } {
  const tr = c.xx + c.yy;
  if (!(tr > 0)) return { azimuthRad: 0, linearity: 0 };
  let az = 0.5 * Math.atan2(2 * c.xy, c.xx - c.yy);
  if (az <= -Math.PI / 2) az += Math.PI;
  const diff = Math.hypot(c.xx - c.yy, 2 * c.xy);
  return { azimuthRad: az, linearity: Math.min(1, diff / tr) };
}

/** The horizontal motion along azimuth az (rad from H1 toward H2): h1 cos(az) + h2 sin(az). */
export function rotateHorizontals(h1: ArrayLike<number>, h2: ArrayLike<number>, azimuthRad: number): Float64Array {
  const n = Math.min(h1.length, h2.length);
  const c = Math.cos(azimuthRad);
  const s = Math.sin(azimuthRad);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = h1[i] * c + h2[i] * s;
  return out;
}

/** Wraps an angle to (-pi, pi]. */
export function wrapPi(a: number): number {
  let x = a % (2 * Math.PI);
  if (x <= -Math.PI) x += 2 * Math.PI;
  if (x > Math.PI) x -= 2 * Math.PI;
  return x;
}

/** Degrees in [0, 360) for display and project.json. */
export function toDegrees360(rad: number): number {
  const d = (rad * 180) / Math.PI;
  return ((d % 360) + 360) % 360;
}

/** Moving-average smoothing of a non-negative envelope with half-width w samples. */
export function smoothEnvelope(e: ArrayLike<number>, halfWidth: number): Float64Array {
  const n = e.length;
  const cum = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) cum[i + 1] = cum[i] + e[i];
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - halfWidth);
    const b = Math.min(n, i + halfWidth + 1);
    out[i] = (cum[b] - cum[a]) / (b - a);
  }
  return out;
}

/**
 * The window around the strongest burst of an envelope inside [fromIdx, toIdx): from the maximum,
 * grown on both sides while the envelope stays above `share` of the maximum, then padded by a quarter
 * of its width. Returns null when the envelope is flat zero there.
 */
export function burstWindow(
  env: ArrayLike<number>,
  fromIdx: number,
  toIdx: number,
  share = 0.05,
): { fromIdx: number; toIdx: number; peakIdx: number } | null {
  const a0 = Math.max(0, fromIdx);
  const b0 = Math.min(env.length, toIdx);
  let peak = -1;
  let best = 0;
  for (let i = a0; i < b0; i++)
    if (env[i] > best) {
      best = env[i];
      peak = i;
    }
  if (peak < 0) return null;
  const th = best * share;
  let a = peak;
  while (a > a0 && env[a - 1] > th) a--;
  let b = peak + 1;
  while (b < b0 && env[b] > th) b++;
  const pad = Math.max(1, Math.round((b - a) / 4));
  return { fromIdx: Math.max(a0, a - pad), toIdx: Math.min(b0, b + pad), peakIdx: peak };
}
