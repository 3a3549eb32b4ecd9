/**
 * Bridging an excluded depth in a one-receiver survey (successive-depth pairing).
 */
import { toErrorInfo, type ErrorInfo } from '../errors';
import type { PairDelay, Pick, Survey, Wave } from '../model';
import { isOnsetPick } from '../catalogue/methods';
import type { Settings } from '../settings';
import { intervalKey, stationWaveKey, type StationWaveKey } from '../keys';
import { hasSuccessiveDepths } from '../catalogue/testKinds';
import { pairDelays } from '../picking/autopick';
import { delayRequests, type StationPair } from './intervals';
import type { Station } from '../survey/stations';

/**
 * Downhole (one receiver): when the user excludes a depth, the stations above and below it are paired
 * directly, so the profile keeps a (longer) interval instead of a gap. Pick differences follow from
 * the picks; the delays of the new pair are measured here (two traces, well under a millisecond).
 */
export function bridgingPairs(
  survey: Survey,
  prepared: { stations: readonly Station[]; pairs: readonly StationPair[] },
  excluded: ReadonlySet<StationWaveKey>,
  settings: Settings,
  issues: ErrorInfo[],
): { pairs: StationPair[]; delays: PairDelay[] } {
  const pairs: StationPair[] = [];
  const delays: PairDelay[] = [];
  if (!hasSuccessiveDepths(survey) || !excluded.size) return { pairs, delays };
  const existing = new Set(prepared.pairs.map((p) => p.key));
  for (const wave of ['S', 'P'] as Wave[]) {
    const kept = prepared.stations.filter((s) => s.wave === wave && !excluded.has(stationWaveKey(s.key, wave)));
    const receivers = [...new Set(kept.map((s) => s.receiver))];
    for (const r of receivers) {
      const list = kept.filter((s) => s.receiver === r).sort((a, b) => a.depthM - b.depthM);
      for (let i = 0; i + 1 < list.length; i++) {
        const [a, b] = [list[i], list[i + 1]];
        const key = intervalKey(wave, a.key, b.key);
        if (existing.has(key) || b.depthM - a.depthM < 1e-6) continue;
        const pair: StationPair = { key, wave, kind: 'pseudo', a, b, topM: a.depthM, bottomM: b.depthM };
        pairs.push(pair);
        try {
          const [req] = delayRequests([pair], settings);
          for (const d of pairDelays(a.working, b.working, req, settings.picking))
            delays.push({ ...d, flags: [...d.flags, 'bridges excluded station'] });
        } catch (e) {
          issues.push(toErrorInfo(e, key));
        }
      }
    }
  }
  return { pairs, delays };
}

/**
 * Travel-time velocity across a depth span for Vs30 (site/summary.ts): V = (L_b - L_a)/(t_b - t_a)
 * from the onset picks of one receiver's shear stations at the two ends of the span.
 */
export function gapVelocityFrom(
  stations: readonly Station[],
  picks: readonly Pick[],
): (topM: number, bottomM: number) => { vsMps: number; vsSdMps: number } | null {
  const onset = new Map<string, Pick>();
  for (const p of picks) if (p.wave === 'S' && p.origin !== 'excluded' && isOnsetPick(p)) onset.set(p.stationKey, p);
  const sStations = stations.filter((s) => s.wave === 'S' && onset.has(s.key));
  return (topM, bottomM) => {
    for (const a of sStations) {
      if (Math.abs(a.depthM - topM) > 1e-6) continue;
      const b = sStations.find((x) => x.receiver === a.receiver && Math.abs(x.depthM - bottomM) < 1e-6);
      if (!b) continue;
      const pa = onset.get(a.key)!;
      const pb = onset.get(b.key)!;
      const dt = pb.timeS - pa.timeS;
      const dl = b.straightPathM - a.straightPathM;
      if (!(dt > 0 && dl > 0)) continue;
      const v = dl / dt;
      return { vsMps: v, vsSdMps: (v * Math.hypot(pa.uncertaintyS, pb.uncertaintyS)) / dt };
    }
    return null;
  };
}
