/**
 * Project archive: one .zip holding project.json (format name and version, survey, settings, edits)
 * and the original waveform and deviation files unchanged. Zip handling by fflate (npm), not our own.
 * Schema: README.md, "Project archive".
 */
import { unzipSync, zipSync, strFromU8, strToU8 } from 'fflate';
import { BorewaveError } from '../errors';
import type { Survey } from '../model';
import type { ComparisonProfile } from '../stiffness/comparison';
import { defaultDesignSettings, defaultSettings, emptyEdits, type Settings, type UserEdits } from '../settings';
import { isTestKind, TEST_KINDS } from '../catalogue/testKinds';
import { migrateV1SurveyAndEdits } from './project/migrate';

export const PROJECT_FORMAT = 'borewave-project';
export const PROJECT_VERSION = 2;

export interface ProjectDocument {
  format: typeof PROJECT_FORMAT;
  version: number;
  savedAt: string;
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  /** Names of the files stored beside project.json (waveforms, deviation tables), in load order. */
  files: string[];
  /** Deviation table file per borehole id, when loaded from a file. */
  deviationFiles?: Record<string, string>;
  /** Free text the user keeps with the project. */
  notes?: string;
  /** A profile from another test to compare with (depth and Vs, already converted to SI). */
  comparison?: ComparisonProfile | null;
}

export interface ProjectFile {
  name: string;
  bytes: Uint8Array;
}

/** Limits that keep a hostile archive from exhausting memory (a zip bomb must fail cleanly). */
export const ARCHIVE_LIMITS = {
  maxEntries: 5000,
  maxEntryBytes: 256 * 1024 * 1024,
  maxTotalBytes: 1024 * 1024 * 1024,
};

export function newProjectDocument(survey: Survey, files: string[] = []): ProjectDocument {
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: new Date(0).toISOString(),
    survey,
    settings: defaultSettings(),
    edits: emptyEdits(),
    files,
  };
}

/** File names inside the archive are plain names: no folders, no parent references. */
function safeEntryName(name: string, archiveName: string): string {
  const base = name.replace(/\\/g, '/').split('/').pop() ?? '';
  if (!base || base === '.' || base === '..' || base === 'project.json') {
    throw new BorewaveError(
      'ARCHIVE_BAD_ENTRY_NAME',
      `File name "${name}" cannot be stored in a project archive.`,
      archiveName,
      name,
    );
  }
  return base;
}

export function writeProjectArchive(doc: ProjectDocument, files: ProjectFile[]): Uint8Array {
  const entries: Record<string, Uint8Array> = {};
  const names: string[] = [];
  for (const f of files) {
    const n = safeEntryName(f.name, 'project');
    if (entries[n]) throw new BorewaveError('ARCHIVE_DUPLICATE_FILE', `Two files are named "${n}".`, 'project', n);
    entries[n] = f.bytes;
    names.push(n);
  }
  const full: ProjectDocument = { ...doc, format: PROJECT_FORMAT, version: PROJECT_VERSION, files: names };
  entries['project.json'] = strToU8(JSON.stringify(full, null, 1));
  // Fixed timestamps keep the archive bytes reproducible for the same content.
  return zipSync(entries, { level: 6, mtime: new Date(1980, 0, 1) });
}

