/**
 * Delimited text waveforms: one time column (ms or s) then one column per channel.
 * Separators: comma, semicolon, tab or runs of spaces; decimal comma allowed with ; or tab separators;
 * comment lines start with # or //; the header row is optional. Quoted cells are handled by papaparse.
 */
import Papa from 'papaparse';
import { BorewaveError, type ErrorCode } from '../errors';
import type { Trace, WaveRecord } from '../model';

export type Separator = ',' | ';' | '\t' | 'whitespace';

/** One non-blank, non-comment line split into trimmed cells; `line` is 1-based in the file. */
export interface TextRow {
  line: number;
  cells: string[];
}

/** Choose the separator from the first data lines: tab, then semicolon, then comma, else whitespace. */
export function detectSeparator(lines: string[]): Separator {
  const sample = lines.slice(0, 10);
  if (sample.some((l) => l.includes('\t'))) return '\t';
  if (sample.some((l) => l.includes(';'))) return ';';
  if (sample.some((l) => l.includes(','))) return ',';
  return 'whitespace';
}

function isComment(line: string): boolean {
  const t = line.trimStart();
  return t.startsWith('#') || t.startsWith('//');
}

/** Split text into rows of cells, skipping blank and comment lines and keeping line numbers. */
export function splitTextRows(text: string): { rows: TextRow[]; separator: Separator } {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const kept: { line: number; text: string }[] = [];
  body.split(/\r\n|\r|\n/).forEach((l, i) => {
    if (l.trim().length > 0 && !isComment(l)) kept.push({ line: i + 1, text: l });
  });
  const separator = detectSeparator(kept.map((k) => k.text));
  const rows = kept.map((k) => ({ line: k.line, cells: splitLine(k.text, separator) }));
  return { rows, separator };
}

function splitLine(line: string, sep: Separator): string[] {
  if (sep === 'whitespace') return line.trim().split(/\s+/);
  const parsed = Papa.parse<string[]>(line, { delimiter: sep, header: false, skipEmptyLines: false });
  const cells = parsed.data[0] ?? [];
  return cells.map((c) => String(c).trim());
}

const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA_RE = /^[+-]?\d*,\d+([eE][+-]?\d+)?$/;

/** Parse one cell strictly; decimal comma only when allowed. Returns NaN when not a finite number. */
export function parseCell(cell: string, allowDecimalComma: boolean): number {
  let c = cell;
  if (allowDecimalComma && DECIMAL_COMMA_RE.test(c)) c = c.replace(',', '.');
  if (!NUMBER_RE.test(c)) return NaN;
  const x = Number(c);
  return Number.isFinite(x) ? x : NaN;
}

export function allowsDecimalComma(sep: Separator): boolean {
  return sep === ';' || sep === '\t';
}

/** True when the row reads as a header: at least one cell is not a number. */
export function isHeaderRow(cells: string[], sep: Separator): boolean {
  return cells.some((c) => Number.isNaN(parseCell(c, allowsDecimalComma(sep))));
}

/** Lower-case alphanumeric tokens of a header cell, e.g. "t (ms)" -> ["t", "ms"], "time_ms" -> ["time", "ms"]. */
export function headerTokens(cell: string): string[] {
  return cell
    .toLowerCase()
    .split(/[^a-z0-9µμ]+/)
    .filter((t) => t.length > 0);
}

/** Time unit named in a header cell, or null. */
export function timeUnitFromHeader(cell: string): 's' | 'ms' | null {
  const tokens = headerTokens(cell);
  if (tokens.some((t) => ['ms', 'msec', 'msecs', 'millisecond', 'milliseconds', 'millisec'].includes(t))) return 'ms';
  if (tokens.some((t) => ['s', 'sec', 'secs', 'second', 'seconds'].includes(t))) return 's';
  return null;
}

/**
 * Unit guess when neither the header nor the caller gives one (stated rule): a time step of
 * 0.005 or more is read as milliseconds, a smaller one as seconds. Borehole seismic records are
 * sampled at 0.02-0.5 ms (domain.md section 5), so a step >= 5 ms in seconds would be implausible
 * and a step < 5 microseconds in milliseconds likewise.
 */
export const GUESS_MS_STEP_THRESHOLD = 0.005;
export function guessTimeUnit(step: number): 's' | 'ms' {
  return step >= GUESS_MS_STEP_THRESHOLD ? 'ms' : 's';
}

function decimalsOf(cell: string): number {
  if (/[eE]/.test(cell)) return 15;
  const m = /[.,](\d+)$/.exec(cell);
  return m ? m[1].length : 0;
}

/**
 * Regular sampling (common practice): every step within 1% of the median step, or within the
 * printed rounding of the time cells (two units of the last printed digit: each step and the
 * median carry up to one unit from rounding two cells), but never more than a quarter step, so a missing or repeated sample is always caught.
 */
