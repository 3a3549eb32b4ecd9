/**
 * The one way to open a project (docs/project-format.md), used by the worker (app, autosave restore)
 * and the command line alike, with the same rules and error codes:
 *
 * 1. project.json is read and parsed (ARCHIVE_NO_PROJECT, PROJECT_BAD_JSON);
 * 2. a version-1 document is migrated (migrate.ts); every document is checked against the schema
 *    (PROJECT_BAD_FIELD naming the path, e.g. survey.boreholes[0].collarEastM);
 * 3. only the files project.json lists are read (a listed file that is absent: PROJECT_FILE_MISSING);
 *    files in the archive that it does not list are never unpacked and are reported once
 *    (ARCHIVE_FILE_UNLISTED);
 * 4. every listed waveform file is parsed; a file no record places (or every file, when project.json
 *    has no records) is placed from its headers and file name like newly loaded files.
 *
 * A zip archive and a folder are two sources of the same entries (ProjectSource).
 */
import { strFromU8, strToU8 } from 'fflate';
import { BorewaveError, type ErrorInfo } from '../../errors';
import type { WaveRecord } from '../../model';
import { looksLikeRecordLog, readRecordLog, type RecordLog } from '../recordlog';
import { decodeUtf8 } from '../bytes';
import { placeForSurvey } from '../../setup/legacy';
import { readWaveFile, type ReadOutcome } from '../readers';
import { fromProjectJson, toProjectJson, type ProjectDocument, type ProjectFile } from './document';
import { migrateV1Document } from './migrate';
import { checkProjectJson, PROJECT_FORMAT, PROJECT_VERSION } from './schema';
import { readZip, writeZip } from './zip';

export { ARCHIVE_LIMITS } from './zip';
export {
  newProjectDocument,
  PROJECT_FORMAT,
  PROJECT_VERSION,
  toProjectJson,
  fromProjectJson,
  type ProjectDocument,
  type ProjectFile,
} from './document';

/** Entries of a project: a zip archive or a folder. */
export interface ProjectSource {
  /** Name for messages (archive or folder name). */
  name: string;
  /** project.json's bytes, or null when there is none. */
  projectJson(): Uint8Array | null;
  /** The bytes of the listed paths (absent ones left out), and every entry name present. */
  readListed(paths: readonly string[]): { files: Map<string, Uint8Array>; present: string[] };
}

export interface ParsedWaveFile {
  name: string;
  outcome: ReadOutcome;
}

export interface OpenedProject {
  doc: ProjectDocument;
  /** Listed files that are present, in list order. */
  files: ProjectFile[];
  /** Listed files that are absent. */
  missing: string[];
  /** Every listed waveform file parsed (ok or with its error). */
  parsed: ParsedWaveFile[];
  /** Records ready for the pipeline, keyed by record id (the file path). */
  records: Map<string, WaveRecord>;
  /** Problems that do not stop the rest of the survey (missing or unreadable files, unlisted entries). */
  issues: ErrorInfo[];
}

/** Parses project.json text into the program's document (migrating version 1; schema-checked). */
export function parseProjectJson(raw: unknown, sourceName: string): ProjectDocument {
  const fail = (field: string, problem: string): never => {
    throw new BorewaveError('PROJECT_BAD_FIELD', `project.json: ${field} ${problem}.`, sourceName, field);
  };
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) fail('(document)', 'is not a JSON object');
  const d = raw as Record<string, unknown>;
  if (d.format !== PROJECT_FORMAT) fail('format', `is "${String(d.format)}", expected "${PROJECT_FORMAT}"`);
  if (d.version !== 1 && d.version !== PROJECT_VERSION)
    fail('version', `${String(d.version)} is not supported (this program reads 1 and ${PROJECT_VERSION})`);
  const v2 = d.version === 1 ? migrateV1Document(d, sourceName) : d;
  const checked = checkProjectJson(v2);
  if (!checked.ok) {
    const [first, ...more] = checked.problems;
    const also = more.length ? ` (and ${more.length} more: ${more.map((p) => p.path).join(', ')})` : '';
    fail(first.path, `${first.message}${also}`);
  }
  return fromProjectJson((checked as { ok: true; doc: import('./schema').ProjectJson }).doc, sourceName);
}

