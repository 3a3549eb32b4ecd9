/**
 * Processing settings and user edits: everything besides the survey and the waveforms that decides the
 * result. Both are plain JSON (they go into project.json and the autosave).
 */

import type { IntervalMethod, OnsetPicker } from './catalogue/methods';
import type { IntervalKey, PickEditKey, ReceiverDepthKey, StationWaveKey } from './keys';

export type { EditablePickMethod, IntervalMethod } from './catalogue/methods';

export type Vs30RuleSetting = 'no-extrapolation' | 'extend-deepest';

export interface BandpassSetting {
  lowHz: number;
  highHz: number;
  order: number;
}

/** Read by prepare(): conditioning applied to every trace, and how hits combine into working traces. */
export interface ConditioningSettings {
  detrend: boolean;
  taperFraction: number;
  /** Band-pass per wave; null = none. */
  bandpassS: BandpassSetting | null;
  bandpassP: BandpassSetting | null;
  /** Use the difference (S) / sum (P) of reversed hits when both directions exist. */
  useReversedHits: boolean;
  /** Rotate the two horizontals onto the hit direction before picking (read by the rotation stage). */
  rotateHorizontals: boolean;
}

/** Read by prepare() (search windows) and autoPick(). */
export interface PickingGroup {
  onsetMethod: OnsetPicker;
  staS: number;
  ltaS: number;
  staLtaThreshold: number;
  /** Band for the cross-spectrum phase-slope delay; null = off. */
  phaseBandHz: [number, number] | null;
  /** Plausible velocity ranges: bound the search windows and the lag search (cycle-skip guard). */
  vsRangeMps: [number, number];
  vpRangeMps: [number, number];
}

/** Read by derive(): interval values and their uncertainty. */
export interface IntervalSettings {
  /** Method whose interval velocity goes into the profile unless the user chose another for an interval. */
  profileMethod: IntervalMethod;
  /** Flag an interval when methods differ by more than this share of the chosen value. */
  methodDisagreementShare: number;
  /** One-receiver downhole and cone: also fit layer velocities to the direct times with refracted rays. */
  rayFit: boolean;
  /** Crosshole direct velocities: trigger delay t0 subtracted from the picks, s (V = D / (t - t0), ASTM D4428). */
  triggerDelayS: number;
  /** One-sigma uncertainty of each receiver/source position, m (enters the path-length uncertainty). */
  positionSdM: number;
  /** One-sigma uncertainty of the trigger time from hit to hit, s (read by the uncertainty budget). */
  triggerOffsetSdS: number;
}

/** Read by derive(): layers for the travel-time fits. */
export interface LayeringSettings {
  /** auto: the soil column's layers; user: boundariesM. */
  mode: 'auto' | 'user';
  /** Depths of layer boundaries (user mode), m. */
  boundariesM: number[];
  /** Thinnest layer an automatic layering may form, m. */
  minThicknessM: number;
}

/** Read by derive(): Vs30, site classes and their Monte Carlo spread. */
export interface SiteSettings {
  vs30Rule: Vs30RuleSetting;
  /** Answers to the site-class questions beyond Vs30 (question id -> yes/no). */
  siteAnswers: Record<string, boolean>;
  monteCarloDraws: number;
  monteCarloSeed: number;
}

/** Read by derive(): design inputs for strain-dependent stiffness. */
export interface DesignSettings {
  /** Peak ground acceleration, g; null = not given. */
  pgaG: number | null;
  /** Earthquake magnitude; null = not given. */
  magnitude: number | null;
  curveModel: 'darendeli' | 'ishibashi-zhang';
  /** Loading frequency and number of cycles of the Darendeli (2001) curves. */
  loadingFrequencyHz: number;
  loadingCycles: number;
}

export function defaultDesignSettings(): DesignSettings {
  // 1 Hz and 10 cycles: Darendeli's (2001) reference loading for earthquake-type curves (common practice).
  return { pgaG: null, magnitude: null, curveModel: 'darendeli', loadingFrequencyHz: 1, loadingCycles: 10 };
}

