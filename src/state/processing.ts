/**
 * Keeps the worker results (working traces, automatic picks) in step with the survey and the
 * processing settings: when their key changes, the running job is cancelled and a new one starts after
 * a short pause. Soil layers, the profile method and other derive-only inputs do not re-run it.
 */
import type { Survey } from '../core';
import type { ErrorCode } from '../core';
import { WORKER_SETTING_GROUPS, type Settings } from '../core';
import type { Prepared } from '../core';
import type { AutoPickResult } from '../core';
import { processLane } from '../worker/client';
import { rawRecords } from './raw';
import { useApp, useResults } from './store';

/** Settings that change the working traces or the automatic picks: the groups prepare() and autoPick() read. */
function processingSettings(s: Settings): unknown {
  return WORKER_SETTING_GROUPS.map((g) => s[g]);
}

export function processingKey(
  survey: Survey,
  settings: Settings,
  loadedIds: string[],
  azimuthDeg: Record<string, number> = {},
): string {
  const { soil: _soil, name: _name, ...geometry } = survey;
  return JSON.stringify([geometry, processingSettings(settings), loadedIds, azimuthDeg]);
}

let timer: ReturnType<typeof setTimeout> | null = null;
/** Key of the job now running (null when none). */
let runningKey: string | null = null;

/** Starts prepare + auto-pick now (cancelling any run in progress). */
export async function runProcessing(): Promise<void> {
  if (timer) clearTimeout(timer);
  timer = null;
  const { survey, settings, edits } = useApp.getState();
  const azimuthDeg = edits.azimuthDeg ?? {};
  const ids = [...rawRecords.keys()].sort();
  const key = processingKey(survey, settings, ids, azimuthDeg);
  processLane.cancel();
  const placed = survey.records.filter((r) => rawRecords.has(r.recordId) && !r.excluded);
  if (!placed.length) {
    useResults.setState({ prepared: null, auto: null, key, status: { state: 'idle', stage: '', done: 0, total: 0 } });
    return;
  }
  const records = placed.map((r) => rawRecords.get(r.recordId)!);
  const t0 = performance.now();
  runningKey = key;
  useResults.setState({ status: { state: 'running', stage: 'prepare', done: 0, total: 1 } });
  let result: { prepared: Prepared; auto: AutoPickResult } | null = null;
  try {
    await processLane.run({ type: 'process', survey, records, settings, azimuthDeg }, (m) => {
      if (m.type === 'progress')
        useResults.setState({ status: { state: 'running', stage: m.stage, done: m.done, total: m.total } });
      if (m.type === 'processed') {
        result = { prepared: m.prepared, auto: m.auto };
        return true;
      }
      return false;
    });
  } catch (e) {
    const err = e as { code?: ErrorCode; message?: string };
    if (err.code === 'CANCELLED') return;
    runningKey = null;
    useResults.setState({
      status: {
        state: 'failed',
        stage: '',
        done: 0,
        total: 0,
        error: { code: err.code ?? 'INTERNAL', message: err.message ?? String(e) },
      },
    });
    return;
  }
  runningKey = null;
  if (result) {
    const r = result as { prepared: Prepared; auto: AutoPickResult };
    useResults.setState({
      prepared: r.prepared,
      auto: r.auto,
      key,
      status: { state: 'done', stage: '', done: 1, total: 1, elapsedMs: performance.now() - t0 },
    });
  }
}

export function cancelProcessing(): void {
  if (timer) clearTimeout(timer);
  timer = null;
  processLane.cancel();
  runningKey = null;
  useResults.setState((s) => ({ status: { ...s.status, state: 'cancelled' } }));
}

/** Re-runs processing after `delayMs` when its inputs changed since the last run. */
export function scheduleProcessing(delayMs = 400): void {
  const { survey, settings, edits } = useApp.getState();
  const key = processingKey(survey, settings, [...rawRecords.keys()].sort(), edits.azimuthDeg ?? {});
  const res = useResults.getState();
  if (key === runningKey || (key === res.key && res.status.state === 'done')) return;
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => void runProcessing(), delayMs);
}

/** Watches the store; call once at start-up. */
export function watchProcessing(): () => void {
  let prev = useApp.getState();
  return useApp.subscribe((s) => {
    if (
      s.survey !== prev.survey ||
      s.settings !== prev.settings ||
      s.filesRevision !== prev.filesRevision ||
      s.edits.azimuthDeg !== prev.edits.azimuthDeg
    )
      scheduleProcessing();
    prev = s;
  });
}
