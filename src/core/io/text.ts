/**
 * Delimited text waveforms: an optional time column (s, ms, us or sample numbers, unit from the header)
 * then one column per channel. Separators: comma, semicolon, tab or runs of spaces; decimal comma
 * allowed with ; or tab separators; comment lines start with # or //; the header row is optional; a
 * preamble (lines before the block of numeric rows) is skipped and reported, and a sample interval
 * written there (`sample_rate_hz`, `sample_interval`, `dt` ...) is used when there is no time column.
 *
 * One pass over the text with a numeric fast path (cells are scanned in place and parsed into typed
 * arrays; papaparse only for a line holding a quote). Limits on line length, columns and cells are
 * checked before anything is allocated.
 */
import Papa from 'papaparse';
import { BorewaveError, type ErrorCode, type ErrorInfo } from '../errors';
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
export function splitTextRows(text: string, fileName = 'text'): { rows: TextRow[]; separator: Separator } {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const kept: { line: number; text: string }[] = [];
  body.split(/\r\n|\r|\n/).forEach((l, i) => {
    // Limits before any line is split (TEXT_LIMITS, shared with the waveform reader).
    if (l.length > TEXT_LIMITS.maxLineChars)
      fail(
        'TEXT_LINE_TOO_LONG',
        `line ${i + 1} has ${l.length} characters, more than ${TEXT_LIMITS.maxLineChars}`,
        fileName,
        `line ${i + 1}`,
      );
    if (l.trim().length > 0 && !isComment(l)) kept.push({ line: i + 1, text: l });
  });
  const separator = detectSeparator(kept.map((k) => k.text));
  const bounds: number[] = [];
  const rows = kept.map((k) => {
    if (scanCells(k.text, 0, k.text.length, separator, bounds, TEXT_LIMITS.maxColumns) < 0)
      fail(
        'TEXT_TOO_MANY_COLUMNS',
        `line ${k.line} has more than ${TEXT_LIMITS.maxColumns} columns`,
        fileName,
        `line ${k.line}`,
      );
    return { line: k.line, cells: splitLine(k.text, separator) };
  });
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

/** Time units of a time column: seconds, milliseconds, microseconds or sample numbers. */
export type TimeUnit = 's' | 'ms' | 'us' | 'sample';

/** Seconds per unit (SI definitions); sample numbers need the sample interval. */
export const SECONDS_PER_UNIT: Record<Exclude<TimeUnit, 'sample'>, number> = { s: 1, ms: 1e-3, us: 1e-6 };

const UNIT_WORDS: [TimeUnit, string[]][] = [
  ['ms', ['ms', 'msec', 'msecs', 'millisecond', 'milliseconds', 'millisec']],
  ['us', ['us', 'µs', 'μs', 'usec', 'usecs', 'musec', 'microsec', 'microsecond', 'microseconds', 'micros']],
  ['s', ['s', 'sec', 'secs', 'second', 'seconds']],
  ['sample', ['sample', 'samples', 'sampleno', 'samplenumber', 'samplenr', 'index', 'idx']],
];
const TIME_WORDS = ['time', 't', 'tt', 'zeit', 'tiempo', 'temps', 'tempo', 'timestamp'];

/** Time unit named in a header cell, or null ("Time (us)" -> us, "Sample number" -> sample). */
export function timeUnitFromHeader(cell: string): TimeUnit | null {
  const tokens = headerTokens(cell);
  const joined = tokens.join('');
  for (const [unit, words] of UNIT_WORDS) {
    if (tokens.some((t) => words.includes(t)) || words.includes(joined)) return unit;
  }
  // "time_ms", "t_us", "timeus": a unit glued to a time word
  for (const [unit, words] of UNIT_WORDS) {
    if (unit === 'sample') continue;
    for (const w of TIME_WORDS) if (words.some((u) => joined === w + u)) return unit;
  }
  return null;
}

/** True when a header cell names a time (or sample-number) column. */
export function isTimeHeader(cell: string): boolean {
  const tokens = headerTokens(cell);
  return timeUnitFromHeader(cell) !== null || tokens.some((t) => TIME_WORDS.includes(t));
}

/**
 * Unit guess when neither the header nor the caller gives one (stated rule): a time step of
 * 0.005 or more is read as milliseconds, a smaller one as seconds. Borehole seismic records are
 * sampled at 0.02-0.5 ms (docs/methods.md section 5), so a step >= 5 ms in seconds would be implausible
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
 * median carry up to one unit from rounding two cells), but never more than a quarter step, so a
 * missing or repeated sample is always caught. Returns the index of the first bad step, or -1.
 */
export function firstIrregularStep(time: Float64Array, decimals: number): number {
  const n = time.length;
  const diffs = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) diffs[i - 1] = time[i] - time[i - 1];
  const sorted = Float64Array.from(diffs).sort();
  const median = sorted[Math.floor(sorted.length / 2)];
  const tol = Math.min(Math.max(0.01 * median, 2 * 10 ** -decimals * (1 + 1e-9)), 0.25 * median);
  for (let i = 1; i < n; i++) {
    const d = diffs[i - 1];
    if (!(median > 0) || !(d > 0) || Math.abs(d - median) > tol) return i;
  }
  return -1;
}