/** Checks the JSON shape far enough that later stages can rely on it; names the first bad field. */
export function validateProjectDocument(raw: unknown, archiveName: string): ProjectDocument {
  const fail = (field: string, problem: string): never => {
    throw new BorewaveError('PROJECT_BAD_FIELD', `project.json: ${field} ${problem}.`, archiveName, field);
  };
  if (typeof raw !== 'object' || raw === null) fail('(document)', 'is not a JSON object');
  let d = raw as Record<string, unknown>;
  if (d.format !== PROJECT_FORMAT) fail('format', `is "${String(d.format)}", expected "${PROJECT_FORMAT}"`);
  if (typeof d.version !== 'number' || d.version > PROJECT_VERSION)
    fail('version', `${String(d.version)} is not supported (this program reads up to ${PROJECT_VERSION})`);
  const s = d.survey as Record<string, unknown> | undefined;
  if (!s || typeof s !== 'object') fail('survey', 'is missing');
  if (!isTestKind(s!.kind)) fail('survey.kind', `"${String(s!.kind)}" is not one of ${TEST_KINDS.join(', ')}`);
  if (!Array.isArray(s!.records)) fail('survey.records', 'is not a list');
  if (!Array.isArray(s!.boreholes)) fail('survey.boreholes', 'is not a list');
  if (!Array.isArray(d.files)) fail('files', 'is not a list');
  if (d.version === 1) {
    d = structuredClone(d);
    migrateV1SurveyAndEdits(d);
  }
  const settings = { ...defaultSettings(), ...((d.settings as object) ?? {}) } as Settings;
  settings.design = { ...defaultDesignSettings(), ...((settings.design as object | undefined) ?? {}) };
  const edits = { ...emptyEdits(), ...((d.edits as object) ?? {}) } as UserEdits;
  return { ...(d as unknown as ProjectDocument), settings, edits };
}

export interface OpenedProject {
  doc: ProjectDocument;
  files: ProjectFile[];
  /** Files named in project.json but absent from the archive. */
  missing: string[];
}

export function readProjectArchive(zipBytes: Uint8Array, archiveName: string): OpenedProject {
  if (zipBytes.length < 22 || zipBytes[0] !== 0x50 || zipBytes[1] !== 0x4b) {
    throw new BorewaveError('ARCHIVE_NOT_ZIP', `${archiveName} is not a zip archive.`, archiveName);
  }
  let count = 0;
  let total = 0;
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(zipBytes, {
      filter: (f) => {
        count++;
        if (count > ARCHIVE_LIMITS.maxEntries) {
          throw new BorewaveError(
            'ARCHIVE_TOO_MANY_ENTRIES',
            `${archiveName} holds more than ${ARCHIVE_LIMITS.maxEntries} files.`,
            archiveName,
          );
        }
        if (f.originalSize > ARCHIVE_LIMITS.maxEntryBytes) {
          throw new BorewaveError(
            'ARCHIVE_ENTRY_TOO_LARGE',
            `${f.name} in ${archiveName} declares ${f.originalSize} bytes, above the ${ARCHIVE_LIMITS.maxEntryBytes} limit.`,
            archiveName,
            f.name,
          );
        }
        total += f.originalSize;
        if (total > ARCHIVE_LIMITS.maxTotalBytes) {
          throw new BorewaveError(
            'ARCHIVE_TOO_LARGE',
            `${archiveName} unpacks to more than ${ARCHIVE_LIMITS.maxTotalBytes} bytes.`,
            archiveName,
          );
        }
        return !f.name.endsWith('/');
      },
    });
  } catch (e) {
    if (e instanceof BorewaveError) throw e;
    throw new BorewaveError(
      'ARCHIVE_CORRUPT',
      `${archiveName} could not be unpacked: ${(e as Error).message}.`,
      archiveName,
    );
  }
  const byBase = new Map<string, Uint8Array>();
  for (const [name, bytes] of Object.entries(entries)) {
    const base = name.replace(/\\/g, '/').split('/').pop() ?? name;
    if (base) byBase.set(base, bytes);
  }
  const json = byBase.get('project.json');
  if (!json)
    throw new BorewaveError('ARCHIVE_NO_PROJECT', `${archiveName} has no project.json.`, archiveName, 'project.json');
  let raw: unknown;
  try {
    raw = JSON.parse(strFromU8(json));
  } catch (e) {
    throw new BorewaveError(
      'PROJECT_BAD_JSON',
      `project.json in ${archiveName} is not valid JSON: ${(e as Error).message}.`,
      archiveName,
      'project.json',
    );
  }
  const doc = validateProjectDocument(raw, archiveName);
  const files: ProjectFile[] = [];
  const missing: string[] = [];
  for (const n of doc.files) {
    const b = byBase.get(n);
    if (b) files.push({ name: n, bytes: b });
    else missing.push(n);
  }
  return { doc, files, missing };
}
