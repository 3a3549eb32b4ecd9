/**
 * Time-averaged shear-wave velocity and seismic site class (screening from measured Vs).
 *   Vs,z = sum d_i / sum (d_i / Vs_i) over the top z metres (EN 1998-1:2004 eq. 3.1; ASCE 7 chapter 20).
 * Class tables: ASCE 7-16 Table 20.3-1 and ASCE 7-22 Table 20.2-1 (boundaries in ft/s, compared in ft/s),
 * EN 1998-1:2004 Table 3.1 (m/s).
 */
import { BorewaveError } from '../errors';
import { M_PER_FT } from '../units';

export type Vs30Rule = 'no-extrapolation' | 'extend-deepest';

export interface TimeAveraged {
  vsMps: number;
  /** Depth the average is taken over, m (the profile depth when it stops short and is not extended). */
  toDepthM: number;
  /** Deepest interval bottom, m. */
  profileDepthM: number;
  extended: boolean;
  flags: string[];
}

/** Thicknesses each interval contributes to the average (index = position in the input array). */
export interface AveragingSegments {
  index: number[];
  thicknessM: number[];
  depthM: number;
  profileDepthM: number;
  extended: boolean;
  flags: string[];
}

function m(x: number): string {
  return String(Number(x.toFixed(2)));
}

/**
 * How the top toDepthM is split among the intervals. Sorted by top. A gap between intervals (or from
 * the surface down to the first interval) is given to the interval below it; where intervals overlap,
 * the shallower one keeps the overlap. When the profile stops short: 'no-extrapolation' averages over
 * what exists (flag 'profile shorter than z m'); 'extend-deepest' carries the deepest interval's Vs down
 * to toDepthM (flag 'deepest Vs extended to z m'). Intervals with bad depths are skipped (flagged).
 */
export function averagingSegments(
  intervals: readonly { topM: number; bottomM: number }[],
  toDepthM: number,
  rule: Vs30Rule,
): AveragingSegments | null {
  if (!Number.isFinite(toDepthM) || toDepthM <= 0) {
    throw new BorewaveError('VSZ_DEPTH', `Averaging depth ${toDepthM} m must be positive.`, 'site', 'toDepthM');
  }
  const flags: string[] = [];
  const addFlag = (f: string) => {
    if (!flags.includes(f)) flags.push(f);
  };
  const order = intervals
    .map((iv, i) => ({ iv, i }))
    .filter(({ iv }) => {
      const ok = Number.isFinite(iv.topM) && Number.isFinite(iv.bottomM) && iv.topM >= 0 && iv.bottomM > iv.topM;
      if (!ok) addFlag('interval with bad depths skipped');
      return ok;
    })
    .sort((a, b) => a.iv.topM - b.iv.topM || a.iv.bottomM - b.iv.bottomM);
  if (order.length === 0) return null;
  const index: number[] = [];
  const thicknessM: number[] = [];
  let cursor = 0;
  for (const { iv, i } of order) {
    if (cursor >= toDepthM) break;
    if (iv.bottomM <= cursor) {
      addFlag('overlapping intervals');
      continue;
    }
    if (iv.topM < cursor) addFlag('overlapping intervals');
    if (iv.topM > cursor)
      addFlag(cursor === 0 ? `top ${m(iv.topM)} m given the shallowest Vs` : 'gap given the interval below');
    const bottom = Math.min(iv.bottomM, toDepthM);
    index.push(i);
    thicknessM.push(bottom - cursor);
    cursor = bottom;
  }
  const profileDepthM = order.reduce((d, { iv }) => Math.max(d, iv.bottomM), 0);
  let depthM = cursor;
  let extended = false;
  if (cursor < toDepthM) {
    if (rule === 'extend-deepest') {
      thicknessM[thicknessM.length - 1] += toDepthM - cursor;
      depthM = toDepthM;
      extended = true;
      addFlag(`deepest Vs extended to ${m(toDepthM)} m`);
    } else {
      addFlag(`profile shorter than ${m(toDepthM)} m`);
    }
  }
  return { index, thicknessM, depthM, profileDepthM, extended, flags };
}

