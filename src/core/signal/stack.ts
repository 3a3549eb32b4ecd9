/**
 * Stacking and reversed-hit combinations.
 *
 * Reversed hits (practice; domain notes section 3): striking the source in opposite directions flips
 * the polarity of the shear wave but not of the P wave or of noise common to both records, so
 * (a - b)/2 keeps the shear wave and cancels P and common noise, while (a + b)/2 keeps P.
 */
import { BorewaveError } from '../errors';

function requireSameLength(a: ArrayLike<number>, b: ArrayLike<number>, what: string): void {
  if (a.length !== b.length) {
    throw new BorewaveError(
      'SIGNAL_LENGTH_MISMATCH',
      `${what}: traces hold ${a.length} and ${b.length} samples; they must be equal.`,
      undefined,
      'samples',
    );
  }
}

/** Sample-by-sample mean of equal-length traces (vertical stack of repeated hits). */
export function stackTraces(traces: ArrayLike<number>[]): Float64Array {
  if (traces.length === 0) {
    throw new BorewaveError('STACK_EMPTY', 'Nothing to stack: no traces given.', undefined, 'traces');
  }
  const n = traces[0].length;
  const out = new Float64Array(n);
  for (let k = 0; k < traces.length; k++) {
    const t = traces[k];
    if (t.length !== n) {
      throw new BorewaveError(
        'SIGNAL_LENGTH_MISMATCH',
        `Stack: trace ${k + 1} holds ${t.length} samples, trace 1 holds ${n}; they must be equal.`,
        undefined,
        'samples',
      );
    }
    for (let i = 0; i < n; i++) out[i] += t[i];
  }
  const inv = 1 / traces.length;
  for (let i = 0; i < n; i++) out[i] *= inv;
  return out;
}

/** (a - b)/2: keeps the shear wave that reverses with the hit direction, cancels P and common noise. */
export function reversedDifference(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  requireSameLength(a, b, 'Reversed-hit difference');
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = 0.5 * (a[i] - b[i]);
  return out;
}

/** (a + b)/2: keeps the P wave (same polarity on both hits), cancels the reversing shear wave. */
export function reversedSum(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  requireSameLength(a, b, 'Reversed-hit sum');
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = 0.5 * (a[i] + b[i]);
  return out;
}
