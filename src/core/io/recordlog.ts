/**
 * Record log: the operator's field list of which file is which depth (and hit, and channel order).
 * CSV (comma, semicolon or tab; optional # comments), one header row, columns (case-insensitive):
 *   file          required: the waveform file's name (a path inside the project, or its last part)
 *   depth_m | depth_ft   one of them: the logged depth (receiver; upper receiver for two receivers;
 *                 cone TIP depth; crosshole test depth). Empty cell = not logged.
 *   hit           optional: left right up down none (or L R U D N)
 *   components    optional: channel meanings in channel order, separated by spaces, '/' or '|':
 *                 "V H1 H2", or with receivers "r0:V r0:H1 r1:V r1:H1" (a crosshole hole's name may
 *                 stand for the slot: "R2:V")
 * A file named twice is an error naming it and both lines.
 */
import { BorewaveError } from '../errors';
import type { Component, HitDirection } from '../model';
import { parseCell, splitTextRows } from './text';
import { parseHitWord } from '../hitWords';

const FT_TO_M = 0.3048;

export interface RecordLogComponent {
  /** Receiver as written before ':' (slot r0/r1, a hole name, upper/lower), or null when not given. */
  receiver: string | null;
  component: Component;
}

export interface RecordLogRow {
  /** 1-based line in the log file. */
  line: number;
  file: string;
  /** Logged depth in metres (converted from feet when the column is depth_ft), or null. */
  depthM: number | null;
  hit: HitDirection | null;
  components: RecordLogComponent[] | null;
}

export interface RecordLog {
  name: string;
  depthColumn: 'depth_m' | 'depth_ft' | null;
  rows: RecordLogRow[];
}

const COMPONENTS: Record<string, Component> = {
  v: 'V',
  z: 'V',
  vert: 'V',
  vertical: 'V',
  h1: 'H1',
  x: 'H1',
  n: 'H1',
  radial: 'H1',
  h2: 'H2',
  y: 'H2',
  e: 'H2',
  transverse: 'H2',
};

function fail(log: string, message: string, field?: string): never {
  throw new BorewaveError('RECORD_LOG', `${log}: ${message}`, log, field);
}

function columnKey(cell: string): string {
  return cell
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_')
    .replace(/[()[\]]/g, '');
}

/** Parse a components cell: "V H1 H2", "V/H1/H2", "r0:V r1:H1", "R2:V". */
export function parseComponentsCell(cell: string, log: string, line: number): RecordLogComponent[] {
  const tokens = cell
    .split(/[\s/|]+/)
    .map((t) => t.trim())
    .filter((t) => t.length > 0);
  return tokens.map((tok) => {
    const colon = tok.lastIndexOf(':');
    const receiver = colon > 0 ? tok.slice(0, colon) : null;
    const word = (colon > 0 ? tok.slice(colon + 1) : tok).toLowerCase();
    const component = COMPONENTS[word];
    if (!component) {
      fail(
        log,
        `line ${line}, column components: "${tok}" is not a component (V, H1, H2, Z, X, Y, N, E, radial, transverse)`,
        `line ${line}`,
      );
    }
    return { receiver, component };
  });
}

