/**
 * Loading and removing files, opening and saving project archives, the demo survey. Parsing happens in
 * the worker; a file that fails shows its error while every good file stays loaded.
 */
import type { ErrorInfo } from '../core';
import type { RecordAssignment, TestKind, WaveRecord } from '../core';
import { looksLikeRecordLog, readRecordLog } from '../core';
import { placeForSurvey } from '../core';
import type { Survey } from '../core';
import { decodeUtf8 } from '../core';
import { toErrorInfo } from '../core';
import { PROJECT_FORMAT, PROJECT_VERSION, writeProjectArchive, type ProjectDocument } from '../core';
import { uniqueRecordIds } from '../core';
import { textLayout } from '../core';
import { readDeviationTable } from '../core';
import { defaultSettings, emptyEdits } from '../core';
import { ioLane } from '../worker/client';
import { blankSurvey } from '../core';
import type { NamedBytes, OpenedArchive, ParsedFile } from '../worker/protocol';
import { clearRaw, rawFiles, rawRecords } from './raw';
import {
  initialView,
  pushMessage,
  replaceWithoutHistory,
  commit,
  useApp,
  useResults,
  type RecordMeta,
  type ViewState,
} from './store';
import { runProcessing } from './processing';

const ZIP_NAME = /\.zip$/i;

/** A new session starts with a fresh selection but keeps how the user likes to look at traces. */
function keepViewPrefs(v: ViewState): ViewState {
  const { recordsOpen, fill, normalise, gain, hitView, tool, snap, renderer, agcMs, clip, showVp } = v;
  const d = initialView();
  return {
    ...d,
    recordsOpen,
    fill,
    normalise,
    gain,
    hitView,
    tool,
    snap,
    renderer,
    agcMs: agcMs ?? d.agcMs,
    clip: clip ?? d.clip,
    showVp: showVp ?? d.showVp,
  };
}

/** "time column Time (us), unit us; sample interval from time column" for text files. */
function layoutText(r: WaveRecord): string | undefined {
  const l = textLayout(r);
  if (!l) return undefined;
  const time = l.timeColumn === null ? 'no time column' : `time "${l.timeColumn}" in ${l.timeUnit}`;
  const pre = l.preambleLines ? `; ${l.preambleLines} preamble line(s) skipped` : '';
  return `${time}; sample interval from ${l.sampleIntervalSource}${pre}`;
}

function metaFor(name: string, sizeBytes: number, p: ParsedFile | null, originalName?: string): RecordMeta {
  const orig = originalName && originalName !== name ? { originalName } : {};
  if (!p) return { id: name, fileName: name, sizeBytes, status: 'reading', ...orig };
  if (!p.outcome.ok) return { id: name, fileName: name, sizeBytes, status: 'error', error: p.outcome.error, ...orig };
  const r = p.outcome.record;
  const t = r.traces[0];
  return {
    id: name,
    fileName: name,
    sizeBytes,
    status: 'ok',
    traces: r.traces.length,
    samples: t?.samples.length ?? 0,
    sampleIntervalS: t?.sampleIntervalS,
    format: r.format === 'seg2' ? `SEG-2${r.formatCode ? ` (format ${r.formatCode})` : ''}` : 'text',
    ...(r.warnings?.length ? { warnings: r.warnings } : {}),
    ...(layoutText(r) ? { layout: layoutText(r) } : {}),
    ...orig,
  };
}

function upsertMeta(list: RecordMeta[], m: RecordMeta): RecordMeta[] {
  const i = list.findIndex((x) => x.fileName === m.fileName);
  if (i < 0) return [...list, m];
  const out = [...list];
  out[i] = m;
  return out;
}

/** File name without folders: what a file-name pattern is matched against. */
function baseName(path: string): string {
  return path.slice(path.lastIndexOf('/') + 1);
}

/**
 * Stores a read file under its session name (unique: same-name files never replace each other); the
 * record id is that name, the record's fileName the instrument's own name (for name patterns).
 */
function storeParsed(p: ParsedFile, bytes: Uint8Array, originalName?: string): WaveRecord | null {
  rawFiles.set(p.name, bytes);
  if (!p.outcome.ok) return null;
  const rec = { ...p.outcome.record, id: p.name, fileName: originalName ?? baseName(p.name) };
  rawRecords.set(rec.id, rec);
  return rec;
}

