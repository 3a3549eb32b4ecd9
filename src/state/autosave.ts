/**
 * Autosave to IndexedDB (idb-keyval): the session (survey, settings, edits, view choices) within a
 * second of every change, and the loaded files' bytes whenever the file set changes. On start the
 * page offers to restore the last session; "start fresh" deletes it.
 */
import { create } from 'zustand';
import { createStore, del, get, set, type UseStore } from 'idb-keyval';
import type { ErrorInfo } from '../core/errors';
import type { ProjectDocument } from '../core/io/archive';
import type { UnitSystem } from '../core/units';
import type { NamedBytes } from '../worker/protocol';
import { ioLane } from '../worker/client';
import { applyProject, currentProject } from './files';
import { useApp } from './store';
import type { ParsedFile } from '../worker/protocol';

const SESSION_KEY = 'session';
const FILES_KEY = 'files';
const DEBOUNCE_MS = 700;

export interface SavedSession {
  savedAt: string;
  doc: ProjectDocument;
  namePattern: string;
  unitSystem: UnitSystem;
  fileCount: number;
}

export interface AutosaveState {
  status: 'waiting' | 'saving' | 'saved' | 'off' | 'failed';
  savedAt: string | null;
  error: string | null;
  /** A session found at start-up, until the user restores it or starts fresh. */
  offer: SavedSession | null;
}

export const useAutosave = create<AutosaveState>(() => ({ status: 'waiting', savedAt: null, error: null, offer: null }));

let db: UseStore | null = null;
function store(): UseStore {
  if (!db) db = createStore('borewave', 'autosave');
  return db;
}

let timer: ReturnType<typeof setTimeout> | null = null;
let savedFilesRevision = -1;
let enabled = false;

async function saveNow(): Promise<void> {
  timer = null;
  const s = useApp.getState();
  const { doc, files } = currentProject();
  useAutosave.setState({ status: 'saving' });
  try {
    if (s.filesRevision !== savedFilesRevision) {
      await set(FILES_KEY, files, store());
      savedFilesRevision = s.filesRevision;
    }
    const session: SavedSession = { savedAt: doc.savedAt, doc, namePattern: s.namePattern, unitSystem: s.unitSystem, fileCount: files.length };
    await set(SESSION_KEY, session, store());
    useAutosave.setState({ status: 'saved', savedAt: doc.savedAt, error: null });
  } catch (e) {
    useAutosave.setState({ status: 'failed', error: (e as Error).message ?? String(e) });
  }
}

function schedule(): void {
  if (!enabled) return;
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => void saveNow(), DEBOUNCE_MS);
}

/** Starts watching the store (after the restore question is settled). */
export function enableAutosave(): void {
  if (enabled) return;
  enabled = true;
  let prev = useApp.getState();
  useApp.subscribe((s) => {
    if (s.revision !== prev.revision || s.filesRevision !== prev.filesRevision || s.unitSystem !== prev.unitSystem) schedule();
    prev = s;
  });
  useAutosave.setState({ status: 'saved' });
  schedule();
}

/** Looks for a saved session; when there is one the page asks before autosave overwrites it. */
export async function checkForSavedSession(): Promise<void> {
  let session: SavedSession | undefined;
  try {
    session = await get<SavedSession>(SESSION_KEY, store());
  } catch (e) {
    useAutosave.setState({ status: 'off', error: `Autosave is not available in this browser: ${(e as Error).message}` });
    return;
  }
  if (session && (session.fileCount > 0 || session.doc.survey.records.length > 0)) useAutosave.setState({ offer: session });
  else enableAutosave();
}

/** Restores the offered session: files are read again in the worker, then applied like an archive. */
export async function restoreSession(): Promise<ErrorInfo | null> {
  const offer = useAutosave.getState().offer;
  if (!offer) return null;
  let files: NamedBytes[] = [];
  try {
    files = (await get<NamedBytes[]>(FILES_KEY, store())) ?? [];
  } catch (e) {
    return { code: 'AUTOSAVE_READ', message: `The saved files could not be read: ${(e as Error).message}` };
  }
  const deviationNames = new Set(Object.values(offer.doc.deviationFiles ?? {}));
  const waves = files.filter((f) => !deviationNames.has(f.name));
  const parsed: ParsedFile[] = [];
  useApp.setState({ loadProgress: { done: 0, total: waves.length } });
  try {
    await ioLane.run({ type: 'parse', files: waves.map((f) => ({ name: f.name, bytes: f.bytes.slice() })) }, (m) => {
      if (m.type === 'parsed-file') parsed.push(m.file);
      if (m.type === 'progress') useApp.setState({ loadProgress: { done: m.done, total: m.total } });
      return m.type === 'parsed';
    });
  } catch (e) {
    useApp.setState({ loadProgress: null });
    return e as ErrorInfo;
  }
  const present = new Set(files.map((f) => f.name));
  applyProject(offer.doc, { files, parsed, missing: offer.doc.files.filter((n) => !present.has(n)) }, 'the saved session', {
    namePattern: offer.namePattern,
    unitSystem: offer.unitSystem,
  });
  useAutosave.setState({ offer: null });
  enableAutosave();
  return null;
}

/** Deletes the saved session and starts autosaving the new one. */
export async function discardSavedSession(): Promise<void> {
  try {
    await del(SESSION_KEY, store());
    await del(FILES_KEY, store());
  } catch {
    // Nothing saved or storage unavailable: either way there is nothing to restore.
  }
  savedFilesRevision = -1;
  useAutosave.setState({ offer: null });
  enableAutosave();
}
