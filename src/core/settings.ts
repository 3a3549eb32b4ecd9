/**
 * Processing settings and user edits: everything besides the survey and the waveforms that decides the
 * result. Both are plain JSON (they go into project.json and the autosave).
 */

import type { IntervalMethod, OnsetPicker } from './catalogue/methods';
import type { IntervalKey, PickEditKey, StationWaveKey } from './keys';

export type { EditablePickMethod, IntervalMethod } from './catalogue/methods';

export type Vs30RuleSetting = 'no-extrapolation' | 'extend-deepest';

export interface BandpassSetting {
  lowHz: number;
  highHz: number;
  order: number;
}

/** Shaking and curve settings for the design outputs (project format v2 settings.design). */
export interface DesignSettings {
  /** Peak ground acceleration at the surface, g; null = no liquefaction screen. */
  pgaG: number | null;
  /** Moment magnitude; null = no liquefaction screen. */
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

export interface Settings {
  /** Conditioning applied to every trace before picking. */
  detrend: boolean;
  taperFraction: number;
  /** Band-pass per wave; null = none. */
  bandpassS: BandpassSetting | null;
  bandpassP: BandpassSetting | null;
  /** Use the difference (S) / sum (P) of reversed hits when both directions exist. */
  useReversedHits: boolean;
  onsetMethod: OnsetPicker;
  staS: number;
  ltaS: number;
  staLtaThreshold: number;
  /** Band for the cross-spectrum phase-slope delay; null = off. */
  phaseBandHz: [number, number] | null;
  /** Plausible velocity ranges: bound the search windows and the lag search (cycle-skip guard). */
  vsRangeMps: [number, number];
  vpRangeMps: [number, number];
  /** Method whose interval velocity goes into the profile unless the user chose another for an interval. */
  profileMethod: IntervalMethod;
  /** Flag an interval when methods differ by more than this share of the chosen value. */
  methodDisagreementShare: number;
  /** Downhole: also fit layer velocities to the direct times with refracted (Snell's law) rays. */
  rayFit: boolean;
  /** Crosshole direct velocities: trigger delay t0 subtracted from the picks, s (V = D / (t - t0), ASTM D4428). */
  triggerDelayS: number;
  /** One-sigma uncertainty of each receiver/source position, m (enters the path-length uncertainty). */
  positionSdM: number;
  /** Depths of layer boundaries for travel-time regressions (user-chosen layers); empty = soil layers. */
  layerBoundariesM: number[];
  vs30Rule: Vs30RuleSetting;
  /** Answers to the site-class questions beyond Vs30 (question id -> yes/no). */
  siteAnswers: Record<string, boolean>;
  monteCarloDraws: number;
  monteCarloSeed: number;
  design: DesignSettings;
}

export function defaultSettings(): Settings {
  return {
    detrend: true,
    taperFraction: 0.02,
    // Off by default: a zero-phase (forward-backward) band-pass spreads low-frequency energy ahead of
    // the arrival, and onset pickers then fire early (13-32 ms on our demo with low corners of 30-10 Hz,
    // measured with bench data). Turn it on for noisy records and check the onsets by eye.
    bandpassS: null,
    bandpassP: null,
    useReversedHits: true,
    onsetMethod: 'aic',
    staS: 0.001,
    ltaS: 0.01,
    staLtaThreshold: 4,
    phaseBandHz: [10, 2000],
    // domain.md section 3: 50-1500 m/s for S in soil (common practice), user-set.
    vsRangeMps: [50, 1500],
    vpRangeMps: [150, 5000],
    profileMethod: 'xcorr',
    methodDisagreementShare: 0.1,
    rayFit: true,
    triggerDelayS: 0,
    positionSdM: 0.02,
    layerBoundariesM: [],
    vs30Rule: 'no-extrapolation',
    siteAnswers: {},
    monteCarloDraws: 10000,
    monteCarloSeed: 20261201,
    design: defaultDesignSettings(),
  };
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
}

export function emptyEdits(): UserEdits {
  return { picks: {}, excludedStations: [], chosenMethod: {}, excludedIntervals: [] };
}