/** Placement by the core set-up (user > record log > file name > header > data > default), report kept for the panes. */
function place(survey: Survey, recs: WaveRecord[], namePattern?: string): RecordAssignment[] {
  const st = useApp.getState();
  const { assignments, setup } = placeForSurvey(survey, recs, {
    fileNamePattern: namePattern ?? st.namePattern,
    maxHeaderDepthM: st.settings.placement.maxHeaderDepthM,
    log: st.recordLog,
  });
  useApp.setState({
    setupReport: { inferences: setup.inferences, rejected: setup.rejected, problems: setup.problems },
  });
  return assignments;
}

/** Places newly read records in the survey (every loaded record is placed again so the report covers them all; user values are kept). */
function placeNew(newRecords: WaveRecord[]): void {
  if (!newRecords.length) return;
  replaceWithoutHistory((s) => {
    const ids = new Set(newRecords.map((r) => r.id));
    const kept = s.survey.records.filter((r) => !ids.has(r.recordId));
    const keptRecs = kept.map((r) => rawRecords.get(r.recordId)).filter((r): r is WaveRecord => !!r);
    const placed = place(s.survey, [...keptRecs, ...newRecords]);
    const byId = new Map(placed.map((a) => [a.recordId, a]));
    const order = [
      ...kept.map((r) => byId.get(r.recordId) ?? r),
      ...newRecords.map((r) => byId.get(r.id)).filter((a): a is RecordAssignment => a !== undefined),
    ];
    return { survey: { ...s.survey, records: order } };
  });
}

/**
 * Session names for newly dropped files: a file keeps its name unless that name is taken (loaded
 * already, or twice in this drop); then the folder it was dropped in, else an order suffix. A renamed
 * file is announced, never a silent replacement.
 */
function sessionNames(files: NamedBytes[]): (NamedBytes & { originalName?: string })[] {
  const taken = useApp.getState().records.map((r) => r.fileName);
  const ids = uniqueRecordIds(
    files.map((f) => ({ name: f.name, folder: f.folder ?? '' })),
    taken,
  );
  return files.map((f, i) => (ids[i] === f.name ? f : { ...f, name: ids[i], originalName: f.name }));
}

/** A record log (CSV with file and depth columns): kept, and every loaded record placed again with it. */
export function loadRecordLog(name: string, text: string): ErrorInfo | null {
  try {
    const log = readRecordLog(text, name);
    useApp.setState({ recordLog: log });
    reassignAll();
    return null;
  } catch (e) {
    const info = toErrorInfo(e, name);
    pushMessage(info);
    return info;
  }
}

/** Reads waveform files in the worker, showing progress; zip files are opened as project archives. */
export async function loadFiles(files: NamedBytes[]): Promise<void> {
  const zips = files.filter((f) => ZIP_NAME.test(f.name));
  const isLog = (f: NamedBytes) =>
    /\.(csv|txt|tsv)$/i.test(f.name) && looksLikeRecordLog(decodeUtf8(f.bytes.subarray(0, 4096)));
  const logs = files.filter((f) => !ZIP_NAME.test(f.name) && isLog(f));
  const incoming = files.filter((f) => !ZIP_NAME.test(f.name) && !isLog(f));
  for (const z of zips) await openArchiveBytes(z.name, z.bytes);
  if (incoming.length) {
    const waves = sessionNames(incoming);
    const renamed = waves.filter((f) => f.originalName);
    if (renamed.length) {
      pushMessage({
        code: 'FILE_SAME_NAME',
        message: `${renamed.length} file(s) share a name with another file and are kept under a distinct name: ${renamed
          .slice(0, 5)
          .map((f) => `${f.originalName} as ${f.name}`)
          .join(', ')}${renamed.length > 5 ? ' …' : ''}.`,
      });
    }
    await parseFiles(waves);
  }
  // A record log dropped with the files places them once they are read.
  for (const l of logs) loadRecordLog(l.name, decodeUtf8(l.bytes));
}

