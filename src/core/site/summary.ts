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
import { siteUncertainty, type SiteUncertainty } from './montecarlo';

export interface SiteSummary {
  vs30: TimeAveraged | null;
  classes: SiteClassResult[];
  uncertainty: SiteUncertainty | null;
  cautions: string[];
}

export type SiteInterval = { topM: number; bottomM: number; vsMps: number; vsSdMps: number };

export function siteIntervals(rows: readonly SiteInterval[]): SiteInterval[] {
  return rows
    .filter((v) => v.vsMps > 0)
    .map((v) => ({ topM: v.topM, bottomM: v.bottomM, vsMps: v.vsMps, vsSdMps: v.vsSdMps }));
}

export function spreadOf(ivs: SiteInterval[], settings: Settings): SiteUncertainty | null {
  return ivs.length
    ? siteUncertainty(ivs, {
        draws: settings.site.monteCarloDraws,
        seed: settings.site.monteCarloSeed,
        toDepthM: 30,
        rule: settings.site.vs30Rule,
        answers: settings.site.siteAnswers,
      })
    : null;
}

export function siteSummary(
  velocity: readonly VelocityInterval[],
  settings: Settings,
  monteCarlo: boolean,
): SiteSummary {
  const ivs = siteIntervals(velocity);
  const vs30 = ivs.length ? timeAveragedVs(ivs, 30, settings.site.vs30Rule) : null;
  const classes = vs30 ? SITE_STANDARDS.map((std) => siteClass(std, vs30.vsMps, settings.site.siteAnswers)) : [];
  const uncertainty = monteCarlo ? spreadOf(ivs, settings) : null;
  return { vs30, classes, uncertainty, cautions: [...SITE_CAUTIONS] };
}
