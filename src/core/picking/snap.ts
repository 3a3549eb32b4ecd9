/**
 * Snap a hand pick to the nearest characteristic point of a working trace (the Trace board's "snap"):
 * a peak, trough or zero crossing within about a quarter of the trace's dominant period of the pointer,
 * or the AIC onset in a window around it. Uses the same pickers as the automatic run.
 */
import { aicOnsetIndex } from './onset';
import { characteristicPoints } from './features';
import type { WorkingTrace } from '../model';
import { lobePeriodS } from './autopick';
import type { EditablePickMethod } from '../settings';

export function snapTimeS(w: WorkingTrace, method: EditablePickMethod, timeS: number): number {
  const x = w.samples;
  const n = x.length;
  const dt = w.sampleIntervalS;
  const idx = Math.round((timeS - w.delayS) / dt);
  if (idx < 2 || idx > n - 3) return timeS;
  try {
    const periodS =
      lobePeriodS(x, Math.max(0, idx - Math.round(0.05 / dt)), Math.min(n, idx + Math.round(0.05 / dt)), dt) ?? 40 * dt;
    const half = Math.max(3, Math.round(periodS / 4 / dt));
    const start = Math.max(1, idx - half);
    if (method === 'onset') {
      const end = Math.min(n - 1, idx + half);
      const r = aicOnsetIndex(x, Math.max(0, idx - 4 * half), end);
      return w.delayS + r.index * dt;
    }
    const pts = characteristicPoints(x, start, dt, w.delayS, { searchS: 2 * half * dt, minFraction: 0.5 });
    const t = method === 'peak' ? pts.peakS : method === 'trough' ? pts.troughS : pts.zeroCrossingS;
    return t !== null && Math.abs(t - timeS) <= 2 * half * dt ? t : timeS;
  } catch {
    return timeS;
  }
}
