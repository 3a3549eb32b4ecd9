/**
 * Onset pickers: Akaike information criterion (Maeda 1985) and STA/LTA (Allen 1978).
 * Windows are half-open sample ranges [startIdx, endIdx) of the trace; returned indices are trace indices.
 */
import { BorewaveError } from '../errors';

function checkWindow(n: number, startIdx: number, endIdx: number, minLength: number, what: string): void {
  if (
    !Number.isInteger(startIdx) ||
    !Number.isInteger(endIdx) ||
    startIdx < 0 ||
    endIdx > n ||
    endIdx - startIdx < minLength
  ) {
    throw new BorewaveError(
      'PICK_WINDOW',
      `${what}: window [${startIdx}, ${endIdx}) is not a range of at least ${minLength} samples inside a trace of ${n}.`,
      undefined,
      'window',
    );
  }
}

/**
 * AIC onset on the window (Maeda 1985, Zisin 38, 365-379): with the window of N samples split after
 * its k-th sample, AIC(k) = k log(var(w[1..k])) + (N - k - 1) log(var(w[k+1..N])); the onset is the
 * argmin, i.e. where "noise then signal" fits best as two segments of different variance. Computed in
 * one O(N) pass from running sums (prefix sums, the suffix ones by difference from the totals).
 *
 * Returns the index of the first sample of the later (signal) segment, and `aic` over the window
 * (aic[j] for the split before window sample j; defined for 2 <= j <= N-2, ends copied from the
 * nearest defined value). Variances are floored at 1e-12 of the window variance so that an exactly
 * quiet stretch (synthetic data) gives a finite AIC.
 */
export function aicOnsetIndex(
  x: ArrayLike<number>,
  startIdx: number,
  endIdx: number,
): { index: number; aic: Float64Array } {
  checkWindow(x.length, startIdx, endIdx, 5, 'AIC onset');
  const n = endIdx - startIdx;
  let mean = 0;
  for (let i = startIdx; i < endIdx; i++) mean += x[i];
  mean /= n;
  let s1All = 0;
  let s2All = 0;
  for (let i = startIdx; i < endIdx; i++) {
    const v = x[i] - mean;
    s1All += v;
    s2All += v * v;
  }
  const varAll = s2All / n - (s1All / n) ** 2;
  const floor = varAll > 0 ? varAll * 1e-12 : Number.MIN_VALUE;
  const aic = new Float64Array(n);
  let s1 = 0;
  let s2 = 0;
  let bestK = 2;
  let best = Infinity;
  for (let k = 1; k <= n - 2; k++) {
    const v = x[startIdx + k - 1] - mean;
    s1 += v;
    s2 += v * v;
    if (k < 2) continue;
    const m = n - k;
    const v1 = s2 / k - (s1 / k) ** 2;
    const r1 = s1All - s1;
    const v2 = (s2All - s2) / m - (r1 / m) ** 2;
    const value = k * Math.log(Math.max(v1, floor)) + (m - 1) * Math.log(Math.max(v2, floor));
    aic[k] = value;
    if (value < best) {
      best = value;
      bestK = k;
    }
  }
  aic[0] = aic[1] = aic[2];
  aic[n - 1] = aic[n - 2];
  return { index: startIdx + bestK, aic };
}

/**
 * Allen's characteristic function E_i = x_i^2 + C (x_i - x_{i-1})^2 over [fromIdx, toIdx), with
 * C = sum|x_i| / sum|x_i - x_{i-1}| over the same span so that both terms weigh alike (Allen 1978,
 * BSSA 68(5); the weighting rule is recalled (memory)).
 */
export function allenCharacteristic(x: ArrayLike<number>, fromIdx: number, toIdx: number): Float64Array {
  const cf = new Float64Array(toIdx - fromIdx);
  let sumAbs = 0;
  let sumAbsDiff = 0;
  for (let i = fromIdx; i < toIdx; i++) {
    sumAbs += Math.abs(x[i]);
    if (i > 0) sumAbsDiff += Math.abs(x[i] - x[i - 1]);
  }
  const c = sumAbsDiff > 0 ? sumAbs / sumAbsDiff : 0;
  for (let i = fromIdx; i < toIdx; i++) {
    const d = i > 0 ? x[i] - x[i - 1] : 0;
    cf[i - fromIdx] = x[i] * x[i] + c * d * d;
  }
  return cf;
}

/**
 * STA/LTA onset (Allen 1978). Both averages are recursive, STA_i = STA_{i-1} + (E_i - STA_{i-1})/Ns
 * and LTA_i = LTA_{i-1} + (E_i - LTA_{i-1})/Nl, over Allen's characteristic function E. The
 * recursion starts up to ltaSamples before the window (both averages begin at the mean of E over the
 * first ltaSamples of the span), so the LTA stands for the pre-window noise when the window opens.
 *
 * The trigger is the first window sample where STA/LTA >= threshold. The trigger lags the onset while
 * the STA fills, so the onset is taken where the ratio began its rise to the trigger: step back from
 * the trigger while the ratio keeps falling, and take the sample after that local minimum.
 * Returns null when the ratio never reaches the threshold in the window. `ratio[j]` is the ratio at
 * trace sample startIdx + j.
 */
export function staLtaOnsetIndex(
  x: ArrayLike<number>,
  startIdx: number,
  endIdx: number,
  o: { staSamples: number; ltaSamples: number; threshold: number },
): { index: number; ratio: Float64Array } | null {
  checkWindow(x.length, startIdx, endIdx, 2, 'STA/LTA onset');
  const ns = Math.round(o.staSamples);
  const nl = Math.round(o.ltaSamples);
  if (!(ns >= 1) || !(nl > ns) || !(o.threshold > 0)) {
    throw new BorewaveError(
      'PICK_STALTA_SETTINGS',
      `STA/LTA settings need 1 <= STA samples < LTA samples and a positive threshold (got ${o.staSamples}, ${o.ltaSamples}, ${o.threshold}).`,
      undefined,
      'stalta',
    );
  }
  const from = Math.max(0, startIdx - nl);
  const cf = allenCharacteristic(x, from, endIdx);
  let maxCf = 0;
  for (let i = 0; i < cf.length; i++) if (cf[i] > maxCf) maxCf = cf[i];
  const ltaFloor = maxCf > 0 ? maxCf * 1e-12 : Number.MIN_VALUE;
  // Both averages start at the mean of E over the first ltaSamples of the span (the pre-window
  // noise when there is room for it), so the ratio does not start from a chance value.
  let init = 0;
  const nInit = Math.min(nl, cf.length);
  for (let i = 0; i < nInit; i++) init += cf[i];
  init /= nInit;
  let sta = init;
  let lta = init;
  const ratio = new Float64Array(endIdx - startIdx);
  const kSta = 1 / ns;
  const kLta = 1 / nl;
  let trigger = -1;
  for (let i = from; i < endIdx; i++) {
    const e = cf[i - from];
    sta += (e - sta) * kSta;
    lta += (e - lta) * kLta;
    if (i >= startIdx) {
      const r = sta / Math.max(lta, ltaFloor);
      ratio[i - startIdx] = r;
      if (trigger < 0 && r >= o.threshold) trigger = i - startIdx;
    }
  }
  if (trigger < 0) return null;
  let j = trigger;
  while (j > 0 && ratio[j - 1] < ratio[j]) j--;
  const onset = j === 0 ? 0 : Math.min(j + 1, trigger);
  return { index: startIdx + onset, ratio };
}
