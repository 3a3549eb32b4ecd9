/**
 * Seeded pseudo-random numbers (forward model, Monte Carlo, fuzzing): one generator for the project.
 * mulberry32: a 32-bit state generator (Tommy Ettinger's public-domain design, from memory);
 * normal deviates by the Box-Muller transform (Box & Muller 1958, Ann. Math. Stat. 29(2)).
 */

export interface Prng {
  /** Uniform deviate in [0, 1). */
  uniform(): number;
  /** Standard normal deviate (mean 0, standard deviation 1). */
  normal(): number;
}

/** A generator whose whole sequence is fixed by the 32-bit seed. */
export function mulberry32(seed: number): Prng {
  let state = seed >>> 0;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 15), z | 1);
    z ^= z + Math.imul(z ^ (z >>> 7), z | 61);
    return ((z ^ (z >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | null = null;
  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u1 = uniform();
    while (u1 <= 0) u1 = uniform();
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  };
  return { uniform, normal };
}
