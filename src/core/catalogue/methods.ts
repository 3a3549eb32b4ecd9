/**
 * The one catalogue of methods: how a pick or an interval travel time is obtained. Settings, intervals,
 * the pipeline, the exports and the views read this table; none writes its own list.
 *
 * Interval methods (docs/methods.md): differences of like picks (onset, first peak, first trough, zero
 * crossing after the first peak), the cross-correlation or phase-slope delay between two stations'
 * traces, or the refracted-ray layer fit of the direct times (one-receiver downhole and cone).
 */
import type { PickMethod, TestKind, Wave } from '../model';

export type IntervalMethod =
  | 'onset'
  | 'peak'
  | 'trough'
  | 'zero-crossing'
  | 'xcorr'
  | 'phase'
  | 'ray-fit'
  | 'layer-model'
  | 'joint';

/** Pick methods a user can correct by hand ('onset' = the station's first-arrival pick). */
export type EditablePickMethod = 'onset' | 'peak' | 'trough' | 'zero-crossing';

/** pick: difference of two picks; delay: measured between two traces; model: fitted to all direct times. */
export type MethodKind = 'pick' | 'delay' | 'model';

export interface IntervalMethodInfo {
  id: IntervalMethod;
  kind: MethodKind;
  /** The user can set this method's pick by hand on the trace board. */
  editable: boolean;
  /** Words for sentences ("first peak"). */
  label: string;
  /** Column and button text ("Peak"). */
  shortLabel: string;
  /** Joins the median the chosen value is compared with for the "methods differ" flag. */
  inDisagreementCheck: boolean;
  /** Place in the fallback order when the chosen method has no value (lower first); null = never a fallback. */
  fallbackRank: number | null;
  /** Waves the method applies to. */
  waves: readonly Wave[];
  /** Test kinds the method applies to; null = every kind (see also the kind catalogue's pairing). */
  kinds: readonly TestKind[] | null;
}

const BOTH: readonly Wave[] = ['S', 'P'];

/**
 * In the order the views and the settings list them. Fallback order (common practice): like-for-like
 * whole-pulse measures first, onset last; the ray fit is never a fallback.
 */
export const INTERVAL_METHOD_CATALOGUE: readonly IntervalMethodInfo[] = [
  {
    id: 'xcorr',
    kind: 'delay',
    editable: false,
    label: 'cross-correlation',
    shortLabel: 'X-corr',
    inDisagreementCheck: true,
    fallbackRank: 0,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'onset',
    kind: 'pick',
    editable: true,
    label: 'onset',
    shortLabel: 'Onset',
    inDisagreementCheck: true,
    fallbackRank: 4,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'peak',
    kind: 'pick',
    editable: true,
    label: 'first peak',
    shortLabel: 'Peak',
    inDisagreementCheck: true,
    fallbackRank: 2,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'trough',
    kind: 'pick',
    editable: true,
    label: 'first trough',
    shortLabel: 'Trough',
    inDisagreementCheck: true,
    fallbackRank: 3,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'zero-crossing',
    kind: 'pick',
    editable: true,
    label: 'zero crossing',
    shortLabel: 'Zero x',
    inDisagreementCheck: true,
    fallbackRank: 1,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'phase',
    kind: 'delay',
    editable: false,
    label: 'phase slope',
    shortLabel: 'Phase',
    inDisagreementCheck: false,
    fallbackRank: 5,
    waves: BOTH,
    kinds: null,
  },
  {
    id: 'ray-fit',
    kind: 'model',
    editable: false,
    label: 'ray fit',
    shortLabel: 'Ray fit',
    inDisagreementCheck: false,
    fallbackRank: null,
    waves: ['S'],
    kinds: ['downhole', 'seismic-cone'],
  },
  {
    // velocity/layerMethod.ts: layers chosen from the travel times (or the user's), refracted rays
    id: 'layer-model',
    kind: 'model',
    editable: false,
    label: 'layered model',
    shortLabel: 'Layers',
    inDisagreementCheck: false,
    fallbackRank: null,
    waves: ['S'],
    kinds: ['downhole', 'downhole-pair', 'seismic-cone'],
  },
  {
    // velocity/joint.ts: onsets, correlation delays, trigger offsets and the layering in one inversion
    id: 'joint',
    kind: 'model',
    editable: false,
    label: 'joint inversion',
    shortLabel: 'Joint',
    inDisagreementCheck: false,
    fallbackRank: null,
    waves: ['S'],
    kinds: null,
  },
];

/**
 * The profile method when the settings' method does not apply to the survey's kind: the method with
 * the lowest median + P90/2 interval error on the 12 training seeds of the bench's bank of random earths
 * (with its field troubles, docs/true-vs.md). Median / P90 %: one receiver layer-model 1.32 / 7.49,
 * joint 2.22 / 7.30; two receivers layer-model 0.59 / 4.58, joint 1.10 / 4.39; cone layer-model
 * 1.21 / 9.77, joint 2.52 / 9.26; crosshole cross-correlation 0.14 / 0.67, joint 0.16 / 0.69.
 */