/** Read a record log; throws BorewaveError (code RECORD_LOG) naming the line and column of the problem. */
export function readRecordLog(text: string, name: string): RecordLog {
  const { rows, separator } = splitTextRows(text);
  if (rows.length === 0) fail(name, 'the record log is empty');
  const header = rows[0].cells.map(columnKey);
  const col = (k: string) => header.indexOf(k);
  const fileCol = ['file', 'file_name', 'filename', 'record'].map(col).find((i) => i >= 0) ?? -1;
  if (fileCol < 0) fail(name, `line ${rows[0].line}: no "file" column (columns: ${rows[0].cells.join(', ')})`, 'file');
  const mCol = col('depth_m');
  const ftCol = col('depth_ft');
  if (mCol >= 0 && ftCol >= 0) fail(name, 'has both depth_m and depth_ft columns: keep one', 'depth');
  const depthCol = mCol >= 0 ? mCol : ftCol;
  const hitCol = col('hit');
  const compCol = col('components');
  const decimalComma = separator === ';' || separator === '\t';
  const seen = new Map<string, number>();
  const out: RecordLogRow[] = [];
  for (const row of rows.slice(1)) {
    const cell = (i: number) => (i >= 0 ? (row.cells[i] ?? '').trim() : '');
    const file = cell(fileCol);
    if (!file) fail(name, `line ${row.line}: the file cell is empty`, `line ${row.line}`);
    const key = file.replace(/\\/g, '/').toLowerCase();
    const before = seen.get(key);
    if (before !== undefined) {
      fail(name, `${file} is named twice (lines ${before} and ${row.line}); each file is one record`, file);
    }
    seen.set(key, row.line);
    let depthM: number | null = null;
    const d = cell(depthCol);
    if (d) {
      const v = parseCell(d, decimalComma);
      if (!Number.isFinite(v) || v < 0) {
        fail(name, `line ${row.line}, column ${header[depthCol]}: "${d}" is not a depth`, `line ${row.line}`);
      }
      depthM = ftCol >= 0 ? v * FT_TO_M : v;
    }
    let hit: HitDirection | null = null;
    const h = cell(hitCol);
    if (h) {
      // the log also takes 'n' for none
      hit = h.toLowerCase() === 'n' ? 'none' : parseHitWord(h);
      if (!hit) {
        fail(name, `line ${row.line}, column hit: "${h}" is not left, right, up, down or none`, `line ${row.line}`);
      }
    }
    const c = cell(compCol);
    out.push({ line: row.line, file, depthM, hit, components: c ? parseComponentsCell(c, name, row.line) : null });
  }
  return { name, depthColumn: mCol >= 0 ? 'depth_m' : ftCol >= 0 ? 'depth_ft' : null, rows: out };
}

/** Normalised form of a file reference for matching: forward slashes, lower case. */
function norm(p: string): string {
  return p.replace(/\\/g, '/').toLowerCase();
}
function base(p: string): string {
  return norm(p).split('/').pop() ?? '';
}

/**
 * Match log rows to the loaded files: exact path first, else the last path part when only one loaded
 * file has it. Returns the row for each matched file and the log rows that name no loaded file.
 */
export function matchRecordLog(
  log: RecordLog,
  files: readonly string[],
): { byFile: Map<string, RecordLogRow>; unknown: RecordLogRow[]; ambiguous: RecordLogRow[] } {
  const byFile = new Map<string, RecordLogRow>();
  const unknown: RecordLogRow[] = [];
  const ambiguous: RecordLogRow[] = [];
  const exact = new Map(files.map((f) => [norm(f), f]));
  const byBase = new Map<string, string[]>();
  for (const f of files) byBase.set(base(f), [...(byBase.get(base(f)) ?? []), f]);
  for (const row of log.rows) {
    const hit = exact.get(norm(row.file));
    if (hit) {
      byFile.set(hit, row);
      continue;
    }
    const cands = byBase.get(base(row.file)) ?? [];
    if (cands.length === 1) byFile.set(cands[0], row);
    else if (cands.length > 1) ambiguous.push(row);
    else unknown.push(row);
  }
  return { byFile, unknown, ambiguous };
}

/** A record log as CSV text (what the forward model writes beside its files, and the app exports). */
export function writeRecordLog(
  rows: { file: string; depthM: number | null; hit?: HitDirection | null; components?: string | null }[],
  unit: 'm' | 'ft' = 'm',
): string {
  const withHit = rows.some((r) => r.hit);
  const withComp = rows.some((r) => r.components);
  const head = [
    'file',
    unit === 'm' ? 'depth_m' : 'depth_ft',
    ...(withHit ? ['hit'] : []),
    ...(withComp ? ['components'] : []),
  ];
  const lines = rows.map((r) => {
    const d = r.depthM === null ? '' : String(Math.round((unit === 'm' ? r.depthM : r.depthM / FT_TO_M) * 1e4) / 1e4);
    const quote = (s: string) => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
    return [quote(r.file), d, ...(withHit ? [r.hit ?? ''] : []), ...(withComp ? [r.components ?? ''] : [])].join(',');
  });
  return `${[head.join(','), ...lines].join('\n')}\n`;
}

/** A CSV whose header row names a file column and a depth or hit column reads as a record log, not a waveform. */
export function looksLikeRecordLog(text: string): boolean {
  const first = text.split(/\r?\n/).find((l) => l.trim() && !l.trim().startsWith('#')) ?? '';
  const cells = first
    .toLowerCase()
    .split(/[,;\t]/)
    .map((c) => c.trim().replace(/^"|"$/g, ''));
  return (
    cells.some((c) => ['file', 'file_name', 'filename', 'record'].includes(c)) &&
    cells.some((c) => c === 'depth_m' || c === 'depth_ft' || c === 'hit')
  );
}