function fail(code: ErrorCode, message: string, file: string, field?: string): never {
  throw new BorewaveError(code, `${file}: ${message}`, file, field);
}

// ------------------------------------------------------------------ limits

/** Limits checked before anything is allocated (a text waveform never comes near them). */
export const TEXT_LIMITS = {
  /** Characters in one line. */
  maxLineChars: 1_000_000,
  /** Columns in one row. */
  maxColumns: 4096,
  /** Numeric cells in the file (8 bytes each while reading). */
  maxCells: 16_000_000,
  /** Lines before the data block (preamble and header). */
  maxPreambleLines: 1000,
  /** Sample interval, s (as for SEG-2). */
  sampleIntervalS: [1e-7, 1] as const,
};

// ------------------------------------------------------------------ fast cell scanning

const CH_SPACE = 32;
const CH_TAB = 9;

function isSpace(c: number): boolean {
  return c === CH_SPACE || c === CH_TAB || c === 13 || c === 0xa0;
}

/**
 * Cell boundaries of text[start, end) into `bounds` (pairs of start, end; cells trimmed); returns the
 * cell count, or -1 when the line holds more than `maxColumns` cells (counted before any cell is kept).
 */
function scanCells(
  text: string,
  start: number,
  end: number,
  sep: Separator,
  bounds: number[],
  maxColumns: number,
): number {
  bounds.length = 0;
  if (sep === 'whitespace') {
    let i = start;
    let count = 0;
    while (i < end) {
      while (i < end && isSpace(text.charCodeAt(i))) i++;
      if (i >= end) break;
      const s = i;
      while (i < end && !isSpace(text.charCodeAt(i))) i++;
      if (++count > maxColumns) return -1;
      bounds.push(s, i);
    }
    return count;
  }
  const sc = sep.charCodeAt(0);
  let seps = 0;
  for (let i = start; i < end; i++) if (text.charCodeAt(i) === sc && ++seps >= maxColumns) return -1;
  let s = start;
  for (let i = start; i <= end; i++) {
    if (i === end || text.charCodeAt(i) === sc) {
      let a = s;
      let b = i;
      while (a < b && isSpace(text.charCodeAt(a))) a++;
      while (b > a && isSpace(text.charCodeAt(b - 1))) b--;
      bounds.push(a, b);
      s = i + 1;
    }
  }
  return bounds.length / 2;
}

/**
 * Strict decimal number in text[a, b) (sign, digits, one decimal point or, when allowed, comma,
 * exponent); NaN otherwise. Same grammar as parseCell, without building the cell string first.
 */