/** Vs,z from the intervals; null when there is no usable interval. Throws when a used interval has Vs <= 0. */
export function timeAveragedVs(
  intervals: { topM: number; bottomM: number; vsMps: number }[],
  toDepthM: number,
  rule: Vs30Rule,
): TimeAveraged | null {
  const seg = averagingSegments(intervals, toDepthM, rule);
  if (seg === null) return null;
  let slowness = 0;
  for (let k = 0; k < seg.index.length; k++) {
    const iv = intervals[seg.index[k]];
    if (!Number.isFinite(iv.vsMps) || iv.vsMps <= 0) {
      const item = `interval ${iv.topM}-${iv.bottomM} m`;
      throw new BorewaveError('VSZ_VELOCITY', `${item}: Vs ${iv.vsMps} m/s must be positive.`, item, 'vsMps');
    }
    slowness += seg.thicknessM[k] / iv.vsMps;
  }
  return {
    vsMps: seg.depthM / slowness,
    toDepthM: seg.depthM,
    profileDepthM: seg.profileDepthM,
    extended: seg.extended,
    flags: seg.flags,
  };
}

// ---------------------------------------------------------------- site class

export type SiteStandard = 'asce7_16' | 'asce7_22' | 'en1998_1_2004';
export const SITE_STANDARDS: SiteStandard[] = ['asce7_16', 'asce7_22', 'en1998_1_2004'];

export const STANDARD_NAMES: Record<SiteStandard, string> = {
  asce7_16: 'ASCE 7-16 (Table 20.3-1)',
  asce7_22: 'ASCE 7-22 (Table 20.2-1)',
  en1998_1_2004: 'EN 1998-1:2004 (Table 3.1)',
};

export interface SiteQuestion {
  id: string;
  /** First standard the question belongs to. */
  standard: SiteStandard;
  /** Every standard whose class the answer changes. */
  appliesTo: SiteStandard[];
  text: string;
  consequence: string;
  /** Class a 'yes' gives. */
  yesClass: string;
  source: string;
}

export interface SiteAnswers {
  [questionId: string]: boolean | undefined;
}

export interface SiteClassResult {
  standard: SiteStandard;
  siteClass: string;
  basis: string;
  notes: string[];
}

const ASCE: SiteStandard[] = ['asce7_16', 'asce7_22'];

/**
 * Questions on what Vs cannot show. Questions are listed in order of precedence within a standard:
 * the first 'yes' that gives F (ASCE) or S2/S1 (EN) decides, then E.
 */
