import { describe, expect, it } from 'vitest';
import { relativeSigns, solveHitsAndRotation, type DepthGroupInput } from '../../src/core/survey/hits';
import { mulberry32 } from '../../src/core/random';

// Analytic records: a causal pulse with a positive first lobe, horizontal motion along a probe-frame
// azimuth that random-walks over the full circle, polarity +1 for 'left'; P arrives earlier, along the
// ray from a source on one side: its horizontal part points away from the source, in phase with V.
const N = 600;
const dt = 1e-4;
function pulseAt(i0: number, f = 0.02): Float64Array {
  return Float64Array.from({ length: N }, (_, i) => {
    const t = i - i0;
    return t < 0 ? 0 : t * Math.exp(-Math.PI * f * t) * Math.sin(2 * Math.PI * f * t) * 0.05;
  });
}

function survey(seed: number, noise: number) {
  const rng = mulberry32(seed);
  let az = (rng.uniform() * 2 - 1) * Math.PI;
  const groups: DepthGroupInput[] = [];
  const truthHits = new Map<string, string>();
  const truthAz: number[] = [];
  for (let k = 0; k < 25; k++) {
    if (k) az += 0.45 * rng.normal();
    truthAz.push(az);
    const sIdx = 200 + 8 * k;
    const pIdx = 80 + 3 * k;
    const hits = k % 5 === 2 ? ['left', 'left', 'right'] : k % 7 === 3 ? ['right'] : ['left', 'right'];
    // Probe frame: world north (left motion) at az, world west (P away from the source) at az + 90 deg.
    const records = hits.map((h, j) => {
      const s = pulseAt(sIdx);
      const p = pulseAt(pIdx, 0.08);
      const pol = h === 'left' ? 1 : -1;
      const sin = Math.sin(az);
      const cos = Math.cos(az);
      const tilt = 0.5 / (1 + k / 4); // horizontal share of P falls with depth
      const n = () => noise * rng.normal();
      const h1 = s.map((x, i) => pol * x * cos + 0.3 * tilt * p[i] * Math.cos(az + Math.PI / 2) + n());
      const h2 = s.map((x, i) => pol * x * sin + 0.3 * tilt * p[i] * Math.sin(az + Math.PI / 2) + n());
      const v = p.map((x) => 0.3 * x + n());
      const id = `d${k}-${j}`;
      truthHits.set(id, h);
      return { recordId: id, givenHit: null, bySlot: { r0: { h1, h2, v } } };
    });
    groups.push({ depthM: k + 1, records, slots: [{ slot: 'r0', searchS: [150, 550], searchP: [40, 400] }] });
  }
  return { groups, truthHits, truthAz };
}

describe('hits and rotation solved together', () => {
  it('relative signs: a reversed pair and a repeat (c = [[1, -0.9, 0.9], ...]) give [+1, -1, +1]', () => {
    expect(
      relativeSigns([
        [1, -0.9, 0.9],
        [-0.9, 1, -0.8],
        [0.9, -0.8, 1],
      ]),
    ).toEqual([1, -1, 1]);
  });

  it.each([1, 2, 3])(
    'probe turning over the full circle (seed %d), repeats and missing hits: every hit and azimuth right up to one global swap',
    (seed) => {
      const { groups, truthHits, truthAz } = survey(seed, 0.002);
      const sol = solveHitsAndRotation(groups, { mode: 'horizontal', sampleIntervalS: dt, hitSwap: false });
      let same = 0;
      let swapped = 0;
      for (const d of sol)
        for (const [id, h] of d.hits) {
          if (h === truthHits.get(id)) same++;
          else swapped++;
        }
      const total = truthHits.size;
      expect(Math.max(same, swapped)).toBe(total);
      // Azimuth of 'left' within 5 degrees of the truth (or of truth + 180 deg under the global swap).
      sol.forEach((d, k) => {
        const want = truthAz[k] + (swapped > same ? Math.PI : 0);
        const err = Math.abs(
          Math.atan2(Math.sin(d.slots[0].azimuthRad! - want), Math.cos(d.slots[0].azimuthRad! - want)),
        );
        expect(err).toBeLessThan((5 * Math.PI) / 180);
      });
    },
  );

  it('the P cue fixes the global orientation: left = 90 deg clockwise of the horizontal P motion away from the source', () => {
    const { groups, truthHits } = survey(4, 0.001);
    const sol = solveHitsAndRotation(groups, { mode: 'horizontal', sampleIntervalS: dt, hitSwap: false });
    const right = sol.flatMap((d) => [...d.hits]).filter(([id, h]) => truthHits.get(id) === h).length;
    expect(right).toBe(truthHits.size);
    // hitSwap flips every inferred hit at once.
    const swapped = solveHitsAndRotation(groups, { mode: 'horizontal', sampleIntervalS: dt, hitSwap: true });
    const flipped = swapped.flatMap((d) => [...d.hits]).filter(([id, h]) => truthHits.get(id) !== h).length;
    expect(flipped).toBe(truthHits.size);
  });

  it('given hits are kept, and a given pair the data contradict is counted', () => {
    const { groups } = survey(5, 0.001);
    const g = groups[0];
    const given = {
      ...g,
      records: g.records.map((r) => ({ ...r, givenHit: 'left' as const })), // both 'left', but the data reverse
    };
    const [sol] = solveHitsAndRotation([given], { mode: 'horizontal', sampleIntervalS: dt, hitSwap: false });
    expect([...sol.hits.values()]).toEqual(['left', 'left']);
    expect(sol.contradictions).toBe(1);
    expect(sol.hitSource).toBe('given');
  });
});