function parseJsonBytes(bytes: Uint8Array, sourceName: string): unknown {
  try {
    return JSON.parse(strFromU8(bytes));
  } catch (e) {
    throw new BorewaveError(
      'PROJECT_BAD_JSON',
      `project.json in ${sourceName} is not valid JSON: ${(e as Error).message}.`,
      sourceName,
      'project.json',
    );
  }
}

/** Opens a project from any source: the one set of rules for the app, the worker and the command line. */
export function openProject(source: ProjectSource): OpenedProject {
  const json = source.projectJson();
  if (!json)
    throw new BorewaveError('ARCHIVE_NO_PROJECT', `${source.name} has no project.json.`, source.name, 'project.json');
  const doc = parseProjectJson(parseJsonBytes(json, source.name), source.name);
  const { files: bytes, present } = source.readListed(doc.files);
  const issues: ErrorInfo[] = [];
  const files: ProjectFile[] = [];
  const missing: string[] = [];
  for (const path of doc.files) {
    const b = bytes.get(path);
    if (b) files.push({ name: path, bytes: b });
    else {
      missing.push(path);
      issues.push({
        code: 'PROJECT_FILE_MISSING',
        message: `${path} is listed in project.json but is not in ${source.name}.`,
        file: path,
      });
    }
  }
  const listed = new Set(doc.files);
  const unlisted = present.filter((p) => p !== 'project.json' && !listed.has(p));
  if (unlisted.length)
    issues.push({
      code: 'ARCHIVE_FILE_UNLISTED',
      message: `${unlisted.length} file${unlisted.length === 1 ? '' : 's'} in ${source.name} ${unlisted.length === 1 ? 'is' : 'are'} not listed in project.json and ${unlisted.length === 1 ? 'was' : 'were'} not read: ${unlisted.slice(0, 5).join(', ')}${unlisted.length > 5 ? ' ...' : ''}.`,
      file: source.name,
    });
  const notWave = new Set([...Object.values(doc.deviationFiles ?? {}), ...(doc.recordLogs ?? [])]);
  const parsed: ParsedWaveFile[] = [];
  const records = new Map<string, WaveRecord>();
  for (const f of files) {
    if (notWave.has(f.name)) continue;
    const sampleIntervalS = doc.sampleIntervalsS?.[f.name];
    const outcome = readWaveFile(f.bytes, f.name, sampleIntervalS !== undefined ? { sampleIntervalS } : {});
    parsed.push({ name: f.name, outcome });
    if (outcome.ok) records.set(f.name, { ...outcome.record, id: f.name });
    else issues.push(outcome.error);
  }
  const placed = new Set(doc.survey.records.map((r) => r.recordId));
  const unplaced = [...records.values()].filter((r) => !placed.has(r.id));
  if (unplaced.length) {
    // Placed by the set-up inference (core/setup), the same rules as newly loaded files: the record log
    // listed in the project, the file-name pattern, the headers, then the kind's defaults.
    const { assignments } = placeForSurvey({ ...doc.survey, records: [] }, unplaced, {
      fileNamePattern: doc.settings.placement.fileNamePattern,
      maxHeaderDepthM: doc.settings.placement.maxHeaderDepthM,
      log: projectRecordLog(doc, files, issues),
    });
    doc.survey = { ...doc.survey, records: [...doc.survey.records, ...assignments] };
  }
  return { doc, files, missing, parsed, records, issues };
}