const QUESTIONS: SiteQuestion[] = [
  {
    id: 'asce_unstable',
    standard: 'asce7_16',
    appliesTo: ASCE,
    yesClass: 'F',
    text: 'Are there soils vulnerable to failure or collapse under seismic loading (liquefiable soils, quick or highly sensitive clays, collapsible weakly cemented soils)?',
    consequence:
      'Site class F: a site response analysis is required (ASCE 7 allows exceptions for some short-period structures).',
    // Provenance: docs/site-class-sources.md (list checked against a published reproduction).
    source: 'ASCE 7-16 section 20.3.1; ASCE 7-22 section 20.2.1. Verify against the standard’s current edition.',
  },
  {
    id: 'asce_peat',
    standard: 'asce7_16',
    appliesTo: ASCE,
    yesClass: 'F',
    text: 'Is there more than 10 ft (3 m) of peat or highly organic clay?',
    consequence: 'Site class F.',
    source: 'ASCE 7-16 section 20.3.1; ASCE 7-22 taken as the same. Verify against the standard’s current edition.',
  },
  {
    id: 'asce_high_pi',
    standard: 'asce7_16',
    appliesTo: ASCE,
    yesClass: 'F',
    text: 'Is there more than 25 ft (7.6 m) of very high plasticity clay (PI > 75)?',
    consequence: 'Site class F.',
    source: 'ASCE 7-16 section 20.3.1; ASCE 7-22 taken as the same. Verify against the standard’s current edition.',
  },
  {
    id: 'asce_thick_clay',
    standard: 'asce7_16',
    appliesTo: ASCE,
    yesClass: 'F',
    text: 'Is there more than 120 ft (37 m) of soft or medium-stiff clay?',
    consequence: 'Site class F.',
    source: 'ASCE 7-16 section 20.3.1; ASCE 7-22 taken as the same. Verify against the standard’s current edition.',
  },
  {
    id: 'asce_soft_clay',
    standard: 'asce7_16',
    appliesTo: ASCE,
    yesClass: 'E',
    text: 'Is there more than 10 ft (3 m) of soft clay: plasticity index PI > 20, water content w >= 40 % and undrained shear strength su < 500 psf (24 kPa)?',
    consequence: 'Site class E whatever the measured Vs.',
    source: 'ASCE 7-16 Table 20.3-1; ASCE 7-22 Table 20.2-1 (docs/methods.md section 4)',
  },
  {
    id: 'en_s2',
    standard: 'en1998_1_2004',
    appliesTo: ['en1998_1_2004'],
    yesClass: 'S2',
    text: 'Are there liquefiable soils, sensitive clays, or a profile that fits none of ground types A to E or S1?',
    consequence: 'Ground type S2: special studies are required.',
    source: 'EN 1998-1:2004 Table 3.1',
  },
  {
    id: 'en_s1',
    standard: 'en1998_1_2004',
    appliesTo: ['en1998_1_2004'],
    yesClass: 'S1',
    text: 'Does the ground consist of, or contain a layer at least 10 m thick of, soft clay or silt with high plasticity (PI > 40) and high water content?',
    consequence: 'Ground type S1: special studies are required.',
    source: 'EN 1998-1:2004 Table 3.1',
  },
  {
    id: 'en_e',
    standard: 'en1998_1_2004',
    appliesTo: ['en1998_1_2004'],
    yesClass: 'E',
    text: 'Is the profile a surface alluvium layer about 5 to 20 m thick with Vs of type C or D (below 360 m/s) over stiffer material with Vs above 800 m/s?',
    consequence: 'Ground type E whatever Vs,30.',
    source: 'EN 1998-1:2004 Table 3.1',
  },
];

export function siteQuestions(): SiteQuestion[] {
  return QUESTIONS.map((q) => ({ ...q, appliesTo: [...q.appliesTo] }));
}

/** Removes conversion noise (e.g. 1200 x 0.3048 / 0.3048) before comparing with a table boundary. */
function clean(v: number): number {
  return Math.round(v * 1e6) / 1e6;
}

/**
 * Class from Vs30 alone (m/s in). Inclusive sides as printed (docs/methods.md section 4):
 * ASCE 7-16 (ft/s): A > 5000; B 2500 < v <= 5000; C 1200 < v <= 2500; D 600 <= v <= 1200; E < 600.
 * ASCE 7-22 (ft/s): A > 5000; B > 3000; BC > 2100; C > 1450; CD > 1000; D > 700; DE > 500; E <= 500
 *   (each class includes its upper bound).
 * EN 1998-1:2004 (m/s): A > 800; B 360 <= v <= 800; C 180 <= v < 360; D < 180. The table prints 360 in
 *   both B and C; we give it to B, as 180 belongs to C (D < 180) and 800 to B (A > 800): each class
 *   includes its lower bound (our reading).
 */
export function vsSiteClass(standard: SiteStandard, vs30Mps: number): string {
  if (standard === 'en1998_1_2004') {
    const v = clean(vs30Mps);
    if (v > 800) return 'A';
    if (v >= 360) return 'B';
    if (v >= 180) return 'C';
    return 'D';
  }
  const ft = clean(vs30Mps / M_PER_FT);
  if (standard === 'asce7_16') {
    if (ft > 5000) return 'A';
    if (ft > 2500) return 'B';
    if (ft > 1200) return 'C';
    if (ft >= 600) return 'D';
    return 'E';
  }
  if (ft > 5000) return 'A';
  if (ft > 3000) return 'B';
  if (ft > 2100) return 'BC';
  if (ft > 1450) return 'C';
  if (ft > 1000) return 'CD';
  if (ft > 700) return 'D';
  if (ft > 500) return 'DE';
  return 'E';
}

