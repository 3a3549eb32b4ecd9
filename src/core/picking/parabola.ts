/**
 * Sub-sample peak position from three equally spaced samples by fitting a parabola
 * (domain notes section 3): delta = 0.5 (r(-1) - r(+1)) / (r(-1) - 2 r(0) + r(+1)), clamped to
 * |delta| <= 0.5. Works for a maximum and for a minimum. Returns 0 when the three are collinear.
 */
export function parabolicOffset(rMinus: number, r0: number, rPlus: number): number {
  const den = rMinus - 2 * r0 + rPlus;
  if (den === 0 || !Number.isFinite(den)) return 0;
  const d = (0.5 * (rMinus - rPlus)) / den;
  if (!Number.isFinite(d)) return 0;
  return Math.max(-0.5, Math.min(0.5, d)) + 0; // + 0 turns -0 into 0
}

/** Value of the fitted parabola at its vertex (offset from parabolicOffset). */
export function parabolicVertexValue(rMinus: number, r0: number, rPlus: number, offset: number): number {
  return r0 - 0.25 * (rMinus - rPlus) * offset;
}