/** The first record log the project lists (read for placing unplaced files), or null. */
function projectRecordLog(doc: ProjectDocument, files: readonly ProjectFile[], issues: ErrorInfo[]): RecordLog | null {
  for (const path of doc.recordLogs ?? []) {
    const f = files.find((x) => x.name === path);
    if (!f) continue;
    const text = decodeUtf8(f.bytes);
    if (!looksLikeRecordLog(text)) continue;
    try {
      return readRecordLog(text, path);
    } catch (e) {
      issues.push({ code: 'PROJECT_BAD_FIELD', message: `${path}: ${(e as Error).message}`, file: path });
    }
  }
  return null;
}

/** A zip archive as a project source: only project.json and the listed entries are unpacked. */
export function zipSource(zip: Uint8Array, archiveName: string): ProjectSource {
  let names: string[] | null = null;
  return {
    name: archiveName,
    projectJson() {
      const r = readZip(zip, archiveName, (p) => p === 'project.json');
      names = r.names;
      return r.entries.get('project.json') ?? null;
    },
    readListed(paths) {
      const want = new Set(paths);
      const r = readZip(zip, archiveName, (p) => want.has(p));
      return { files: r.entries, present: names ?? r.names };
    },
  };
}

/**
 * A project held in memory (a document and its files, e.g. the demo survey just made) as a project
 * source: project.json is written as a saved archive would hold it and read back by openProject, so the
 * same checks apply, without compressing the files into a zip and inflating them again.
 */
export function memorySource(doc: ProjectDocument, files: readonly ProjectFile[], name: string): ProjectSource {
  const byPath = new Map<string, Uint8Array>();
  for (const f of files) {
    const p = checkPath(f.name);
    if (byPath.has(p)) throw new BorewaveError('ARCHIVE_DUPLICATE_FILE', `Two files are named "${p}".`, name, p);
    byPath.set(p, f.bytes);
  }
  return {
    name,
    projectJson: () => strToU8(JSON.stringify(toProjectJson({ ...doc, files: [...byPath.keys()] }))),
    readListed(paths) {
      const out = new Map<string, Uint8Array>();
      for (const p of paths) {
        const b = byPath.get(p);
        if (b) out.set(p, b);
      }
      return { files: out, present: [...byPath.keys()] };
    },
  };
}

/** Opens a project archive (zip bytes). */
export function readProjectArchive(zipBytes: Uint8Array, archiveName: string): OpenedProject {
  return openProject(zipSource(zipBytes, archiveName));
}

/** Paths inside an archive: relative, '/'-separated, no '.' or '..' parts, never project.json. */
function checkPath(path: string): string {
  const p = path.replace(/\\/g, '/');
  if (!p || p === 'project.json' || p.split('/').some((s) => s === '' || s === '.' || s === '..'))
    throw new BorewaveError(
      'ARCHIVE_BAD_ENTRY_NAME',
      `File name "${path}" cannot be stored in a project archive.`,
      'project',
      path,
    );
  return p;
}

/**
 * The project as a zip: project.json (version 2, schema-checked) then the files byte for byte, every
 * entry dated savedAt (byte-reproducible for a given savedAt).
 */
export function writeProjectArchive(doc: ProjectDocument, files: readonly ProjectFile[]): Uint8Array {
  const seen = new Set<string>();
  const entries: { path: string; bytes: Uint8Array }[] = [];
  for (const f of files) {
    const p = checkPath(f.name);
    if (seen.has(p)) throw new BorewaveError('ARCHIVE_DUPLICATE_FILE', `Two files are named "${p}".`, 'project', p);
    seen.add(p);
    entries.push({ path: p, bytes: f.bytes });
  }
  const json = toProjectJson({ ...doc, files: entries.map((e) => e.path) });
  const checked = checkProjectJson(json);
  if (!checked.ok) {
    const p = checked.problems[0];
    throw new BorewaveError('PROJECT_BAD_FIELD', `project.json: ${p.path} ${p.message}.`, 'project', p.path);
  }
  return writeZip([{ path: 'project.json', bytes: strToU8(JSON.stringify(json, null, 1)) }, ...entries], json.savedAt);
}
