/**
 * Pick and delay quality: signal-to-noise ratio and one-sigma uncertainties.
 */

/** Upper limit reported for the SNR when the noise window is exactly quiet (keeps numbers finite). */
export const SNR_CAP = 1e6;

/**
 * SNR = RMS of x over [onsetIdx, onsetIdx + windowSamples) / RMS over [onsetIdx - windowSamples, onsetIdx)
 * (linear amplitude ratio), both windows clipped to the trace. Returns 0 when there is no sample
 * before the onset (noise unknown) or the signal window is quiet, SNR_CAP when the noise is exactly zero.
 */
export function signalToNoise(x: ArrayLike<number>, onsetIdx: number, windowSamples: number): number {
  const n = x.length;
  const w = Math.max(1, Math.round(windowSamples));
  const onset = Math.max(0, Math.min(n, Math.round(onsetIdx)));
  const n0 = Math.max(0, onset - w);
  const s1 = Math.min(n, onset + w);
  if (onset - n0 < 1 || s1 - onset < 1) return 0;
  let noise = 0;
  for (let i = n0; i < onset; i++) noise += x[i] * x[i];
  let sig = 0;
  for (let i = onset; i < s1; i++) sig += x[i] * x[i];
  const noiseRms = Math.sqrt(noise / (onset - n0));
  const sigRms = Math.sqrt(sig / (s1 - onset));
  if (!(sigRms > 0)) return 0;
  if (!(noiseRms > 0)) return SNR_CAP;
  return Math.min(SNR_CAP, sigRms / noiseRms);
}

/**
 * One-sigma time uncertainty of a pick, s.
 * Rule: sigma = sqrt((T / (2 pi SNR))^2 + dt^2 / 12), at most T/2.
 * Basis (first-order error propagation; common practice): a pulse that starts as A sin(2 pi t / T)
 * rises with slope 2 pi A / T, so noise of RMS A/SNR moves the time at which it is seen by
 * T / (2 pi SNR); the same holds at a zero crossing. Rounding to the sample grid adds the variance of
 * a uniform error over one sample, dt^2/12. Beyond half a period the pick may sit on another cycle,
 * so T/2 is the ceiling (also returned for SNR <= 0).
 */
export function pickUncertaintyS(snr: number, sampleIntervalS: number, dominantPeriodS: number): number {
  const dt = Math.max(0, sampleIntervalS);
  const periodS = Math.max(dominantPeriodS > 0 ? dominantPeriodS : 0, 2 * dt);
  const ceiling = Math.max(periodS / 2, dt / Math.sqrt(12));
  if (!(snr > 0)) return ceiling;
  const noiseTerm = periodS / (2 * Math.PI * snr);
  return Math.min(ceiling, Math.sqrt(noiseTerm * noiseTerm + (dt * dt) / 12));
}

/**
 * One-sigma uncertainty of a correlation (or phase) delay, s, from a Cramer-Rao-type bound for the
 * arrival time of a known pulse in white noise, var >= 1 / (beta^2 * 2E/N0) (e.g. Van Trees 1968,
 * Detection, Estimation and Modulation Theory I; Knapp & Carter 1976; Carter 1987 (memory)), where:
 * - beta^2 = (2 pi)^2 (fc^2 + B^2/12) is the mean-square angular bandwidth of a flat band B about
 *   fc = 1 / dominantPeriodS;
 * - 2E/N0 = n * rho^2 / (1 - rho^2): n = 2 B windowS independent samples in the band, each with the
 *   signal-to-noise power ratio implied by the normalised correlation rho (for b = a + noise,
 *   rho^2 = S / (S + N)).
 * A floor of 0.05 sample stands for the sub-sample (parabolic) refinement error checked in the tests;
 * the result is at most half a period (a cycle skip is not covered by a Gaussian error) and is half a
 * period for rho <= 0. windowS defaults to 2.5 dominant periods (the window used by the auto-picker).
 */
export function delayUncertaintyS(
  coefficient: number,
  sampleIntervalS: number,
  dominantPeriodS: number,
  bandwidthHz: number,
  windowS?: number,
): number {
  const dt = Math.max(0, sampleIntervalS);
  const periodS = Math.max(dominantPeriodS > 0 ? dominantPeriodS : 0, 2 * dt);
  const ceiling = Math.max(periodS / 2, 0.05 * dt);
  const floor = 0.05 * dt;
  if (!(coefficient > 0)) return ceiling;
  const rho = Math.min(coefficient, 1);
  if (rho >= 1) return floor;
  const fc = 1 / periodS;
  const bw = bandwidthHz > 0 ? bandwidthHz : fc;
  const tw = windowS && windowS > 0 ? windowS : 2.5 * periodS;
  const beta2 = (2 * Math.PI) ** 2 * (fc * fc + (bw * bw) / 12);
  const nIndependent = Math.max(1, 2 * bw * tw);
  const snrPower = (rho * rho) / (1 - rho * rho);
  const variance = 1 / (beta2 * nIndependent * snrPower);
  return Math.min(ceiling, Math.sqrt(variance + floor * floor));
}
