/**
 * Forward-model variants built to break the set-up: a probe that turns over the full circle, hits
 * logged nowhere (neither file names nor headers), files in shuffled order with repeated and missing
 * hits, and a careless set-up (hits left as none, component labels shifted by one).
 */
import type { Component, HitDirection, TestKind } from '../model';
import { mulberry32 } from '../random';
import { demoEarthModel, demoPlan } from './demo';
import { synthesizeSurvey, type SynthOptions, type SynthResult } from './synthesize';

export interface VariantOptions {
  kind: TestKind;
  seed: number;
  /** Probe azimuth random walk, step sd in rad (downhole kinds); 0 = fixed probe. */
  azimuthWalkSdRad?: number;
  /** Mean turn per depth step, rad (default 0.25 when the probe turns: over 30 depths more than a full circle). */
  azimuthDriftRad?: number;
  /** Share of depths with a repeated hit and share with a missing hit (default 0). */
  repeatShare?: number;
  missingShare?: number;
  snr?: number | null;
}

/** A demo-like survey with the variant's probe and hit plan (hits still logged; see stripHitLabels). */
export function variantSurvey(v: VariantOptions): SynthResult {
  const plan = demoPlan(v.kind);
  const rng = mulberry32((v.seed * 7919) >>> 0);
  const depths =
    plan.geometry.kind === 'downhole'
      ? plan.geometry.depthsM
      : plan.geometry.kind === 'downhole-pair'
        ? plan.geometry.upperDepthsM
        : plan.geometry.depthsM;
  const [a, b]: HitDirection[] = v.kind === 'crosshole' ? ['up', 'down'] : ['left', 'right'];
  const hitPlan = depths.map((_, k): HitDirection[] => {
    const u = rng.uniform();
    // Never the first or last depth, so every variant keeps the depth range of the demo.
    if (k > 0 && k < depths.length - 1 && u < (v.missingShare ?? 0)) return [rng.uniform() < 0.5 ? a : b];
    if (u > 1 - (v.repeatShare ?? 0)) return rng.uniform() < 0.5 ? [a, a, b] : [a, b, b];
    return [a, b];
  });
  const options: SynthOptions = {
    ...plan.options,
    seed: v.seed,
    azimuthWalkSdRad: v.azimuthWalkSdRad ?? null,
    azimuthDriftRad: v.azimuthWalkSdRad ? (v.azimuthDriftRad ?? 0.25) : 0,
    hitPlan,
    snr: v.snr === undefined ? plan.options.snr : v.snr,
  };
  return synthesizeSurvey(demoEarthModel(), plan.geometry, options);
}

/**
 * Hits logged nowhere: files renamed rec_001.sg2 ... in shuffled order, HIT notes and the hit word
 * in SOURCE strings removed, survey hits 'none'. Depths stay in the headers and the survey.
 */
export function stripHitLabels(res: SynthResult, seed: number): SynthResult {
  const rng = mulberry32((seed * 104729 + 17) >>> 0);
  const order = res.records.map((_, i) => i);
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(rng.uniform() * (i + 1));
    [order[i], order[j]] = [order[j], order[i]];
  }
  const rename = new Map<string, string>();
  order.forEach((idx, pos) => rename.set(res.records[idx].id, `rec_${String(pos + 1).padStart(3, '0')}.sg2`));
  const records = order.map((idx) => {
    const r = res.records[idx];
    const id = rename.get(r.id)!;
    return {
      ...r,
      id,
      fileName: id,
      notes: r.notes.filter((n) => !n.startsWith('HIT')),
      traces: r.traces.map((t) => ({
        ...t,
        strings: { ...t.strings, SOURCE: t.strings.SOURCE?.replace(/(left|right|up|down) /, '') ?? '' },
      })),
    };
  });
  const byOld = new Map(res.survey.records.map((ra) => [ra.recordId, ra]));
  const survey = {
    ...res.survey,
    records: order.map((idx) => {
      const ra = byOld.get(res.records[idx].id)!;
      return { ...ra, recordId: rename.get(ra.recordId)!, hit: 'none' as HitDirection, hitSource: 'default' as const };
    }),
  };
  const truth = {
    ...res.truth,
    records: res.truth.records.map((t) => ({ ...t, recordId: rename.get(t.recordId)! })),
  };
  return { survey, records, truth };
}

/** Component labels shifted by one channel within each receiver: 'right' gives [V, H1, H2] for H1 H2 V. */
export function shiftComponentLabels(res: SynthResult, direction: 'right' | 'left' = 'right'): SynthResult {
  const survey = {
    ...res.survey,
    records: res.survey.records.map((ra) => {
      const receivers = [...new Set(ra.channels.map((c) => c.receiver))];
      const channels = receivers.flatMap((rx) => {
        const list = ra.channels.filter((c) => c.receiver === rx);
        const labels: Component[] = list.map((c) => c.component);
        const n = labels.length;
        return list.map((c, i) => ({
          ...c,
          component: direction === 'right' ? labels[(i - 1 + n) % n] : labels[(i + 1) % n],
        }));
      });
      return { ...ra, channels };
    }),
  };
  return { ...res, survey };
}

/** A careless set-up: hits left as 'none' and the component labels shifted by one. */
export function carelessSetup(res: SynthResult, direction: 'right' | 'left' = 'right'): SynthResult {
  const shifted = shiftComponentLabels(res, direction);
  return {
    ...shifted,
    survey: {
      ...shifted.survey,
      records: shifted.survey.records.map((ra) => ({ ...ra, hit: 'none' as HitDirection })),
    },
  };
}
