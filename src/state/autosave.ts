/**
 * Autosave to IndexedDB (idb-keyval): the session (survey, settings, edits, comparison, view choices)
 * within a second of every change. On start the page offers to restore the last session; "start fresh"
 * deletes it.
 *
 * Atomic by construction: file bytes are stored under content-addressed keys ('file:<SHA-256>'), written
 * (each in its own transaction) before the session record that names them; the session is one key
 * written in one transaction. A page that dies at any moment leaves either the previous session or the
 * new one, each with every file it names. Files no session names any more are deleted afterwards.
 */
import { create } from 'zustand';
import { createStore, del, delMany, get, getMany, keys, set, type UseStore } from 'idb-keyval';
import type { ErrorInfo } from '../core';
import { toProjectJson, writeZip, type ProjectJson } from '../core';
import type { UnitSystem } from '../core';
import type { NamedBytes } from '../worker/protocol';
import { currentProject, openArchiveBytes } from './files';
import { afterDelayWhenIdle } from './idle';
import { useApp } from './store';

const SESSION_KEY = 'session';
/** Older sessions kept every file's bytes under one key (read on restore, deleted with the session). */
const LEGACY_FILES_KEY = 'files';
const FILE_PREFIX = 'file:';
const DEBOUNCE_MS = 700;

export interface SavedSession {
  savedAt: string;
  /** project.json as saved (version 2; sessions of older versions hold version 1). */
  doc: ProjectJson;
  namePattern: string;
  unitSystem: UnitSystem;
  fileCount: number;
  /** File name -> content key of its bytes (absent in older sessions). */
  fileRefs?: { name: string; key: string }[];
}

export interface AutosaveState {
  status: 'waiting' | 'saving' | 'saved' | 'off' | 'failed';
  savedAt: string | null;
  /** Store revision captured by the last completed save. */
  savedRevision: number | null;
  error: string | null;
  /** A session found at start-up, until the user restores it or starts fresh. */
  offer: SavedSession | null;
}

export const useAutosave = create<AutosaveState>(() => ({
  status: 'waiting',
  savedAt: null,
  savedRevision: null,
  error: null,
  offer: null,
}));

let db: UseStore | null = null;
function store(): UseStore {
  if (!db) db = createStore('borewave', 'autosave');
  return db;
}

/** Cancels the pending save (null when none is pending). */
let timer: (() => void) | null = null;
let enabled = false;
let saving: Promise<void> | null = null;
/** Content key per byte array (arrays are never changed in place once loaded). */
const keyOf = new WeakMap<Uint8Array, string>();
/** Content keys known to be stored. */
const stored = new Set<string>();