function checkRegularTime(time: Float64Array, decimals: number, data: TextRow[], file: string): void {
  const diffs = new Float64Array(time.length - 1);
  for (let i = 1; i < time.length; i++) diffs[i - 1] = time[i] - time[i - 1];
  const sorted = Float64Array.from(diffs).sort();
  const median = sorted[Math.floor(sorted.length / 2)];
  const tol = Math.min(Math.max(0.01 * median, 2 * 10 ** -decimals * (1 + 1e-9)), 0.25 * median);
  for (let i = 1; i < time.length; i++) {
    const d = diffs[i - 1];
    if (!(median > 0) || !(d > 0) || Math.abs(d - median) > tol) {
      fail(
        'TEXT_IRREGULAR_TIME',
        `line ${data[i].line}, time ${time[i]} breaks the regular step of ${median} (previous time ${time[i - 1]})`,
        file,
        `line ${data[i].line}, column 1`,
      );
    }
  }
}

function fail(code: ErrorCode, message: string, file: string, field?: string): never {
  throw new BorewaveError(code, `${file}: ${message}`, file, field);
}

/** Read a delimited text waveform file. Throws BorewaveError naming row (file line) and column. */
export function readDelimitedText(text: string, fileName: string, opts?: { timeUnit?: 's' | 'ms' }): WaveRecord {
  const file = fileName;
  const { rows, separator } = splitTextRows(text);
  if (rows.length === 0) fail('TEXT_EMPTY', 'the file holds no data (only blank or comment lines)', file);
  const decimalComma = allowsDecimalComma(separator);
  const hasHeader = isHeaderRow(rows[0].cells, separator);
  const header = hasHeader ? rows[0].cells : null;
  const data = hasHeader ? rows.slice(1) : rows;
  if (data.length === 0) fail('TEXT_EMPTY', 'the file has a header row but no data rows', file);
  const nCols = header ? header.length : data[0].cells.length;
  if (nCols < 2) {
    fail(
      'TEXT_TOO_FEW_COLUMNS',
      `line ${rows[0].line} has ${nCols} column; a time column and at least one channel column are needed`,
      file,
      'columns',
    );
  }
  const colName = (c: number) => (header ? `column ${c + 1} ("${header[c]}")` : `column ${c + 1}`);

  const columns: Float64Array[] = Array.from({ length: nCols }, () => new Float64Array(data.length));
  let timeDecimals = 0;
  data.forEach((row, r) => {
    let cells = row.cells;
    if (cells.length === nCols + 1 && cells[nCols] === '') cells = cells.slice(0, nCols); // trailing separator
    if (cells.length !== nCols) {
      fail(
        'TEXT_RAGGED_ROW',
        `line ${row.line} has ${cells.length} columns, expected ${nCols}`,
        file,
        `line ${row.line}`,
      );
    }
    for (let c = 0; c < nCols; c++) {
      const x = parseCell(cells[c], decimalComma);
      if (Number.isNaN(x) || (c > 0 && !Number.isFinite(Math.fround(x)))) {
        fail(
          'TEXT_NOT_NUMERIC',
          `line ${row.line}, ${colName(c)}: "${cells[c]}" is not a finite number`,
          file,
          `line ${row.line}, column ${c + 1}`,
        );
      }
      columns[c][r] = x;
    }
    timeDecimals = Math.max(timeDecimals, decimalsOf(cells[0]));
  });
  if (data.length < 2)
    fail('TEXT_TOO_FEW_ROWS', 'one data row cannot give a sample interval; at least two are needed', file, 'rows');

  const time = columns[0];
  const n = time.length;
  checkRegularTime(time, timeDecimals, data, file);
  const step = (time[n - 1] - time[0]) / (n - 1);

  const headerUnit = header ? timeUnitFromHeader(header[0]) : null;
  let unit: 's' | 'ms';
  let unitSource: string;
  if (opts?.timeUnit) {
    unit = opts.timeUnit;
    unitSource = 'given';
  } else if (headerUnit) {
    unit = headerUnit;
    unitSource = 'header';
  } else {
    unit = guessTimeUnit(step);
    unitSource = `guessed: step ${step} ${unit === 'ms' ? '>=' : '<'} ${GUESS_MS_STEP_THRESHOLD} read as ${unit}`;
  }
  const toS = unit === 'ms' ? 1e-3 : 1;

  const traces: Trace[] = [];
  for (let c = 1; c < nCols; c++) {
    const strings: Record<string, string> = {};
    if (header) strings.COLUMN_NAME = header[c];
    traces.push({
      channel: c,
      samples: Float32Array.from(columns[c]),
      sampleIntervalS: step * toS,
      delayS: time[0] * toS,
      strings,
    });
  }
  return {
    id: fileName,
    fileName,
    format: 'text',
    fileStrings: {
      TIME_UNIT: unit,
      TIME_UNIT_SOURCE: unitSource,
      SEPARATOR: separator === '\t' ? 'tab' : separator,
      ...(header ? { TIME_COLUMN: header[0] } : {}),
    },
    notes: [],
    traces,
  };
}