/** Parses files in the worker and stores them (new files, or text files re-read with a sample interval). */
async function parseFiles(waves: (NamedBytes & { originalName?: string })[]): Promise<void> {
  const byName = new Map(waves.map((f) => [f.name, f]));
  useApp.setState((s) => ({
    records: waves.reduce((l, f) => upsertMeta(l, metaFor(f.name, f.bytes.length, null, f.originalName)), s.records),
    loadProgress: { done: 0, total: waves.length },
  }));
  const fresh: WaveRecord[] = [];
  const needInterval: string[] = [];
  // The list and the progress follow the worker once per frame (not once per file: 60 files would
  // re-render the Records pane 60 times while the survey is still to be processed).
  let metas: RecordMeta[] = [];
  let progress: { done: number; total: number } | null = null;
  let frame = 0;
  const flush = () => {
    cancelAnimationFrame(frame);
    frame = 0;
    if (!metas.length && !progress) return;
    const batch = metas;
    const p = progress;
    metas = [];
    progress = null;
    useApp.setState((s) => ({
      records: batch.reduce(upsertMeta, s.records),
      ...(p ? { loadProgress: p } : {}),
    }));
  };
  const later = () => {
    if (!frame) frame = requestAnimationFrame(flush);
  };
  try {
    // The page keeps the bytes (archive, autosave); the worker reads a copy moved to it.
    const copies = waves.map((f) => ({
      name: f.name,
      bytes: f.bytes.slice(),
      ...(f.sampleIntervalS !== undefined ? { sampleIntervalS: f.sampleIntervalS } : {}),
    }));
    await ioLane.run(
      { type: 'parse', files: copies },
      (m) => {
        if (m.type === 'parsed-file') {
          const f = byName.get(m.file.name)!;
          const rec = storeParsed(m.file, f.bytes, f.originalName);
          if (rec) fresh.push(rec);
          else rawRecords.delete(m.file.name);
          if (!m.file.outcome.ok && m.file.outcome.error.code === 'TEXT_NO_SAMPLE_INTERVAL') needInterval.push(f.name);
          metas.push(metaFor(m.file.name, f.bytes.length, m.file, f.originalName));
          later();
        }
        if (m.type === 'progress') {
          progress = { done: m.done, total: m.total };
          later();
        }
        if (m.type === 'parsed') flush();
        return m.type === 'parsed';
      },
      copies.map((f) => f.bytes.buffer as ArrayBuffer),
    );
  } catch (e) {
    flush();
    failStillReading(e as ErrorInfo);
  }
  useApp.setState((s) => ({
    loadProgress: null,
    filesRevision: s.filesRevision + 1,
    // One question for the whole group of files that need a sample interval.
    intervalRequest: [...s.intervalRequest.filter((n) => !byName.has(n)), ...needInterval],
  }));
  placeNew(fresh);
  // New records: process now rather than after the pause that batches edits.
  if (fresh.length) void runProcessing();
}

/**
 * The user's answer for a group of text files without a time column: they are read again with this
 * sample interval, which is kept per file (saved in the project as files[].sampleIntervalS).
 */
export async function applySampleInterval(names: string[], sampleIntervalS: number): Promise<void> {
  const files = names
    .map((name) => {
      const bytes = rawFiles.get(name);
      const meta = useApp.getState().records.find((r) => r.fileName === name);
      return bytes ? { name, bytes, sampleIntervalS, originalName: meta?.originalName } : null;
    })
    .filter((f): f is NonNullable<typeof f> => f !== null);
  useApp.setState((s) => ({
    fileSampleIntervals: { ...s.fileSampleIntervals, ...Object.fromEntries(names.map((n) => [n, sampleIntervalS])) },
    intervalRequest: s.intervalRequest.filter((n) => !names.includes(n)),
  }));
  await parseFiles(files);
}

function failStillReading(err: ErrorInfo): void {
  useApp.setState((s) => ({
    records: s.records.map((r) =>
      r.status === 'reading' ? { ...r, status: 'error', error: { ...err, file: r.fileName } } : r,
    ),
  }));
}

export function removeFile(fileName: string): void {
  const meta = useApp.getState().records.find((r) => r.fileName === fileName);
  rawFiles.delete(fileName);
  if (meta) rawRecords.delete(meta.id);
  useApp.setState((s) => {
    const { [fileName]: _, ...intervals } = s.fileSampleIntervals;
    return {
      records: s.records.filter((r) => r.fileName !== fileName),
      intervalRequest: s.intervalRequest.filter((n) => n !== fileName),
      fileSampleIntervals: intervals,
      filesRevision: s.filesRevision + 1,
    };
  });
  if (meta)
    replaceWithoutHistory((s) => ({
      survey: { ...s.survey, records: s.survey.records.filter((r) => r.recordId !== meta.id) },
    }));
}

