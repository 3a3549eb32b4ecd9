import { BorewaveError } from '../../src/core/errors';

/** The BorewaveError that f throws; fails the test when f returns or throws anything else. */
export function errorOf(f: () => unknown): BorewaveError {
  try {
    f();
  } catch (e) {
    if (e instanceof BorewaveError) return e;
    throw e;
  }
  throw new Error('expected a BorewaveError');
}
