/**
 * What the report shows, as plain data in SI units (reportDataFrom() in ./adapter builds it from the
 * pipeline's result). Figures and the HTML document are pure functions of this: no DOM, no state.
 */
import type { UnitSystem } from '../units';

export type ReportWave = 'S' | 'P';
export type ReportPickOrigin = 'auto' | 'edited' | 'excluded';

export interface ReportTitle {
  project: string;
  site: string | null;
  holes: string[];
  /** Test kind in words, e.g. 'Downhole (one receiver)'. */
  testKind: string;
  /** Date of the test, YYYY-MM-DD, or null when not given. */
  testDate: string | null;
  units: UnitSystem;
  softwareVersion: string;
  /** When the report was made (ISO 8601). */
  madeAt: string;
}

/** One setting that decides the result, already in words with its unit. */
export interface ReportSetting {
  label: string;
  value: string;
}

export interface ReportTrace {
  /** Receiver depth, m. */
  depthM: number;
  wave: ReportWave;
  /** Receiver slot or name, e.g. 'upper', 'B2'. */
  receiver: string;
  samples: ArrayLike<number>;
  sampleIntervalS: number;
  /** Time of sample 0 after the trigger, s. */
  delayS: number;
  /** The first-arrival (onset) pick, if any. */
  pick: { timeS: number; origin: ReportPickOrigin } | null;
  excluded: boolean;
}

export interface ReportTravelPoint {
  depthM: number;
  pathM: number;
  wave: ReportWave;
  receiver: string;
  timeS: number;
  origin: ReportPickOrigin;
}

export interface ReportLayerFit {
  wave: ReportWave;
  topM: number;
  bottomM: number;
  /** How the velocity was found, in words, e.g. 'straight-line fit (onset)'. */
  method: string;
  velocityMps: number;
  velocitySdMps: number | null;
  /** Straight-line fits: time = interceptS + path / velocity (null for the refracted-ray model). */
  interceptS: number | null;
  stations: number;
  rmsMisfitS: number | null;
  flags: string[];
}

export interface ReportInterval {
  wave: ReportWave;
  topM: number;
  bottomM: number;
  /** The method whose value is used, in words. */
  method: string;
  dtS: number | null;
  velocityMps: number | null;
  velocitySdMps: number | null;
  /** The 95% range of the velocity, m/s: velocity -+ k95 sd (null without an sd; docs/true-vs.md). */
  range95Mps: [number, number] | null;
  /** Lowest and highest value of the other methods, m/s (null when none gave one). */
  otherMethodsMps: [number, number] | null;
  flags: string[];
}

export interface ReportProfileRow {
  topM: number;
  bottomM: number;
  vsMps: number;
  vsSdMps: number;
  /** The 95% range of Vs, m/s: the chosen interval's velocity -+ k95 sd (null without one; docs/true-vs.md). */
  vsRange95Mps: [number, number] | null;
  vpMps: number | null;
  vpSdMps: number | null;
  gmaxKpa: number;
  gmaxSdKpa: number;
  vs1Mps: number | null;
  sigmaVEffKpa: number;
  densityMgM3: number;
  poissonRatio: number;
  method: string;
  flags: string[];
}

export interface ReportSiteClass {
  standard: string;
  siteClass: string;
  /** Chance of each class from the spread (0-1), most likely first. */
  probabilities: [string, number][];
  basis: string;
}

export interface ReportSite {
  /** Set-up problems that block Vs30 and the class: when any, neither is shown. */
  setupProblems: string[];
  vs30Mps: number | null;
  toDepthM: number | null;
  profileDepthM: number | null;
  extended: boolean;
  flags: string[];
  spread: { p05Mps: number; p50Mps: number; p95Mps: number; draws: number } | null;
  classes: ReportSiteClass[];
}

/** Field damping D = 1/(2Q) per soil layer beside the laboratory-model Dmin at the test's frequency. */
export interface ReportFieldDamping {
  rows: {
    topM: number;
    bottomM: number;
    layer: string;
    fieldDPct: number;
    fieldDSdPct: number | null;
    frequencyHz: number;
    labDminPct: number;
  }[];
  /** Why there is no field damping (one receiver per hit, no estimate), or null. */
  reason: string | null;
  caution: string;
}

export interface ReportData {
  title: ReportTitle;
  settings: ReportSetting[];
  traces: ReportTrace[];
  travel: ReportTravelPoint[];
  layerFits: ReportLayerFit[];
  intervals: ReportInterval[];
  profile: ReportProfileRow[];
  waterTableM: number | null;
  site: ReportSite;
  fieldDamping?: ReportFieldDamping;
  /** Problems and notes about this data set (one line each). */
  notes: string[];
  cautions: string[];
}
