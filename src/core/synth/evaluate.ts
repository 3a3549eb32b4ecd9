/**
 * Scores of the whole pipeline on forward-model variants: hits inferred from the data against the
 * truth (up to one global swap), interval Vs against the true interval velocity, Vs30 against the
 * model's. Used by the benchmark, the set-up tests and scripts/measure-setup.ts.
 */
import type { HitDirection } from '../model';
import { runPipeline, type PipelineResult } from '../pipeline';
import { defaultSettings, emptyEdits, type Settings } from '../settings';
import { timeAveragedVs } from '../site/classes';
import { demoEarthModel } from './demo';
import type { SynthResult } from './synthesize';

export function recordsMapOf(res: SynthResult) {
  return new Map(res.records.map((r) => [r.id, r]));
}

export function runOn(res: SynthResult, settings: Settings = defaultSettings()): PipelineResult {
  return runPipeline({ survey: res.survey, records: recordsMapOf(res), settings, edits: emptyEdits() });
}

/** Share of depths whose every record's inferred hit matches the truth, allowing one global swap. */
export function hitRate(res: SynthResult, run: PipelineResult): { depths: number; right: number; rate: number } {
  const truth = new Map(res.truth.records.map((t) => [t.recordId, t.hit]));
  const flip: Record<string, HitDirection> = { left: 'right', right: 'left', up: 'down', down: 'up', none: 'none' };
  const depths = run.prepared.orientation;
  const score = (swap: boolean) =>
    depths.filter((d) => d.recordIds.every((id) => (swap ? flip[d.hits[id]] : d.hits[id]) === truth.get(id))).length;
  const right = Math.max(score(false), score(true));
  return { depths: depths.length, right, rate: depths.length ? right / depths.length : 0 };
}

/** True interval velocity of each S interval from the truth (straight path lengths over true travel times). */
function trueIntervalVs(res: SynthResult, run: PipelineResult): Map<string, number> {
  const t = new Map<string, number>();
  const byRecord = new Map(res.survey.records.map((r) => [r.recordId, r]));
  const sum = new Map<string, { t: number; n: number }>();
  for (const rt of res.truth.records) {
    const ra = byRecord.get(rt.recordId);
    for (const c of rt.channels) {
      const ch = ra?.channels.find((x) => x.channel === c.channel);
      if (!ra || !ch || ra.depthM === null) continue;
      // Station of this receiver at this depth (any component): key by receiver and receiver depth.
      // Station key prefix: slot and LOGGED depth (keys.ts).
      const k = `${ch.receiver}@${Math.round(ra.depthM * 1000)}`;
      const e = sum.get(k) ?? { t: 0, n: 0 };
      e.t += c.sTravelS;
      e.n++;
      sum.set(k, e);
    }
  }
  for (const iv of run.derived.intervals) {
    if (iv.wave !== 'S' || !iv.chosen) continue;
    const a = sum.get(iv.stationA.split(':')[0]);
    const b = sum.get(iv.stationB.split(':')[0]);
    if (!a || !b) continue;
    const dt = b.t / b.n - a.t / a.n;
    if (dt > 0) t.set(iv.key, (iv.pathBM - iv.pathAM) / dt);
  }
  return t;
}

function median(xs: number[]): number {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Median and P90 absolute interval Vs error, percent, of the chosen S intervals. */
export function intervalError(res: SynthResult, run: PipelineResult): { medianPct: number; p90Pct: number; n: number } {
  const truth = trueIntervalVs(res, run);
  const errs: number[] = [];
  for (const iv of run.derived.intervals) {
    if (iv.wave !== 'S' || !iv.chosen || iv.velocityMps === null) continue;
    const v = truth.get(iv.key);
    if (v) errs.push((100 * Math.abs(iv.velocityMps - v)) / v);
  }
  const s = [...errs].sort((a, b) => a - b);
  return { medianPct: median(errs), p90Pct: s.length ? s[Math.floor(0.9 * (s.length - 1))] : NaN, n: errs.length };
}

/** The model's Vs30 over the depth the survey reaches (no extrapolation, as the pipeline's default rule). */
export function trueVs30(run: PipelineResult): number | null {
  const model = demoEarthModel();
  const prof = run.derived.profile;
  if (!prof.length) return null;
  const top = Math.min(...prof.map((p) => p.topM));
  const bottom = Math.max(...prof.map((p) => p.bottomM));
  const steps = model.layers
    .map((l) => ({ topM: Math.max(top, l.topM), bottomM: Math.min(bottom, l.topM + l.thicknessM), vsMps: l.vsMps }))
    .filter((s) => s.bottomM > s.topM);
  return timeAveragedVs(steps, 30, 'no-extrapolation')?.vsMps ?? null;
}