/** Read when records are placed (set-up, before prepare). */
export interface PlacementSettings {
  /** A header depth beyond this is taken as a wrong unit or a number that is not a depth, m. */
  maxHeaderDepthM: number;
  /** File-name pattern with {depth} and {hit}; '' = the default pattern. */
  fileNamePattern: string;
}

/** Settings grouped by the pipeline stage that reads them (docs/project-format.md). */
export interface Settings {
  conditioning: ConditioningSettings;
  picking: PickingGroup;
  intervals: IntervalSettings;
  layering: LayeringSettings;
  site: SiteSettings;
  design: DesignSettings;
  placement: PlacementSettings;
}

export type SettingsGroup = keyof Settings;

/** The groups prepare() and autoPick() read: a change in any of them re-runs the worker. */
export const WORKER_SETTING_GROUPS = ['conditioning', 'picking'] as const satisfies readonly SettingsGroup[];

export function defaultSettings(): Settings {
  return {
    conditioning: {
      detrend: true,
      taperFraction: 0.02,
      // Off by default: a zero-phase (forward-backward) band-pass spreads low-frequency energy ahead of
      // the arrival, and onset pickers then fire early (13-32 ms on our demo with low corners of 30-10 Hz,
      // measured with bench data). Turn it on for noisy records and check the onsets by eye.
      bandpassS: null,
      bandpassP: null,
      useReversedHits: true,
      rotateHorizontals: true,
    },
    picking: {
      onsetMethod: 'aic',
      staS: 0.001,
      ltaS: 0.01,
      staLtaThreshold: 4,
      phaseBandHz: [10, 2000],
      // docs/methods.md: 50-1500 m/s for S in soil (common practice), user-set.
      vsRangeMps: [50, 1500],
      vpRangeMps: [150, 5000],
    },
    intervals: {
      // the best on the bench's training seeds for every downhole kind; crosshole takes DEFAULT_PROFILE_METHOD
      profileMethod: 'layer-model',
      methodDisagreementShare: 0.1,
      rayFit: true,
      triggerDelayS: 0,
      positionSdM: 0.02,
      // About 0.14 ms hit-to-hit trigger scatter of a hammer switch (common practice, from memory).
      triggerOffsetSdS: 0.00014,
    },
    layering: { mode: 'auto', boundariesM: [], minThicknessM: 1.0 },
    site: { vs30Rule: 'no-extrapolation', siteAnswers: {}, monteCarloDraws: 10000, monteCarloSeed: 20261201 },
    design: defaultDesignSettings(),
    placement: { maxHeaderDepthM: 200, fileNamePattern: '' },
  };
}

/** A change to one group (the others kept). */
export type SettingsPatch = { [G in SettingsGroup]?: Partial<Settings[G]> };

export function patchSettings(s: Settings, patch: SettingsPatch): Settings {
  const out = { ...s };
  for (const g of Object.keys(patch) as SettingsGroup[]) {
    // biome-ignore lint/suspicious/noExplicitAny: one group at a time, typed by SettingsPatch
    (out as any)[g] = { ...s[g], ...patch[g] };
  }
  return out;
}

/** Default settings with the given groups' fields laid over them. */
export function mergeSettings(patch: SettingsPatch): Settings {
  return patchSettings(defaultSettings(), patch);
}

/** Layer boundaries the user set, or none (soil layers) in auto mode. */
export function userBoundariesM(s: Settings): number[] {
  return s.layering.mode === 'user' ? s.layering.boundariesM : [];
}

export interface UserEdits {
  /** Hand-set pick times, s after trigger. Key: pickEditKey(stationKey, wave, method). */
  picks: Record<PickEditKey, number>;
  /** Stations (stationWaveKey) the user excluded: none of their picks or intervals count. */
  excludedStations: StationWaveKey[];
  /** Per interval key: the method whose value goes into the profile. */
  chosenMethod: Record<IntervalKey, IntervalMethod>;
  /** Interval keys left out of the profile. */
  excludedIntervals: IntervalKey[];
  /** User-fixed horizontal rotation per receiver and logged depth, degrees. */
  azimuthDeg?: Record<ReceiverDepthKey, number>;
}

export function emptyEdits(): UserEdits {
  return { picks: {}, excludedStations: [], chosenMethod: {}, excludedIntervals: [] };
}
