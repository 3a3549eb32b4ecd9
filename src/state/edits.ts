/**
 * User edit actions on picks, stations and intervals. Each is one undoable step. A pick edit of a
 * method also makes that method the chosen one for the station's intervals, in the same step, so the
 * profile follows the edit at once.
 */
import type { Wave } from '../core';
import { toErrorInfo, type ErrorInfo } from '../core';
import { parseComparisonCsv, type ComparisonProfile } from '../core';
import { patchSettings, type SettingsPatch, type UserEdits } from '../core';
import type { EditablePickMethod, IntervalMethod } from '../core';
import { applyPickEdit, pickEditKey, stationWaveKey, type IntervalKey, type StationKey } from '../core';
import { amend, commit, useApp, useResults, type Snapshot } from './store';

/** Interval keys that use the station (as either end). */
export function intervalsOfStation(stationKey: StationKey, wave: Wave): IntervalKey[] {
  const prepared = useResults.getState().prepared;
  if (!prepared) return [];
  return prepared.pairs
    .filter((p) => p.wave === wave && (p.a.key === stationKey || p.b.key === stationKey))
    .map((p) => p.key);
}

/** The edit action of the core (snapping, the edited method chosen for the station's intervals). */
function withPick(
  edits: UserEdits,
  stationKey: StationKey,
  wave: Wave,
  method: EditablePickMethod,
  timeS: number,
  snap: boolean,
): UserEdits {
  const prepared = useResults.getState().prepared;
  const station = prepared?.stations.find((s) => s.key === stationKey && s.wave === wave) ?? { key: stationKey, wave };
  return applyPickEdit(edits, prepared?.pairs ?? [], station, method, timeS, snap);
}

export const PICK_NOTICE = 'Interval now uses your picks: the profile follows this edit (undo with z).';

/** Sets a hand pick (one undo step). */
export function setPick(
  stationKey: StationKey,
  wave: Wave,
  method: EditablePickMethod,
  timeS: number,
  snap = false,
): void {
  commit((s) => ({ edits: withPick(s.edits, stationKey, wave, method, timeS, snap) }), PICK_NOTICE);
}

/** Starts a drag: one undo step now, later moves amend it. */
export function beginPickDrag(
  stationKey: StationKey,
  wave: Wave,
  method: EditablePickMethod,
  timeS: number,
  snap: boolean,
): void {
  setPick(stationKey, wave, method, timeS, snap);
}

export function movePickDrag(
  stationKey: StationKey,
  wave: Wave,
  method: EditablePickMethod,
  timeS: number,
  snap: boolean,
): void {
  amend((s) => ({ edits: withPick(s.edits, stationKey, wave, method, timeS, snap) }));
}

/** Removes the hand pick of a method (back to the automatic one). */
export function clearPick(stationKey: StationKey, wave: Wave, method: EditablePickMethod): void {
  const key = pickEditKey(stationKey, wave, method);
  if (!(key in useApp.getState().edits.picks)) return;
  commit((s) => {
    const picks = { ...s.edits.picks };
    delete picks[key];
    return { edits: { ...s.edits, picks } };
  }, 'Back to the automatic pick.');
}

/** Excludes the station (all its picks and intervals), or restores it. */
export function toggleStationExcluded(stationKey: StationKey, wave: Wave): void {
  const k = stationWaveKey(stationKey, wave);
  const was = useApp.getState().edits.excludedStations.includes(k);
  commit(
    (s) => ({
      edits: {
        ...s.edits,
        excludedStations: was ? s.edits.excludedStations.filter((x) => x !== k) : [...s.edits.excludedStations, k],
      },
    }),
    was ? 'Station restored.' : 'Station excluded: its picks and intervals no longer count.',
  );
}

/** Method for one interval (null = follow the profile method). */
export function setIntervalMethod(intervalKey: IntervalKey, method: IntervalMethod | null): void {
  commit((s) => {
    const chosen = { ...s.edits.chosenMethod };
    if (method === null) delete chosen[intervalKey];
    else chosen[intervalKey] = method;
    return { edits: { ...s.edits, chosenMethod: chosen } };
  });
}

export function toggleIntervalExcluded(intervalKey: IntervalKey): void {
  commit((s) => {
    const ex = s.edits.excludedIntervals;
    return {
      edits: {
        ...s.edits,
        excludedIntervals: ex.includes(intervalKey) ? ex.filter((x) => x !== intervalKey) : [...ex, intervalKey],
      },
    };
  });
}

export function updateSettings(patch: SettingsPatch): void {
  commit((s) => ({ settings: patchSettings(s.settings, patch) }));
}

/**
 * The layered model's boundaries set by the user (one undo step, saved with the project); null = back
 * to the boundaries chosen from the travel times (the user's list is kept for the Geometry pane's menu).
 */
export function setLayerBoundaries(boundariesM: number[] | null): void {
  updateSettings({ layering: boundariesM === null ? { mode: 'auto' } : { mode: 'user', boundariesM } });
}

export function updateSurvey(change: (s: Snapshot['survey']) => Snapshot['survey']): void {
  commit((s) => ({ survey: change(s.survey) }));
}

/**
 * Reads a comparison profile (depth and Vs, or depth and Rayleigh-wave velocity converted with the
 * core's Viktorov approximation) and overlays it (one undo step). On a problem nothing changes and the
 * error is returned in plain words.
 */
export function loadComparison(
  text: string,
  fileName: string,
  kind: 'vs' | 'rayleigh',
  poissonRatio: number,
): ErrorInfo | null {
  let profile: ComparisonProfile;
  try {
    profile = parseComparisonCsv(text, fileName, { kind, poissonRatio });
  } catch (e) {
    return toErrorInfo(e, fileName);
  }
  commit(() => ({ comparison: profile }));
  return null;
}

export function removeComparison(): void {
  commit(() => ({ comparison: null }));
}