function hex(buf: ArrayBuffer): string {
  return [...new Uint8Array(buf)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/** FNV-1a, two 32-bit lanes, plus the length: only where Web Crypto is missing. */
function fallbackHash(bytes: Uint8Array): string {
  let a = 0x811c9dc5;
  let b = 0x01000193 ^ bytes.length;
  for (let i = 0; i < bytes.length; i++) {
    a = Math.imul(a ^ bytes[i], 0x01000193) >>> 0;
    b = Math.imul(b ^ bytes[bytes.length - 1 - i], 0x01000193) >>> 0;
  }
  return `fnv${a.toString(16)}${b.toString(16)}-${bytes.length}`;
}

async function contentKey(bytes: Uint8Array): Promise<string> {
  const known = keyOf.get(bytes);
  if (known) return known;
  const subtle = globalThis.crypto?.subtle;
  const key = FILE_PREFIX + (subtle ? hex(await subtle.digest('SHA-256', bytes as BufferSource)) : fallbackHash(bytes));
  keyOf.set(bytes, key);
  return key;
}

async function saveNow(): Promise<void> {
  timer = null;
  const s = useApp.getState();
  const revision = s.revision;
  const { doc, files } = currentProject();
  useAutosave.setState({ status: 'saving' });
  try {
    // 1. Bytes first, each under its content key (skipped when already stored).
    const fileRefs: { name: string; key: string }[] = [];
    for (const f of files) {
      const key = await contentKey(f.bytes);
      if (!stored.has(key)) {
        await set(key, f.bytes, store());
        stored.add(key);
      }
      fileRefs.push({ name: f.name, key });
    }
    // 2. The session, one key in one transaction, naming only bytes already written.
    const session: SavedSession = {
      savedAt: doc.savedAt,
      doc: toProjectJson(doc),
      namePattern: s.namePattern,
      unitSystem: s.unitSystem,
      fileCount: files.length,
      fileRefs,
    };
    await set(SESSION_KEY, session, store());
    useAutosave.setState({ status: 'saved', savedAt: doc.savedAt, savedRevision: revision, error: null });
    // 3. Bytes no session names any more.
    const used = new Set(fileRefs.map((r) => r.key));
    const all = await keys<IDBValidKey>(store());
    const stale = all.filter(
      (k): k is string =>
        typeof k === 'string' && (k.startsWith(FILE_PREFIX) || k === LEGACY_FILES_KEY) && !used.has(k),
    );
    if (stale.length) {
      await delMany(stale, store());
      for (const k of stale) stored.delete(k);
    }
  } catch (e) {
    useAutosave.setState({ status: 'failed', error: (e as Error).message ?? String(e) });
  }
}

/** Cancels the pending save; true when there was one. */
function cancelPending(): boolean {
  const t = timer;
  timer = null;
  t?.();
  return t !== null;
}

/** A save DEBOUNCE_MS after the last change, once the page is idle (never in the middle of drawing results). */
function schedule(): void {
  if (!enabled) return;
  cancelPending();
  timer = afterDelayWhenIdle(() => {
    // One save at a time: a change during a save is saved right after it.
    const run = async () => {
      if (saving) await saving;
      saving = saveNow();
      await saving;
      saving = null;
    };
    void run();
  }, DEBOUNCE_MS);
}

/**
 * Saves now if a save is pending or running (or the last save is older than the store), and resolves
 * when the browser's storage holds the latest state. Does nothing while autosave is off (a restore
 * question is pending): the caller says so to the user.
 */
export async function flushAutosave(): Promise<void> {
  if (!enabled) return;
  const pending = cancelPending();
  if (saving) await saving;
  // A save scheduled meanwhile (during the awaited save) is done now too.
  if (cancelPending() || pending || useAutosave.getState().savedRevision !== useApp.getState().revision) {
    saving = saveNow();
    await saving;
    saving = null;
  }
}

/** Starts watching the store (after the restore question is settled). */
export function enableAutosave(): void {
  if (enabled) return;
  enabled = true;
  let prev = useApp.getState();
  useApp.subscribe((s) => {
    if (s.revision !== prev.revision || s.filesRevision !== prev.filesRevision || s.unitSystem !== prev.unitSystem)
      schedule();
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
    useAutosave.setState({
      status: 'off',
      error: `Autosave is not available in this browser: ${(e as Error).message}`,
    });
    return;
  }
  if (session && (session.fileCount > 0 || (session.doc.survey?.records?.length ?? 0) > 0))
    useAutosave.setState({ offer: session });
  else enableAutosave();
}

/** Restores the offered session: files are read again in the worker, then applied like an archive. */
export async function restoreSession(): Promise<ErrorInfo | null> {
  const offer = useAutosave.getState().offer;
  if (!offer) return null;
  let files: NamedBytes[] = [];
  try {
    if (offer.fileRefs) {
      const bytes = await getMany<Uint8Array>(
        offer.fileRefs.map((r) => r.key),
        store(),
      );
      offer.fileRefs.forEach((r, i) => {
        const b = bytes[i];
        if (!b) return;
        files.push({ name: r.name, bytes: b });
        keyOf.set(b, r.key);
        stored.add(r.key);
      });
    } else {
      files = (await get<NamedBytes[]>(LEGACY_FILES_KEY, store())) ?? [];
    }
  } catch (e) {
    return { code: 'AUTOSAVE_READ', message: `The saved files could not be read: ${(e as Error).message}` };
  }
  // The session opens exactly like a project archive (the one opener: migration, schema, placement).
  const json = new TextEncoder().encode(JSON.stringify(offer.doc));
  const zip = writeZip(
    [{ path: 'project.json', bytes: json }, ...files.map((f) => ({ path: f.name, bytes: f.bytes }))],
    offer.savedAt,
  );
  const problem = await openArchiveBytes('the saved session', zip, {
    namePattern: offer.namePattern,
    unitSystem: offer.unitSystem,
  });
  if (problem) return problem;
  useAutosave.setState({ offer: null });
  enableAutosave();
  return null;
}

/** Deletes the saved session and starts autosaving the new one. */
export async function discardSavedSession(): Promise<void> {
  try {
    await del(SESSION_KEY, store());
    const all = await keys<IDBValidKey>(store());
    await delMany(
      all.filter((k) => typeof k === 'string' && (k.startsWith(FILE_PREFIX) || k === LEGACY_FILES_KEY)),
      store(),
    );
  } catch {
    // Nothing saved or storage unavailable: either way there is nothing to restore.
  }
  stored.clear();
  useAutosave.setState({ offer: null });
  enableAutosave();
}