function numberAt(text: string, a: number, b: number, decimalComma: boolean): number {
  let i = a;
  let c = text.charCodeAt(i);
  if (c === 43 || c === 45) i++;
  let digits = 0;
  let comma = -1;
  let point = false;
  while (i < b) {
    c = text.charCodeAt(i);
    if (c >= 48 && c <= 57) digits++;
    else if (c === 46 || (c === 44 && decimalComma)) {
      if (point) return NaN;
      point = true;
      if (c === 44) comma = i;
    } else break;
    i++;
  }
  if (digits === 0) return NaN;
  if (i < b) {
    c = text.charCodeAt(i);
    if (c !== 101 && c !== 69) return NaN;
    i++;
    c = text.charCodeAt(i);
    if (c === 43 || c === 45) i++;
    const e0 = i;
    while (i < b && text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) i++;
    if (i === e0 || i !== b) return NaN;
  }
  const x = comma >= 0 ? Number(`${text.slice(a, comma)}.${text.slice(comma + 1, b)}`) : Number(text.slice(a, b));
  return Number.isFinite(x) ? x : NaN;
}

/** Cells of a line that holds a quote character: RFC 4180 quoting through papaparse. */
function quotedCells(line: string, sep: Separator): string[] {
  return splitLine(line, sep);
}

// ------------------------------------------------------------------ preamble keys

/** Sample rate (Hz) or interval keys written in a preamble, normalised (lower case, underscores). */
const RATE_KEYS = ['sample_rate', 'sampling_rate', 'sample_frequency', 'sampling_frequency', 'samplerate', 'fs', 'sr'];
const INTERVAL_KEYS = [
  'sample_interval',
  'sampling_interval',
  'sample_period',
  'sampling_period',
  'dt',
  'delta_t',
  'time_step',
  'timestep',
  'si',
];
const UNIT_SUFFIXES: [string, number][] = [
  ['_khz', 1e3],
  ['_hz', 1],
  ['_ms', 1e-3],
  ['_us', 1e-6],
  ['_s', 1],
];
const UNIT_TOKENS: Record<string, number> = {
  khz: 1e3,
  hz: 1,
  s: 1,
  sec: 1,
  ms: 1e-3,
  msec: 1e-3,
  us: 1e-6,
  µs: 1e-6,
  μs: 1e-6,
  usec: 1e-6,
};

export interface PreambleInterval {
  sampleIntervalS: number;
  key: string;
  value: string;
  line: number;
}

/**
 * A sample interval from one preamble line such as "# sample_rate_hz: 10000", "Sample interval (ms) =
 * 0.125", "dt 2.5e-5". Returns null when the line names no such key; NaN interval when the value is
 * not a plausible number (the caller names it).
 */
