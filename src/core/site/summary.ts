/**
 * Site summary of a profile: Vs30 by the chosen rule, the site classes of every standard, and the
 * Monte Carlo spread of both.
 */
import type { Settings } from '../settings';
import type { VelocityInterval } from '../stiffness/profile';
import {
  siteClass,
  timeAveragedVs,
  SITE_CAUTIONS,
  SITE_STANDARDS,
  type SiteClassResult,
  type TimeAveraged,
} from './classes';
import { siteUncertainty, type SiteUncertainty, type SpanCorrelation } from './montecarlo';

export interface SiteSummary {
  /** Null while a blocking set-up problem stands (setupIncomplete says why). */
  vs30: TimeAveraged | null;
  /** "set-up incomplete: ..." while blocking set-up problems stand; null otherwise. */
  setupIncomplete: string | null;
  /** Depth spans bridged by the travel time across an interval left out of the profile. */
  bridged: SiteInterval[];
  classes: SiteClassResult[];
  uncertainty: SiteUncertainty | null;
  cautions: string[];
}

export type SiteInterval = { topM: number; bottomM: number; vsMps: number; vsSdMps: number };

/** Travel-time velocity across a depth span (from the picks of one receiver's stations at its ends). */
export type GapVelocity = (topM: number, bottomM: number) => { vsMps: number; vsSdMps: number } | null;

/**
 * Intervals for Vs30. A gap left by an interval taken out of the profile is bridged by the travel
 * time across it (dropping it would weight the average toward the other layers); where no travel
 * time spans it, by the slowness average of its neighbours with a 30% sd.
 */
export function siteIntervals(rows: readonly SiteInterval[], gapVelocity: GapVelocity | null = null): SiteInterval[] {
  const list = rows
    .filter((v) => v.vsMps > 0)
    .map((v) => ({ topM: v.topM, bottomM: v.bottomM, vsMps: v.vsMps, vsSdMps: v.vsSdMps }))
    .sort((a, b) => a.topM - b.topM);
  if (!gapVelocity) return list;
  const out: SiteInterval[] = [];
  list.forEach((iv, i) => {
    const prev = out[out.length - 1];
    if (i > 0 && prev && iv.topM > prev.bottomM + 1e-6) {
      const gv = gapVelocity(prev.bottomM, iv.topM);
      const vs = gv?.vsMps ?? 2 / (1 / prev.vsMps + 1 / iv.vsMps);
      out.push({ topM: prev.bottomM, bottomM: iv.topM, vsMps: vs, vsSdMps: gv?.vsSdMps ?? 0.3 * vs });
    }
    out.push(iv);
  });
  return out;
}

export function spreadOf(
  ivs: SiteInterval[],
  settings: Settings,
  correlation: SpanCorrelation | null = null,
): SiteUncertainty | null {
  return ivs.length
    ? siteUncertainty(ivs, {
        draws: settings.site.monteCarloDraws,
        seed: settings.site.monteCarloSeed,
        toDepthM: 30,
        rule: settings.site.vs30Rule,
        answers: settings.site.siteAnswers,
        correlation,
      })
    : null;
}

export function siteSummary(
  velocity: readonly VelocityInterval[],
  settings: Settings,
  monteCarlo: boolean,
  setupIncomplete: string | null = null,
  gapVelocity: GapVelocity | null = null,
  correlation: SpanCorrelation | null = null,
): SiteSummary {
  const ivs = siteIntervals(velocity, gapVelocity);
  const own = new Set(velocity.map((v) => `${v.topM}|${v.bottomM}`));
  const bridged = ivs.filter((v) => !own.has(`${v.topM}|${v.bottomM}`));
  // A blocking set-up problem withholds Vs30 and the classes: a wrong set-up must not give a confident number.
  if (setupIncomplete)
    return { vs30: null, classes: [], uncertainty: null, cautions: [...SITE_CAUTIONS], setupIncomplete, bridged };
  const vs30 = ivs.length ? timeAveragedVs(ivs, 30, settings.site.vs30Rule) : null;
  const classes = vs30 ? SITE_STANDARDS.map((std) => siteClass(std, vs30.vsMps, settings.site.siteAnswers)) : [];
  const uncertainty = monteCarlo ? spreadOf(ivs, settings, correlation) : null;
  return { vs30, classes, uncertainty, cautions: [...SITE_CAUTIONS], setupIncomplete: null, bridged };
}
