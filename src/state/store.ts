/**
 * What the user did: survey setup, settings, pick edits and choices, plus view selection. Every change
 * of survey/settings/edits goes through commit() so it can be undone. Derived results are not stored
 * here (see derived.ts); worker results (working traces, automatic picks) sit in useResults.
 */
import type { IntervalKey, StationKey } from '../core';
import type { RecordLog } from '../core';
import type { InferenceSummary, RejectedValue } from '../core';
import { create } from 'zustand';
import type { ErrorInfo } from '../core';
import type { Survey, TestKind, Wave } from '../core';
import { defaultSettings, emptyEdits, type EditablePickMethod, type Settings, type UserEdits } from '../core';
import type { UnitSystem } from '../core';
import type { Prepared } from '../core';
import type { AutoPickResult } from '../core';
import { DEFAULT_NAME_PATTERN } from '../core';
import type { ComparisonProfile } from '../core';
import { blankSurvey } from '../core';

export interface Snapshot {
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  /** A profile from another test overlaid on the Profile (null = none). */
  comparison: ComparisonProfile | null;
}

export type FileStatus = 'reading' | 'ok' | 'error';

export interface RecordMeta {
  /** Record id (ok files) or file name (others). */
  id: string;
  fileName: string;
  sizeBytes: number;
  status: FileStatus;
  error?: ErrorInfo;
  traces?: number;
  samples?: number;
  sampleIntervalS?: number;
  format?: string;
  /** Problems that did not stop the reading (SEG-2 revision, preamble skipped, unit guessed ...). */
  warnings?: ErrorInfo[];
  /** Text files: time column and unit found, and where the sample interval came from. */
  layout?: string;
  /** File name as written by the instrument, when the session name differs (same-name files). */
  originalName?: string;
}

export type Sheet = null | 'site' | 'export';
export type CentreTab = 'traces' | 'geometry' | 'design';
export type TraceTool = 'pick' | 'zoom' | 'pan';
export type HitView = 'working' | 'both';

export interface ViewState {
  wave: Wave;
  /** Receiver shown on the Trace board ('' = all). */
  receiver: string;
  editMethod: EditablePickMethod;
  selectedStation: StationKey | null;
  hoveredInterval: IntervalKey | null;
  selectedInterval: IntervalKey | null;
  tool: TraceTool;
  snap: boolean;
  fill: boolean;
  /** Trace board amplitude: peak of each trace, one common peak, automatic gain control, or t-power gain. */
  normalise: 'trace' | 'common' | 'agc' | 'tvg';
  gain: number;
  /** Automatic gain control window, ms. */
  agcMs: number;
  /** Clip level, in trace spacings (a wiggle never swings further than this). */
  clip: number;
  /** Profile: draw the Vp column. */
  showVp: boolean;
  hitView: HitView;
  /** Trace board drawing: WebGL for many traces on a GPU ('auto'), or forced. */
  renderer: 'auto' | 'svg' | 'webgl';
  recordsOpen: boolean;
  centre: CentreTab;
  sheet: Sheet;
  helpOpen: boolean;
  /** Short message shown under the Trace board after an edit (e.g. "interval now uses your picks"). */
  notice: string | null;
}

export interface SetupReport {
  inferences: InferenceSummary[];
  rejected: RejectedValue[];
  problems: ErrorInfo[];
}

export interface AppState extends Snapshot {
  past: Snapshot[];
  future: Snapshot[];
  records: RecordMeta[];
  namePattern: string;
  /** The operator's record log, when one was loaded (file, depth, hit, components). */
  recordLog: RecordLog | null;
  /** What the last placement inferred and rejected (shown in Records and Geometry). */
  setupReport: SetupReport | null;
  unitSystem: UnitSystem;
  /** Deviation-table file name per borehole id (its bytes are in rawFiles). */
  deviationFiles: Record<string, string>;
  /** Text files without a time column waiting for a sample interval (asked once per group of files). */
  intervalRequest: string[];
  /** User-given sample interval per text file (session name), s: saved as files[].sampleIntervalS. */
  fileSampleIntervals: Record<string, number>;
  /** Problems that are not tied to one file (archive, autosave, worker). */
  messages: ErrorInfo[];
  loadProgress: { done: number; total: number } | null;
  view: ViewState;
  /** Increments on every change worth saving (autosave watches it). */
  revision: number;
  /** Increments when the loaded file set changes (autosave saves the bytes again). */
  filesRevision: number;
}

export const HISTORY_LIMIT = 200;