/** Replaces the whole session with a project document and its files (archive, demo, restore). */
export function applyProject(
  doc: ProjectDocument,
  opened: Pick<OpenedArchive, 'files' | 'parsed' | 'missing' | 'issues'>,
  archiveName: string,
  extra: { namePattern?: string; unitSystem?: 'SI' | 'US' } = {},
): void {
  clearRaw();
  const metas: RecordMeta[] = [];
  const bytesByName = new Map(opened.files.map((f) => [f.name, f.bytes]));
  for (const f of opened.files) rawFiles.set(f.name, f.bytes);
  for (const p of opened.parsed) {
    storeParsed(p, bytesByName.get(p.name) ?? new Uint8Array());
    metas.push(metaFor(p.name, bytesByName.get(p.name)?.length ?? 0, p));
  }
  for (const name of opened.missing) {
    metas.push({
      id: name,
      fileName: name,
      sizeBytes: 0,
      status: 'error',
      error: {
        code: 'PROJECT_FILE_MISSING',
        message: `${name} is listed in project.json but is not in ${archiveName}.`,
        file: name,
      },
    });
  }
  for (const issue of opened.issues ?? []) if (issue.code === 'ARCHIVE_FILE_UNLISTED') pushMessage(issue);
  // Records in the survey keep their ids; any record the archive added with a new name is placed too.
  const placed = new Set(doc.survey.records.map((r) => r.recordId));
  const unplaced = [...rawRecords.values()].filter((r) => !placed.has(r.id));
  const s = useApp.getState();
  const added: RecordAssignment[] = unplaced.length
    ? place({ ...doc.survey, records: [] }, unplaced, extra.namePattern ?? s.namePattern)
    : [];
  useResults.setState({
    prepared: null,
    auto: null,
    key: null,
    status: { state: 'idle', stage: '', done: 0, total: 0 },
  });
  useApp.setState((st) => ({
    survey: { ...doc.survey, records: [...doc.survey.records, ...added] },
    settings: doc.settings,
    edits: doc.edits,
    comparison: doc.comparison ?? null,
    past: [],
    future: [],
    records: metas,
    deviationFiles: { ...(doc.deviationFiles ?? {}) },
    intervalRequest: opened.parsed
      .filter((p) => !p.outcome.ok && p.outcome.error.code === 'TEXT_NO_SAMPLE_INTERVAL')
      .map((p) => p.name),
    fileSampleIntervals: { ...(doc.sampleIntervalsS ?? {}) },
    namePattern: extra.namePattern ?? st.namePattern,
    unitSystem: extra.unitSystem ?? st.unitSystem,
    view: keepViewPrefs(st.view),
    revision: st.revision + 1,
    filesRevision: st.filesRevision + 1,
    loadProgress: null,
  }));
  void runProcessing();
}

export async function openArchiveBytes(
  name: string,
  bytes: Uint8Array,
  extra: { namePattern?: string; unitSystem?: 'SI' | 'US' } = {},
): Promise<ErrorInfo | null> {
  useApp.setState({ loadProgress: { done: 0, total: 1 } });
  let opened: OpenedArchive | null = null;
  try {
    const copy = bytes.slice();
    await ioLane.run(
      { type: 'open-archive', name, bytes: copy },
      (m) => {
        if (m.type === 'progress') useApp.setState({ loadProgress: { done: m.done, total: m.total } });
        if (m.type === 'archive') {
          opened = m.archive;
          return true;
        }
        return false;
      },
      [copy.buffer],
    );
  } catch (e) {
    useApp.setState({ loadProgress: null });
    const info = { ...(e as ErrorInfo), file: (e as ErrorInfo).file ?? name };
    pushMessage(info);
    return info;
  }
  const o = opened as OpenedArchive | null;
  if (o) applyProject(o.doc, o, name, extra);
  return null;
}