/** The class after the answers: the first 'yes' question (in precedence order) of that standard, else the Vs class. */
export function applySiteAnswers(
  standard: SiteStandard,
  vsClass: string,
  answers: SiteAnswers,
): { siteClass: string; question: SiteQuestion | null } {
  for (const q of QUESTIONS) {
    if (q.appliesTo.includes(standard) && answers[q.id] === true) {
      // The soft-clay / alluvium rules only make the class worse (never turn F or a worse class into E).
      if (q.yesClass === 'E' && vsClass === 'E') break;
      return { siteClass: q.yesClass, question: q };
    }
  }
  return { siteClass: vsClass, question: null };
}

export function siteClass(standard: SiteStandard, vs30Mps: number, answers: SiteAnswers): SiteClassResult {
  if (!Number.isFinite(vs30Mps) || vs30Mps <= 0) {
    throw new BorewaveError('SITE_VS30', `Vs30 ${vs30Mps} m/s must be positive.`, 'site', 'vs30Mps');
  }
  const vsClass = vsSiteClass(standard, vs30Mps);
  const { siteClass: cls, question } = applySiteAnswers(standard, vsClass, answers);
  const vsText =
    standard === 'en1998_1_2004'
      ? `${vs30Mps.toFixed(1)} m/s`
      : `${(vs30Mps / M_PER_FT).toFixed(1)} ft/s (${vs30Mps.toFixed(1)} m/s)`;
  const basis = question
    ? `${STANDARD_NAMES[standard]}: ${question.consequence} (answer to: ${question.text}) Vs30 alone gives ${vsClass}.`
    : `${STANDARD_NAMES[standard]}: Vs30 = ${vsText} gives ${vsClass}.`;
  const notes: string[] = [];
  const open = QUESTIONS.filter((q) => q.appliesTo.includes(standard) && answers[q.id] === undefined);
  if (open.length > 0) notes.push(`Not answered, taken as no: ${open.map((q) => q.text).join(' / ')}`);
  if (standard === 'en1998_1_2004' && cls === 'A')
    notes.push('Ground type A also requires at most 5 m of weaker material at the surface.');
  if (standard === 'asce7_16' && (cls === 'A' || cls === 'B'))
    notes.push(
      'ASCE 7 limits classes A and B where more than a thin layer of soil lies between the rock surface and the foundation: verify against the standard’s current edition.',
    );
  if (standard === 'asce7_22')
    notes.push(
      'ASCE 7-22 asks for a range of classes when Vs is estimated rather than measured (verify against the standard’s current edition); this result uses measured Vs.',
    );
  return { standard, siteClass: cls, basis, notes };
}

export const SITE_CAUTIONS: string[] = [
  'This is a screening result from the measured shear-wave velocities only.',
  'The applicable code\u2019s other criteria, local codes and a qualified professional govern the site class used in design.',
  'The whole profile, its picks and its layering should be reviewed by a qualified professional before use.',
];

/**
 * Hint for the EN 1998-1 ground type E question (not applied by itself): true when every interval from the
 * surface down to some depth h, 5 m <= h <= 20 m, has Vs below 360 m/s (types C/D) and every interval from
 * h to the bottom of the profile has Vs above 800 m/s. "About 5 to 20 m" is read as 5-20 m (our reading).
 */
export function en1998TypeEHint(intervals: readonly { topM: number; bottomM: number; vsMps: number }[]): {
  likely: boolean;
  alluviumThicknessM: number | null;
} {
  const sorted = [...intervals].filter((iv) => iv.bottomM > iv.topM && iv.vsMps > 0).sort((a, b) => a.topM - b.topM);
  const firstStiff = sorted.findIndex((iv) => iv.vsMps > 800);
  if (firstStiff <= 0) return { likely: false, alluviumThicknessM: null };
  const h = sorted[firstStiff].topM;
  const softAbove = sorted.slice(0, firstStiff).every((iv) => iv.vsMps < 360);
  const stiffBelow = sorted.slice(firstStiff).every((iv) => iv.vsMps > 800);
  const likely = softAbove && stiffBelow && h >= 5 && h <= 20;
  return { likely, alluviumThicknessM: softAbove ? h : null };
}
