/**
 * Borewave core model. SI units inside: metres, seconds, kg/m3 or Mg/m3 where named, kPa where named.
 * Sample arrays are typed arrays, never arrays of objects per sample.
 */

import type { ErrorInfo } from './errors';

export type ByteOrder = 'little' | 'big';

/**
 * How the time of sample 0 was built from the header (SEG-2): delayS = delayKeywordS + skewS, or,
 * when the trigger-sample keywords set the pre-trigger, -triggerIndex * dt + skewS.
 * See docs/seg2-vendor-keywords.md for the meaning and sign adopted.
 */
export interface TimeBase {
  /** DELAY as written, s (0 when absent). */
  delayKeywordS: number;
  /** SKEW applied, s (0 when absent). */
  skewS: number;
  /** 0-based index of the trigger sample from TRIGGER_SAMPLE_NO / FIRST_SAMPLE_NO, or null. */
  triggerIndex: number | null;
  /** What set the pre-trigger part: 'DELAY' or 'TRIGGER_SAMPLE_NO'. */
  delaySource: 'DELAY' | 'TRIGGER_SAMPLE_NO';
  /** delayS minus DELAY: the shift this reader applied beyond the standard's DELAY, s. */
  shiftS: number;
}

/** One channel of one recorded hit. */
export interface Trace {
  /** Channel number as in the file (SEG-2 CHANNEL_NUMBER, else 1-based position). */
  channel: number;
  /** Samples in physical units (SEG-2 DESCALING_FACTOR already applied). */
  samples: Float32Array;
  /** Sample interval, s. */
  sampleIntervalS: number;
  /** Time of sample 0 after the trigger, s (negative = pre-trigger). t_i = delayS + i * sampleIntervalS. */
  delayS: number;
  /** RECEIVER_LOCATION numbers as written in the file (x [y [z]], file UNITS). */
  receiverLocation?: number[];
  /** SOURCE_LOCATION numbers as written in the file. */
  sourceLocation?: number[];
  /** Trace-level keyword strings, raw values (unknown keywords kept; a repeated keyword: its last value). */
  strings: Record<string, string>;
  /** Keywords written more than once in the trace block: every value in file order. */
  stringLists?: Record<string, string[]>;
  /** SEG-2: how delayS was built from DELAY, SKEW and the trigger-sample keywords. */
  timeBase?: TimeBase;
}

/** One file: one hit (or one stacked set of hits) recorded on one or more channels. */
export interface WaveRecord {
  /** Unique within a session; normally the file name (made unique with a suffix if repeated). */
  id: string;
  fileName: string;
  format: 'seg2' | 'text';
  /** SEG-2 only. */
  byteOrder?: ByteOrder;
  /** SEG-2 data format code of the first trace (1 int16, 2 int32, 3 20-bit float, 4 float32, 5 float64). */
  formatCode?: number;
  /** File-level keyword strings (SEG-2), raw values (a repeated keyword: its last value). */
  fileStrings: Record<string, string>;
  /** File-level keywords written more than once: every value in file order (e.g. two NOTE strings). */
  fileStringLists?: Record<string, string[]>;
  /** Problems that did not stop the reading (revision, preamble lines skipped ...), shown to the user. */
  warnings?: ErrorInfo[];
  /** NOTE lines (file level, every NOTE string), split on the declared line terminator. */
  notes: string[];
  traces: Trace[];
}

// ---------------------------------------------------------------- survey

export type TestKind = 'downhole' | 'downhole-pair' | 'crosshole' | 'seismic-cone';

/**
 * Where a placed value (depth, hit, component, receiver) came from, highest precedence first
 * (docs/project-format.md): user > log (record log) > filename > header > data (inferred from the
 * waveforms) > default (the test kind's default).
 */
export type ValueSource = 'user' | 'log' | 'filename' | 'header' | 'data' | 'default';

import type { IntervalKey, ReceiverSlot, StationKey } from './keys';
import type { PickFlag } from './flags';

/** Direction of the hit. Reversed pairs: left/right (horizontal beam), up/down (vertical hammer in a hole). */
export type HitDirection = 'left' | 'right' | 'up' | 'down' | 'none';

/** Receiver component: H1 = horizontal along the hit, H2 = horizontal across, V = vertical. */
export type Component = 'H1' | 'H2' | 'V';

/** One station of a verticality (deviation) survey: depth along hole and horizontal offsets from the collar. */
export interface DeviationStation {
  depthAlongM: number;
  eastM: number;
  northM: number;
}

export interface Borehole {
  id: string;
  collarEastM: number;
  collarNorthM: number;
  /** Deviation survey; empty = vertical hole. Sorted by depthAlongM, strictly increasing. */
  deviation: DeviationStation[];
}

/** Which receiver and component a channel of a record carries. */
export interface ChannelAssignment {
  channel: number;
  component: Component;
  /** Receiver slot in the test kind's layout (src/core/catalogue/testKinds.ts): r0, r1 ... never a hole name. */
  receiver: ReceiverSlot;
  /** Where this channel's meaning came from (absent in older saves: the kind's default). */
  source?: ValueSource;
}

