/**
 * Travel-time geometry and interval velocity formulas of the downhole and crosshole standards
 * (ASTM D7400/D7400M-19 downhole; ASTM D4428/D4428M-14 crosshole), as summarised in docs/methods.md s.2.
 */

/** Slant distance from a source at depth zs and horizontal offset x to a receiver at depth z: R = sqrt(x^2 + (z - zs)^2). */
export function slantDistanceM(offsetM: number, sourceDepthM: number, receiverDepthM: number): number {
  return Math.hypot(offsetM, receiverDepthM - sourceDepthM);
}

/** Slant-corrected (vertical) time tc = t (z - zs) / R. */
export function correctedTimeS(timeS: number, sourceDepthM: number, receiverDepthM: number, slantM: number): number {
  return (timeS * (receiverDepthM - sourceDepthM)) / slantM;
}

/** Interval velocity V = (L2 - L1)/(t2 - t1); null when the time difference is not positive. */
export function intervalVelocityMps(pathAM: number, pathBM: number, dtS: number): number | null {
  const dL = pathBM - pathAM;
  if (!(dtS > 0) || !(dL > 0)) return null;
  return dL / dtS;
}

/**
 * One-sigma uncertainty of V = dL/dt by first-order propagation:
 * (sV/V)^2 = (s_dL/dL)^2 + (s_dt/dt)^2 (independent errors; any error-analysis text, e.g. Taylor,
 * An Introduction to Error Analysis, 2nd ed., ch. 3 (from memory)).
 */
export function intervalVelocitySdMps(vMps: number, dLM: number, dLSdM: number, dtS: number, dtSdS: number): number {
  return vMps * Math.hypot(dLSdM / dLM, dtSdS / dtS);
}

export interface LineFit {
  slope: number;
  intercept: number;
  slopeSe: number;
  n: number;
  rmsResidual: number;
}

/** Ordinary least squares y = a + b x with the standard error of the slope (n >= 2; se needs n >= 3). */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>): LineFit | null {
  const n = x.length;
  if (n < 2) return null;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (y[i] - intercept - slope * x[i]) ** 2;
  const slopeSe = n > 2 ? Math.sqrt(sse / (n - 2) / sxx) : NaN;
  return { slope, intercept, slopeSe, n, rmsResidual: Math.sqrt(sse / n) };
}