/** Makes the demo survey in the worker and opens it exactly like a project archive (without zipping it). */
export async function openDemo(kind: TestKind): Promise<void> {
  useApp.setState({ loadProgress: { done: 0, total: 1 } });
  let opened: OpenedArchive | null = null;
  try {
    await ioLane.run({ type: 'make-demo', kind }, (m) => {
      if (m.type === 'progress') useApp.setState({ loadProgress: { done: m.done, total: m.total } });
      if (m.type === 'archive') {
        opened = m.archive;
        return true;
      }
      return false;
    });
  } catch (e) {
    useApp.setState({ loadProgress: null });
    pushMessage(e as ErrorInfo);
    return;
  }
  const o = opened as OpenedArchive | null;
  if (o) applyProject(o.doc, o, `demo-${kind}.zip`);
}

/** The current session as a project document plus its files (archive and autosave). */
export function currentProject(): { doc: ProjectDocument; files: NamedBytes[] } {
  const s = useApp.getState();
  const files: NamedBytes[] = [];
  for (const m of s.records) {
    const b = rawFiles.get(m.fileName);
    if (b && m.status === 'ok') files.push({ name: m.fileName, bytes: b });
  }
  for (const name of Object.values(s.deviationFiles)) {
    const b = rawFiles.get(name);
    if (b && !files.some((f) => f.name === name)) files.push({ name, bytes: b });
  }
  const doc: ProjectDocument = {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: new Date().toISOString(),
    survey: s.survey,
    settings: s.settings,
    edits: s.edits,
    ...(s.comparison ? { comparison: s.comparison } : {}),
    files: files.map((f) => f.name),
    deviationFiles: { ...s.deviationFiles },
    // files[].sampleIntervalS: the user-given interval of a text file without a time column.
    sampleIntervalsS: Object.fromEntries(
      Object.entries(s.fileSampleIntervals).filter(([n]) => files.some((f) => f.name === n)),
    ),
  };
  return { doc, files };
}

export function projectArchiveBytes(): Uint8Array {
  const { doc, files } = currentProject();
  return writeProjectArchive(doc, files);
}

/** Reads a deviation table (CSV text) for one borehole; on a problem nothing changes and the error is returned. */
export function loadDeviation(holeId: string, fileName: string, text: string): ErrorInfo | null {
  let stations: ReturnType<typeof readDeviationTable>;
  try {
    stations = readDeviationTable(text, fileName);
  } catch (e) {
    const err = e as { toInfo?: () => ErrorInfo; message?: string };
    return err.toInfo ? err.toInfo() : { code: 'DEVIATION_BAD', message: err.message ?? String(e), file: fileName };
  }
  rawFiles.set(fileName, new TextEncoder().encode(text));
  useApp.setState((s) => ({
    deviationFiles: { ...s.deviationFiles, [holeId]: fileName },
    filesRevision: s.filesRevision + 1,
  }));
  commit((s) => ({
    survey: {
      ...s.survey,
      boreholes: s.survey.boreholes.map((h) => (h.id === holeId ? { ...h, deviation: stations } : h)),
    },
  }));
  return null;
}

/** Re-applies the file-name pattern (and headers) to every loaded record. */
export function reassignAll(): void {
  const s = useApp.getState();
  const recs = s.survey.records.map((r) => rawRecords.get(r.recordId)).filter((r): r is WaveRecord => !!r);
  const loose = [...rawRecords.values()].filter((r) => !s.survey.records.some((a) => a.recordId === r.id));
  commit((snap) => ({
    survey: {
      ...snap.survey,
      records: place(snap.survey, [...recs, ...loose], s.namePattern),
    },
  }));
}

/** Everything loaded and entered is dropped: a fresh, empty session. */
export function startFresh(): void {
  clearRaw();
  useResults.setState({
    prepared: null,
    auto: null,
    key: null,
    status: { state: 'idle', stage: '', done: 0, total: 0 },
  });
  useApp.setState((st) => ({
    survey: blankSurvey(st.survey.kind),
    settings: defaultSettings(),
    edits: emptyEdits(),
    comparison: null,
    view: keepViewPrefs(st.view),
    past: [],
    future: [],
    records: [],
    deviationFiles: {},
    intervalRequest: [],
    fileSampleIntervals: {},
    messages: [],
    revision: st.revision + 1,
    filesRevision: st.filesRevision + 1,
  }));
}