export function initialView(): ViewState {
  return {
    wave: 'S',
    receiver: '',
    editMethod: 'onset',
    selectedStation: null,
    hoveredInterval: null,
    selectedInterval: null,
    tool: 'pick',
    snap: false,
    fill: true,
    normalise: 'trace',
    gain: 1,
    agcMs: 20,
    clip: 1,
    showVp: true,
    hitView: 'working',
    renderer: 'auto',
    recordsOpen: true,
    centre: 'traces',
    sheet: null,
    helpOpen: false,
    notice: null,
  };
}

export function initialState(kind: TestKind = 'downhole'): Omit<AppState, 'view'> & { view: ViewState } {
  return {
    survey: blankSurvey(kind),
    settings: defaultSettings(),
    edits: emptyEdits(),
    comparison: null,
    past: [],
    future: [],
    records: [],
    namePattern: DEFAULT_NAME_PATTERN,
    recordLog: null,
    setupReport: null,
    unitSystem: 'SI',
    deviationFiles: {},
    intervalRequest: [],
    fileSampleIntervals: {},
    messages: [],
    loadProgress: null,
    view: initialView(),
    revision: 0,
    filesRevision: 0,
  };
}

export const useApp = create<AppState>(() => initialState());

function snapshot(s: AppState): Snapshot {
  return { survey: s.survey, settings: s.settings, edits: s.edits, comparison: s.comparison };
}

/**
 * One undoable step: `change` returns the new parts of the snapshot (others kept). Values are treated
 * as immutable: change() must return new objects, never mutate the current ones.
 */
export function commit(change: (s: Snapshot) => Partial<Snapshot>, notice?: string | null): void {
  useApp.setState((s) => {
    const next = change(snapshot(s));
    return {
      ...next,
      past: [...s.past, snapshot(s)].slice(-HISTORY_LIMIT),
      future: [],
      revision: s.revision + 1,
      // The same view object when the notice is unchanged, so panes that read the view do not re-render.
      view: notice === undefined || notice === s.view.notice ? s.view : { ...s.view, notice },
    };
  });
}

/** A change inside an already-committed step (e.g. while a pick is being dragged): no new undo entry. */
export function amend(change: (s: Snapshot) => Partial<Snapshot>): void {
  useApp.setState((s) => ({ ...change(snapshot(s)), revision: s.revision + 1 }));
}

/** A change that cannot be undone and clears the history (loading or removing files). */
export function replaceWithoutHistory(change: (s: Snapshot) => Partial<Snapshot>): void {
  useApp.setState((s) => ({ ...change(snapshot(s)), past: [], future: [], revision: s.revision + 1 }));
}

export function undo(): void {
  useApp.setState((s) => {
    const prev = s.past[s.past.length - 1];
    if (!prev) return {};
    return {
      ...prev,
      past: s.past.slice(0, -1),
      future: [snapshot(s), ...s.future],
      revision: s.revision + 1,
      view: { ...s.view, notice: 'Undone.' },
    };
  });
}

export function redo(): void {
  useApp.setState((s) => {
    const next = s.future[0];
    if (!next) return {};
    return {
      ...next,
      past: [...s.past, snapshot(s)],
      future: s.future.slice(1),
      revision: s.revision + 1,
      view: { ...s.view, notice: 'Redone.' },
    };
  });
}

export function setView(patch: Partial<ViewState>): void {
  useApp.setState((s) => ({ view: { ...s.view, ...patch } }));
}

export function setUnitSystem(u: UnitSystem): void {
  useApp.setState((s) => ({ unitSystem: u, revision: s.revision + 1 }));
}

export function setNamePattern(p: string): void {
  useApp.setState((s) => ({ namePattern: p, revision: s.revision + 1 }));
}

export function pushMessage(e: ErrorInfo): void {
  useApp.setState((s) => ({ messages: [...s.messages, e].slice(-20) }));
}

export function dismissMessage(i: number): void {
  useApp.setState((s) => ({ messages: s.messages.filter((_, j) => j !== i) }));
}

// ------------------------------------------------------------------ worker results

export interface ProcessStatus {
  state: 'idle' | 'running' | 'done' | 'failed' | 'cancelled';
  stage: string;
  done: number;
  total: number;
  error?: ErrorInfo;
  /** Wall time of the last prepare + auto-pick run, ms. */
  elapsedMs?: number;
}

export interface ResultsState {
  prepared: Prepared | null;
  auto: AutoPickResult | null;
  /** Key of the inputs the current results were computed from. */
  key: string | null;
  status: ProcessStatus;
}

export const useResults = create<ResultsState>(() => ({
  prepared: null,
  auto: null,
  key: null,
  status: { state: 'idle', stage: '', done: 0, total: 0 },
}));