/** How one record (file) is placed in the survey. */
export interface RecordAssignment {
  recordId: string;
  /**
   * LOGGED depth below ground, m: receiver depth (downhole), upper receiver (two receivers), TIP depth
   * (seismic cone), test depth (crosshole). null = unknown. Receiver depths: catalogue receiverDepthM.
   */
  depthM: number | null;
  hit: HitDirection;
  channels: ChannelAssignment[];
  /** User excluded the whole record. */
  excluded: boolean;
  /** Where the depth came from. */
  depthSource: ValueSource;
  /** Where the hit direction came from. */
  hitSource: ValueSource;
}

export interface SoilLayer {
  topM: number;
  bottomM: number;
  name: string;
  /** Total unit weight, kN/m3. */
  unitWeightKnM3: number;
  /** Exponent n for Vs1 = Vs (Pa/sigma'v)^n. */
  stressExponent: number;
  /** Poisson's ratio used for E where Vp cannot give the skeleton's value. */
  poissonRatio: number;
  /** Soil fields for curves and the liquefaction screen (project format v2); absent or null = default. */
  soilType?: SoilType | null;
  plasticityIndexPct?: number | null;
  ocr?: number | null;
  finesContentPct?: number | null;
  k0?: number | null;
  /** Shear strain at which the working stiffness G is wanted, % (0.01 = 0.01 %). */
  workingStrainPct?: number | null;
}

/** Soil types of the project format (docs/project-format.md). */
export type SoilType = 'clay' | 'silt' | 'sand' | 'silty-sand' | 'gravel' | 'rock' | 'other';

export interface SoilColumn {
  layers: SoilLayer[];
  waterTableM: number | null;
  /** kN/m3, default 9.81. */
  waterUnitWeightKnM3: number;
}

export interface Survey {
  name: string;
  /** Site name and test date (YYYY-MM-DD) for reports; absent = not given. */
  siteName?: string;
  testDate?: string | null;
  /** One channel map for all records (records may override); absent = none. */
  channelMap?: ChannelAssignment[];
  kind: TestKind;
  /** Receivers in use (seismic cone: 1 or 2; other kinds fixed by the kind catalogue). */
  receiverCount: number;
  boreholes: Borehole[];
  /** Downhole: the receiver hole id. Crosshole: the source hole id. */
  mainHoleId: string;
  /** Downhole: horizontal source offset from the receiver hole collar, m, and source depth (usually 0). */
  sourceOffsetM: number;
  sourceDepthM: number;
  /** Two receivers (probe or cone): vertical spacing between the upper and lower receivers, m. */
  receiverSpacingM: number;
  /** Seismic cone: the (lower) receiver sits this far above the logged tip depth, m. */
  coneOffsetM: number;
  /** Crosshole: receiver holes in order of distance from the source hole (near, far). */
  receiverHoleIds: string[];
  records: RecordAssignment[];
  soil: SoilColumn;
  /** One global left/right (up/down) swap of the hits inferred from the data (project.json survey.hitSwap). */
  hitSwap?: boolean;
}

// ---------------------------------------------------------------- picks and delays

export type Wave = 'S' | 'P';
export type OnsetMethod = 'aic' | 'stalta';
export type FeatureMethod = 'peak' | 'trough' | 'zero-crossing';
export type PickMethod = OnsetMethod | FeatureMethod | 'manual';
export type PickOrigin = 'auto' | 'edited' | 'excluded';

/** A time pick on one station's working trace. */
export interface Pick {
  /** Station key (src/core/keys.ts): receiver slot + logged depth + component. */
  stationKey: StationKey;
  wave: Wave;
  method: PickMethod;
  /** Time after trigger, s. NaN never leaves the core: a failed pick is absent with a flag instead. */
  timeS: number;
  origin: PickOrigin;
  /** Signal-to-noise ratio (RMS in arrival window / RMS of pre-arrival noise), linear. */
  snr: number;
  /** One-sigma uncertainty, s. */
  uncertaintyS: number;
  /** Polarity of the feature (+1 peak, -1 trough) where it applies. */
  polarity?: 1 | -1;
  flags: PickFlag[];
}

export type DelayMethod = 'xcorr' | 'phase';

/** A delay between two stations' working traces (b later than a by delayS). */
export interface PairDelay {
  pairKey: IntervalKey;
  wave: Wave;
  method: DelayMethod;
  delayS: number;
  /** Normalised correlation coefficient at the peak (xcorr) or mean coherence over the band (phase). */
  coefficient: number;
  uncertaintyS: number;
  flags: PickFlag[];
}

/** One station's conditioned working trace: what the pickers read. */
export interface WorkingTrace {
  stationKey: StationKey;
  wave: Wave;
  /** Already conditioned samples. */
  samples: Float64Array;
  sampleIntervalS: number;
  /** Time of sample 0 after the trigger, s. */
  delayS: number;
  /** Arrival search window after the trigger, s (from geometry and plausible velocities). */
  searchStartS: number;
  searchEndS: number;
}

/** A delay to measure between two stations' working traces. */
export interface DelayRequest {
  pairKey: IntervalKey;
  wave: Wave;
  /** Station keys: b is expected later than a. */
  a: StationKey;
  b: StationKey;
  /** Bounds on the delay of b after a, s (cycle-skip guard). */
  minDelayS: number;
  maxDelayS: number;
}