export const DEFAULT_PROFILE_METHOD: Readonly<Record<TestKind, IntervalMethod>> = {
  downhole: 'layer-model',
  'downhole-pair': 'layer-model',
  'seismic-cone': 'layer-model',
  crosshole: 'xcorr',
};

const BY_ID = new Map(INTERVAL_METHOD_CATALOGUE.map((m) => [m.id, m]));

export function methodInfo(id: IntervalMethod): IntervalMethodInfo {
  const m = BY_ID.get(id);
  if (!m) throw new Error(`unknown interval method ${id}`);
  return m;
}

/** Every interval method id, in catalogue order. */
export const INTERVAL_METHODS: readonly IntervalMethod[] = INTERVAL_METHOD_CATALOGUE.map((m) => m.id);

export function isIntervalMethod(s: string): s is IntervalMethod {
  return BY_ID.has(s as IntervalMethod);
}

/** Methods whose pick the user edits by hand, in catalogue display order: onset, peak, trough, zero crossing. */
export const EDITABLE_METHODS: readonly EditablePickMethod[] = INTERVAL_METHOD_CATALOGUE.filter((m) => m.editable).map(
  (m) => m.id as EditablePickMethod,
);

/** Interval methods measured from pick differences. */
export const PICK_INTERVAL_METHODS: readonly EditablePickMethod[] = EDITABLE_METHODS;

/** Interval methods measured between two traces. */
export const DELAY_METHODS = INTERVAL_METHOD_CATALOGUE.filter((m) => m.kind === 'delay').map((m) => m.id) as readonly (
  | 'xcorr'
  | 'phase'
)[];

/** Fallback order when the chosen method gives no value. */
export const FALLBACK_ORDER: readonly IntervalMethod[] = INTERVAL_METHOD_CATALOGUE.filter(
  (m) => m.fallbackRank !== null,
)
  .sort((a, b) => (a.fallbackRank ?? 0) - (b.fallbackRank ?? 0))
  .map((m) => m.id);

/** Whether the method applies to the test kind. */
export function methodApplies(id: IntervalMethod, kind: TestKind): boolean {
  const k = methodInfo(id).kinds;
  return k === null || k.includes(kind);
}

/**
 * The method the profile takes for a survey of this kind: the settings' method where it applies, else
 * the kind's default (a crosshole survey with the downhole default 'layer-model' set uses 'xcorr').
 * Everything that names the profile method (interval choice, app, report, CLI) asks here.
 */
export function profileMethodFor(settingsMethod: IntervalMethod, kind: TestKind): IntervalMethod {
  return methodApplies(settingsMethod, kind) ? settingsMethod : DEFAULT_PROFILE_METHOD[kind];
}

// ---------------------------------------------------------------- pick methods (what a Pick records)

export interface PickMethodInfo {
  id: PickMethod;
  /** The editable method this pick stands for on the board and in intervals. */
  editableAs: EditablePickMethod;
  /** Counts as the station's first-arrival (onset) pick. */
  countsAsOnset: boolean;
  label: string;
}

export const PICK_METHOD_CATALOGUE: readonly PickMethodInfo[] = [
  { id: 'aic', editableAs: 'onset', countsAsOnset: true, label: 'AIC onset' },
  { id: 'stalta', editableAs: 'onset', countsAsOnset: true, label: 'STA/LTA onset' },
  { id: 'manual', editableAs: 'onset', countsAsOnset: true, label: 'hand onset' },
  { id: 'peak', editableAs: 'peak', countsAsOnset: false, label: 'first peak' },
  { id: 'trough', editableAs: 'trough', countsAsOnset: false, label: 'first trough' },
  { id: 'zero-crossing', editableAs: 'zero-crossing', countsAsOnset: false, label: 'zero crossing' },
];

const PICK_BY_ID = new Map(PICK_METHOD_CATALOGUE.map((m) => [m.id, m]));

/** The editable method a pick stands for (AIC, STA/LTA and hand onsets are all 'onset'). */
export function editableMethodOf(p: { method: PickMethod }): EditablePickMethod | null {
  return PICK_BY_ID.get(p.method)?.editableAs ?? null;
}

/** Whether the pick is the station's first-arrival pick. */
export function isOnsetPick(p: { method: PickMethod }): boolean {
  return PICK_BY_ID.get(p.method)?.countsAsOnset ?? false;
}

/** Whether a pick stands for the editable method m. */
export function pickIsMethod(p: { method: PickMethod }, m: EditablePickMethod): boolean {
  return editableMethodOf(p) === m;
}

/** The pick method a hand pick of editable method m is stored as. */
export function pickMethodForEdit(m: EditablePickMethod): PickMethod {
  return m === 'onset' ? 'manual' : m;
}

/** Automatic onset pickers the settings offer. */
export const ONSET_PICKERS = ['aic', 'stalta'] as const;
export type OnsetPicker = (typeof ONSET_PICKERS)[number];