export function preambleInterval(lineText: string): { sampleIntervalS: number; key: string; value: string } | null {
  const body = lineText.replace(/^\s*(#|\/\/)\s*/, '');
  const m =
    /^([A-Za-z][A-Za-z _\-.]*?)\s*(?:[([]\s*([A-Za-zµμ]+)\s*[)\]])?\s*[:=,;\t ]\s*"?([+-]?(?:\d+[.,]?\d*|[.,]\d+)(?:[eE][+-]?\d+)?)"?\s*([A-Za-zµμ]+)?/.exec(
      body,
    );
  if (!m) return null;
  let key = m[1]
    .trim()
    .toLowerCase()
    .replace(/[\s\-.]+/g, '_');
  let factor = Number.NaN;
  for (const [suffix, f] of UNIT_SUFFIXES) {
    if (key.endsWith(suffix) && key.length > suffix.length) {
      key = key.slice(0, -suffix.length);
      factor = f;
      break;
    }
  }
  const isRate = RATE_KEYS.includes(key);
  if (!isRate && !INTERVAL_KEYS.includes(key)) return null;
  const unitWord = (m[2] ?? m[4] ?? '').toLowerCase();
  if (Number.isNaN(factor)) factor = UNIT_TOKENS[unitWord] ?? 1;
  const value = m[3];
  const x = parseCell(value, true);
  const sampleIntervalS = !(x > 0) ? Number.NaN : isRate ? 1 / (x * factor) : x * factor;
  return { sampleIntervalS, key: m[1].trim() + (m[2] ? ` (${m[2]})` : ''), value: value + (m[4] ? ` ${m[4]}` : '') };
}

function checkInterval(dtS: number, what: string, file: string, field: string): number {
  const [lo, hi] = TEXT_LIMITS.sampleIntervalS;
  if (!(dtS >= lo && dtS <= hi)) {
    fail(
      'TEXT_BAD_SAMPLE_INTERVAL',
      `${what} gives a sample interval of ${dtS} s, outside ${lo} to ${hi} s`,
      file,
      field,
    );
  }
  return dtS;
}

// ------------------------------------------------------------------ reader

export interface TextReadOptions {
  /** Unit of the time column when the header names none (overrides the guess). */
  timeUnit?: 's' | 'ms' | 'us';
  /** Sample interval for a file without a time column (or with sample numbers), s. */
  sampleIntervalS?: number;
}

/** What the reader found, kept in fileStrings (text) and shown in Records and `inspect`. */
export interface TextLayout {
  timeUnit: TimeUnit | 'none';
  timeColumn: string | null;
  sampleIntervalSource: string;
  preambleLines: number;
  dataFromLine: number;
}

const TEXT_LINE = /\r\n|\r|\n/g;

/** Read a delimited text waveform file. Throws BorewaveError naming row (file line) and column. */
export function readDelimitedText(text: string, fileName: string, opts: TextReadOptions = {}): WaveRecord {
  const file = fileName;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const L = TEXT_LIMITS;

  // 1. Line boundaries of the non-blank, non-comment lines; comment lines kept for preamble keys.
  const starts: number[] = [];
  const ends: number[] = [];
  const lineNo: number[] = [];
  const comments: { line: number; text: string }[] = [];
  TEXT_LINE.lastIndex = 0;
  let pos = 0;
  let line = 0;
  while (pos <= body.length) {
    line++;
    const m = TEXT_LINE.exec(body);
    const end = m ? m.index : body.length;
    if (end - pos > L.maxLineChars) {
      fail(
        'TEXT_LINE_TOO_LONG',
        `line ${line} has ${end - pos} characters, more than the ${L.maxLineChars} a waveform row can have`,
        file,
        `line ${line}`,
      );
    }
    let a = pos;
    while (a < end && isSpace(body.charCodeAt(a))) a++;
    if (a < end) {
      const c0 = body.charCodeAt(a);
      if (c0 === 35 || (c0 === 47 && body.charCodeAt(a + 1) === 47)) {
        if (starts.length === 0 && comments.length < L.maxPreambleLines)
          comments.push({ line, text: body.slice(a, end) });
      } else {
        starts.push(pos);
        ends.push(end);
        lineNo.push(line);
      }
    }
    if (!m) break;
    pos = m.index + m[0].length;
    if (pos === body.length) break;
  }
  const nLines = starts.length;
  if (nLines === 0) fail('TEXT_EMPTY', 'the file holds no data (only blank or comment lines)', file);

  // 2. Separator and column count from the last lines (the data; a preamble may hold anything).
  const tailFrom = Math.max(0, nLines - 20);
  const tail: string[] = [];
  for (let i = Math.max(0, nLines - 10); i < nLines; i++)
    tail.push(body.slice(starts[i], Math.min(ends[i], starts[i] + 4096)));
  const separator = detectSeparator(tail);
  const decimalComma = allowsDecimalComma(separator);
  const bounds: number[] = [];
  const cellCount = (i: number): number => {
    const n = scanCells(body, starts[i], ends[i], separator, bounds, L.maxColumns);
    if (n < 0) {
      fail(
        'TEXT_TOO_MANY_COLUMNS',
        `line ${lineNo[i]} has more than ${L.maxColumns} columns`,
        file,
        `line ${lineNo[i]}`,
      );
    }
    // A line holding a quote: its cells as RFC 4180 reads them (a quoted separator is no separator).
    lastQuoted = hasQuote(i) ? quotedCells(body.slice(starts[i], ends[i]), separator) : null;
    return lastQuoted ? lastQuoted.length : n;
  };
  let lastQuoted: string[] | null = null;
  /** Cell count without a trailing separator's empty cell. */
  const trailingEmpty = (n: number) =>
    n > 1 && (lastQuoted ? lastQuoted[n - 1] === '' : bounds[2 * n - 2] === bounds[2 * n - 1]);
  const fits = (n: number) => n === k || (n === k + 1 && trailingEmpty(n));
  const hasQuote = (i: number): boolean => {
    for (let j = starts[i]; j < ends[i]; j++) if (body.charCodeAt(j) === 34) return true;
    return false;
  };
  const counts = new Map<number, number>();
  // Rows that start with a number vote (a short file's preamble must not outvote its data).
  for (const numericOnly of [true, false]) {
    for (let i = tailFrom; i < nLines; i++) {
      const raw = cellCount(i);
      if (numericOnly && (raw === 0 || Number.isNaN(numberAt(body, bounds[0], bounds[1], decimalComma)))) continue;
      const c = trailingEmpty(raw) ? raw - 1 : raw;
      counts.set(c, (counts.get(c) ?? 0) + 1);
    }
    if (counts.size > 0) break;
  }
  let k = 0;
  let best = -1;
  for (const [c, n] of counts) if (n > best || (n === best && c > k)) [k, best] = [c, n];

  // 3. Data start: the first row of k numeric cells. Lines before it are preamble (and a header).
  const rowNumeric = (i: number, n: number): number => {
    // index of the first non-numeric cell, or -1
    if (hasQuote(i)) {
      const cells = quotedCells(body.slice(starts[i], ends[i]), separator);
      for (let c = 0; c < n; c++) if (Number.isNaN(parseCell(cells[c] ?? '', decimalComma))) return c;
      return -1;
    }
    for (let c = 0; c < n; c++)
      if (Number.isNaN(numberAt(body, bounds[2 * c], bounds[2 * c + 1], decimalComma))) return c;
    return -1;
  };
  let dataStart = -1;
  for (let i = 0; i < nLines && i <= L.maxPreambleLines; i++) {
    const n = cellCount(i);
    const bad = rowNumeric(i, Math.min(n, k));
    if (fits(n) && bad < 0) {
      dataStart = i;
      break;
    }
    // A row that starts with a number but is not a data row is a broken data row, not a preamble.
    if (n >= 2 && !Number.isNaN(numberAt(body, bounds[0], bounds[1], decimalComma)) && (bad < 0 || n === k)) {
      const cells = cellsOf(i);
      if (n !== k)
        fail('TEXT_RAGGED_ROW', `line ${lineNo[i]} has ${n} columns, expected ${k}`, file, `line ${lineNo[i]}`);
      fail(
        'TEXT_NOT_NUMERIC',
        `line ${lineNo[i]}, column ${bad + 1}: "${cells[bad]}" is not a finite number`,
        file,
        `line ${lineNo[i]}, column ${bad + 1}`,
      );
    }
  }
  function cellsOf(i: number): string[] {
    const line = body.slice(starts[i], ends[i]);
    if (line.includes('"')) return quotedCells(line, separator);
    const n = scanCells(body, starts[i], ends[i], separator, bounds, L.maxColumns);
    return Array.from({ length: n }, (_, c) => body.slice(bounds[2 * c], bounds[2 * c + 1]));
  }
  if (dataStart < 0) {
    fail(
      nLines === 1 ? 'TEXT_EMPTY' : 'TEXT_NO_DATA',
      `no row of ${k} numeric columns in the first ${Math.min(nLines, L.maxPreambleLines + 1)} lines`,
      file,
      'rows',
    );
  }

  // Header: the line just before the data with k cells whose first cell is not a number.
  let header: string[] | null = null;
  if (dataStart > 0) {
    let cells = cellsOf(dataStart - 1);
    if (cells.length === k + 1 && cells[k] === '') cells = cells.slice(0, k);
    if (separator === 'whitespace' && cells.length > k) cells = mergeUnitTokens(cells);
    if (cells.length === k && Number.isNaN(parseCell(cells[0], decimalComma))) header = cells;
  }
  const preambleEnd = header ? dataStart - 1 : dataStart;
  const preamble: { line: number; text: string }[] = [...comments];
  for (let i = 0; i < preambleEnd; i++) preamble.push({ line: lineNo[i], text: body.slice(starts[i], ends[i]) });
  const preambleLines = preambleEnd;

  // 4. Limits, then one pass of the data rows into typed arrays.
  const rows = nLines - dataStart;
  if (rows * k > L.maxCells) {
    fail(
      'TEXT_TOO_MANY_CELLS',
      `${rows} rows x ${k} columns = ${rows * k} cells, more than ${L.maxCells}`,
      file,
      'cells',
    );
  }
  const columns: Float64Array[] = Array.from({ length: k }, () => new Float64Array(rows));
  let timeDecimals = 0;
  for (let r = 0; r < rows; r++) {
    const i = dataStart + r;
    const n = cellCount(i);
    if (!fits(n))
      fail('TEXT_RAGGED_ROW', `line ${lineNo[i]} has ${n} columns, expected ${k}`, file, `line ${lineNo[i]}`);
    const cells = hasQuote(i) ? cellsOf(i) : null;
    for (let c = 0; c < k; c++) {
      const x = cells
        ? parseCell(cells[c], decimalComma)
        : numberAt(body, bounds[2 * c], bounds[2 * c + 1], decimalComma);
      if (Number.isNaN(x) || !Number.isFinite(Math.fround(x))) {
        const cellText = cells ? cells[c] : body.slice(bounds[2 * c], bounds[2 * c + 1]);
        fail(
          'TEXT_NOT_NUMERIC',
          `line ${lineNo[i]}, ${header ? `column ${c + 1} ("${header[c]}")` : `column ${c + 1}`}: "${cellText}" is not a finite number`,
          file,
          `line ${lineNo[i]}, column ${c + 1}`,
        );
      }
      columns[c][r] = x;
    }
    if (!cells) timeDecimals = Math.max(timeDecimals, decimalsIn(body, bounds[0], bounds[1]));
    else timeDecimals = Math.max(timeDecimals, decimalsOf(cells[0]));
  }

  // 5. Time column and sample interval.
  const warnings: ErrorInfo[] = [];
  const dataLine = lineNo[dataStart];
  const fromPreamble = findPreambleInterval(preamble, file);
  const given =
    opts.sampleIntervalS !== undefined
      ? checkInterval(opts.sampleIntervalS, 'the given value', file, 'sample interval')
      : undefined;
  let hasTime: boolean;
  let timeUnit: TimeUnit | 'none';
  let unitSource: string;
  if (header) {
    // A first column named like time is time; one with another name is time only when no sample
    // interval was given or written in the preamble, it rises at a regular step (amplitudes never do)
    // and other columns remain; its unit is then guessed with a warning.
    hasTime =
      isTimeHeader(header[0]) ||
      (given === undefined && !fromPreamble && k >= 2 && rows >= 2 && firstIrregularStep(columns[0], timeDecimals) < 0);
    const u = hasTime ? timeUnitFromHeader(header[0]) : null;
    timeUnit = u ?? 'none';
    unitSource = u ? 'header' : '';
  } else {
    // No header: a first column at a regular increasing step is time (amplitudes never are).
    hasTime = rows >= 2 && firstIrregularStep(columns[0], timeDecimals) < 0;
    timeUnit = 'none';
    unitSource = '';
  }
  if (rows < 2 && (hasTime || k < 2))
    fail('TEXT_TOO_FEW_ROWS', 'one data row cannot give a sample interval; at least two are needed', file, 'rows');
  const nChannels = hasTime ? k - 1 : k;
  if (nChannels < 1) {
    fail(
      'TEXT_TOO_FEW_COLUMNS',
      `line ${dataLine} has ${k} column (the time); at least one channel column is needed`,
      file,
      'columns',
    );
  }
  let dtS: number;
  let delayS = 0;
  let intervalSource: string;
  const intervalFromUser = (): { dt: number; source: string } | null =>
    given !== undefined
      ? { dt: given, source: 'given' }
      : fromPreamble
        ? {
            dt: fromPreamble.sampleIntervalS,
            source: `preamble line ${fromPreamble.line}: ${fromPreamble.key} ${fromPreamble.value}`,
          }
        : null;
  if (hasTime) {
    const time = columns[0];
    const bad = rows >= 2 ? firstIrregularStep(time, timeDecimals) : -1;
    if (bad > 0) {
      fail(
        'TEXT_IRREGULAR_TIME',
        `line ${lineNo[dataStart + bad]}, time ${time[bad]} breaks the regular step of the time column (previous time ${time[bad - 1]})`,
        file,
        `line ${lineNo[dataStart + bad]}, column 1`,
      );
    }
    const step = (time[rows - 1] - time[0]) / (rows - 1);
    if (timeUnit === 'sample') {
      const u = intervalFromUser();
      if (!u) {
        fail(
          'TEXT_NO_SAMPLE_INTERVAL',
          `the first column ("${header?.[0]}") counts samples, not time: give the sample interval`,
          file,
          'sample interval',
        );
      }
      dtS = step * u.dt;
      // Sample numbers counted from 1 put the first row at the trigger; from 0 likewise; others shift it.
      delayS = time[0] === 1 ? 0 : time[0] * u.dt;
      intervalSource = u.source;
      unitSource = 'header';
    } else {
      if (timeUnit === 'none') {
        if (opts.timeUnit) {
          timeUnit = opts.timeUnit;
          unitSource = 'given';
        } else {
          timeUnit = guessTimeUnit(step);
          unitSource = `guessed: step ${step} ${timeUnit === 'ms' ? '>=' : '<'} ${GUESS_MS_STEP_THRESHOLD} read as ${timeUnit}`;
          warnings.push({
            code: 'TEXT_TIME_UNIT_GUESSED',
            message: `${file}: the time column names no unit; step ${step} read as ${timeUnit} (sample interval ${step * SECONDS_PER_UNIT[timeUnit]} s)`,
            file,
            field: 'column 1',
          });
        }
      }
      const toS = SECONDS_PER_UNIT[timeUnit as 's' | 'ms' | 'us'];
      dtS = step * toS;
      delayS = time[0] * toS;
      intervalSource = 'time column';
      const u = intervalFromUser();
      if (u && Math.abs(u.dt - dtS) > 0.01 * dtS) {
        warnings.push({
          code: 'TEXT_SAMPLE_INTERVAL_DIFFERS',
          message: `${file}: the time column gives a sample interval of ${dtS} s; ${u.source} says ${u.dt} s (the time column is used)`,
          file,
          field: 'sample interval',
        });
      }
    }
    checkInterval(dtS, `the time column (${timeUnit})`, file, 'column 1');
  } else {
    const u = intervalFromUser();
    if (!u) {
      fail(
        'TEXT_NO_SAMPLE_INTERVAL',
        `${k} numeric column${k === 1 ? '' : 's'} from line ${dataLine}; no time column${header ? ` (first column "${header[0]}")` : ''}: give the sample interval`,
        file,
        'sample interval',
      );
    }
    dtS = u.dt;
    intervalSource = u.source;
  }
  if (preambleLines + comments.length > 0 && preambleLines > 0) {
    const first = preamble.filter((p) => !comments.includes(p));
    warnings.push({
      code: 'TEXT_PREAMBLE_SKIPPED',
      message: `${file}: skipped ${preambleLines} preamble line${preambleLines === 1 ? '' : 's'} (lines ${first[0].line}-${first[first.length - 1].line}) before the data from line ${dataLine}`,
      file,
      field: `lines ${first[0].line}-${first[first.length - 1].line}`,
    });
  }

  const traces: Trace[] = [];
  const c0 = hasTime ? 1 : 0;
  for (let c = c0; c < k; c++) {
    const strings: Record<string, string> = {};
    if (header) strings.COLUMN_NAME = header[c];
    traces.push({ channel: c - c0 + 1, samples: Float32Array.from(columns[c]), sampleIntervalS: dtS, delayS, strings });
  }
  const layout: TextLayout = {
    timeUnit,
    timeColumn: hasTime ? (header ? header[0] : 'column 1') : null,
    sampleIntervalSource: intervalSource,
    preambleLines,
    dataFromLine: dataLine,
  };
  return {
    id: fileName,
    fileName,
    format: 'text',
    fileStrings: {
      TIME_UNIT: layout.timeUnit,
      TIME_UNIT_SOURCE: unitSource || 'none',
      SEPARATOR: separator === '\t' ? 'tab' : separator,
      ...(layout.timeColumn !== null ? { TIME_COLUMN: layout.timeColumn } : {}),
      SAMPLE_INTERVAL_SOURCE: layout.sampleIntervalSource,
      PREAMBLE_LINES: String(preambleLines),
      DATA_FROM_LINE: String(dataLine),
    },
    notes: [],
    traces,
    ...(warnings.length > 0 ? { warnings } : {}),
  };
}

/** Layout of a text record as the reader found it (from its fileStrings), or null for other formats. */
export function textLayout(rec: WaveRecord): TextLayout | null {
  if (rec.format !== 'text') return null;
  const f = rec.fileStrings;
  return {
    timeUnit: (f.TIME_UNIT ?? 'none') as TextLayout['timeUnit'],
    timeColumn: f.TIME_COLUMN ?? null,
    sampleIntervalSource: f.SAMPLE_INTERVAL_SOURCE ?? '',
    preambleLines: Number(f.PREAMBLE_LINES ?? 0),
    dataFromLine: Number(f.DATA_FROM_LINE ?? 1),
  };
}

function decimalsIn(text: string, a: number, b: number): number {
  for (let i = a; i < b; i++) {
    const c = text.charCodeAt(i);
    if (c === 101 || c === 69) return 15;
  }
  for (let i = a; i < b; i++) {
    const c = text.charCodeAt(i);
    if (c === 46 || c === 44) return b - i - 1;
  }
  return 0;
}

/** "Time (us)" split by whitespace into "Time", "(us)": glue bracketed unit tokens to the word before. */
function mergeUnitTokens(cells: string[]): string[] {
  const out: string[] = [];
  for (const c of cells) {
    if (out.length > 0 && /^[([].*[)\]]$/.test(c)) out[out.length - 1] += ` ${c}`;
    else out.push(c);
  }
  return out;
}

function findPreambleInterval(preamble: { line: number; text: string }[], file: string): PreambleInterval | null {
  for (const p of preamble) {
    const hit = preambleInterval(p.text);
    if (!hit) continue;
    checkInterval(hit.sampleIntervalS, `preamble line ${p.line} (${hit.key} ${hit.value})`, file, `line ${p.line}`);
    return { ...hit, line: p.line };
  }
  return null;
}
