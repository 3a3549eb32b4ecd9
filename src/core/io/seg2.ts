/**
 * SEG-2 reader and writer.
 * Layout: Pullan, S.E., 1990, "Recommended standard for seismic (/radar) data files in the personal
 * computer environment", Geophysics 55(9), 1260-1271 (the open SEG-2 standard). Summary in
 * docs/methods.md section 1.
 *
 * Every declared size and pointer is checked against the file length before anything is allocated
 * or read, so a corrupt header fails with a typed error instead of allocating or reading past the end.
 */
import { BorewaveError, type ErrorCode, type ErrorInfo } from '../errors';
import type { ByteOrder, TimeBase, Trace, WaveRecord } from '../model';
import { decodeUtf8, encodeUtf8 } from './bytes';

/** File descriptor block id (Pullan 1990). */
export const SEG2_FILE_BLOCK_ID = 0x3a55;
/** Trace descriptor block id (Pullan 1990). */
export const SEG2_TRACE_BLOCK_ID = 0x4422;
const FILE_HEADER_BYTES = 32;
const TRACE_HEADER_BYTES = 32;

/** Bytes per sample for each data format code; format 3 packs 4 samples in 10 bytes. */
const BYTES_PER_SAMPLE: Record<number, number> = { 1: 2, 2: 4, 3: 2.5, 4: 4, 5: 8 };

interface Terminators {
  stringTerminator: string;
  lineTerminator: string;
}

function fail(code: ErrorCode, message: string, file: string, field?: string): never {
  throw new BorewaveError(code, `${file}: ${message}`, file, field);
}

/** Byte order from the first two bytes, or null when they are not the SEG-2 file block id. */
export function seg2ByteOrder(bytes: Uint8Array): ByteOrder | null {
  if (bytes.length < 2) return null;
  if (bytes[0] === 0x55 && bytes[1] === 0x3a) return 'little';
  if (bytes[0] === 0x3a && bytes[1] === 0x55) return 'big';
  return null;
}

// ------------------------------------------------------------------ strings

/** Keyword = text up to the first whitespace (upper-cased); value = the rest, trimmed. */
export function splitKeyword(entry: string): [string, string] {
  const m = /^\s*(\S+)([\s\S]*)$/.exec(entry);
  if (!m) return ['', ''];
  return [m[1].toUpperCase(), m[2].trim()];
}

/**
 * Read a string list starting at `start`, not going past `end`. Each entry: u16 offset to the next
 * entry (counting the length word and terminator), then the text, then the string terminator.
 * A zero length word (or reaching `end`) ends the list.
 */
function readStringList(
  view: DataView,
  bytes: Uint8Array,
  start: number,
  end: number,
  little: boolean,
  term: Terminators,
  file: string,
  where: string,
): StringList {
  const out: Record<string, string> = {};
  const all: Record<string, string[]> = {};
  let off = start;
  while (off + 2 <= end) {
    const len = view.getUint16(off, little);
    if (len === 0) break;
    if (len < 2 || off + len > end) {
      fail(
        'SEG2_BAD_STRING',
        `${where} string at byte ${off} declares length ${len}, which runs past its block (ends at byte ${end})`,
        file,
        `byte ${off}`,
      );
    }
    let text = decodeUtf8(bytes.subarray(off + 2, off + len));
    const cut = text.indexOf(term.stringTerminator);
    if (cut >= 0) text = text.slice(0, cut);
    text = text.replace(/\0+$/, '');
    const [keyword, value] = splitKeyword(text);
    if (keyword) {
      out[keyword] = value;
      if (!Object.hasOwn(all, keyword)) all[keyword] = [];
      all[keyword].push(value);
    }
    off += len;
  }
  const lists: Record<string, string[]> = {};
  for (const [k, v] of Object.entries(all)) if (v.length > 1) lists[k] = v;
  return { last: out, lists };
}

/** A string sub-block: the last value of each keyword, and every value of keywords written more than once. */
interface StringList {
  last: Record<string, string>;
  lists: Record<string, string[]>;
}

function terminatorAt(bytes: Uint8Array, lenOffset: number, file: string, field: string): string {
  const n = bytes[lenOffset];
  if (n !== 1 && n !== 2) {
    fail('SEG2_BAD_TERMINATOR', `${field} length is ${n}; the standard allows 1 or 2`, file, field);
  }
  return String.fromCharCode(...bytes.subarray(lenOffset + 1, lenOffset + 1 + n));
}

// ------------------------------------------------------------------ keyword values

/**
 * A plain decimal number (optional sign, digits, optional fraction, optional exponent). Hexadecimal
 * ("0x10"), "Infinity", "NaN", binary or octal prefixes and empty text are refused: Pullan (1990)
 * writes numbers as decimal ASCII text.
 */
const DECIMAL_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d{1,3})?$/;

/** Strict decimal number, or NaN when the text is not one (or overflows). */
export function strictDecimal(text: string): number {
  if (!DECIMAL_RE.test(text)) return NaN;
  const x = Number(text);
  return Number.isFinite(x) ? x : NaN;
}

function parseNumbers(value: string, keyword: string, file: string, where: string): number[] {
  const parts = value.split(/[\s,;]+/).filter((p) => p.length > 0);
  const nums = parts.map(strictDecimal);
  const bad = parts.find((_, i) => Number.isNaN(nums[i]));
  if (parts.length === 0 || bad !== undefined) {
    fail(
      'SEG2_BAD_KEYWORD_VALUE',
      `${where}: ${keyword} "${value}" is not a list of decimal numbers${bad !== undefined ? ` ("${bad}")` : ''}`,
      file,
      keyword,
    );
  }
  return nums;
}

/** First number of a keyword value, checked to lie in [min, max]. */
function parseBounded(
  value: string,
  keyword: string,
  file: string,
  where: string,
  min: number,
  max: number,
  what: string,
): number {
  const x = parseNumbers(value, keyword, file, where)[0];
  if (!(x >= min && x <= max)) {
    fail(
      'SEG2_IMPLAUSIBLE_VALUE',
      `${where}: ${keyword} "${value}" is outside the plausible range ${min} to ${max} ${what}`,
      file,
      keyword,
    );
  }
  return x;
}

/** Plausible ranges (common practice for seismographs; wider than any borehole survey needs). */
export const SEG2_LIMITS = {
  /** Sample interval, s: 0.1 microsecond (10 MHz) to 1 s. */
  sampleIntervalS: [1e-7, 1] as const,
  /** Positive DELAY (recording starts after the trigger), s. */
  maxPositiveDelayS: 100,
  /** Receiver and source coordinates, file units (m or ft). */
  maxAbsLocation: 1e6,
  /** DESCALING_FACTOR magnitude. */
  descaling: [1e-30, 1e30] as const,
  /** CHANNEL_NUMBER. */
  maxChannel: 65535,
};

/** NOTE text split into lines on the declared line terminator (also CR/LF), blank lines dropped. */
export function splitNoteLines(note: string, lineTerminator: string): string[] {
  const pieces = lineTerminator ? note.split(lineTerminator) : [note];
  return pieces
    .flatMap((p) => p.split(/\r\n|\r|\n/))
    .map((p) => p.trim())
    .filter((p) => p.length > 0);
}

// ------------------------------------------------------------------ sample decoding

/**
 * Decode 20-bit floating point samples (format 3): groups of five 16-bit words; word 0 holds four
 * 4-bit exponents (lowest nibble for the first sample), words 1-4 are one's complement mantissas
 * (read as int16, add 1 when negative); value = mantissa * 2^exponent. (docs/methods.md section 1.)
 */
export function decode20BitGroup(view: DataView, offset: number, little: boolean, out: Float64Array, at: number): void {
  const exps = view.getUint16(offset, little);
  for (let k = 0; k < 4; k++) {
    const e = (exps >> (4 * k)) & 0xf;
    let m = view.getInt16(offset + 2 + 2 * k, little);
    if (m < 0) m += 1;
    out[at + k] = m * 2 ** e;
  }
}

function decodeSamples(view: DataView, start: number, ns: number, code: number, little: boolean): Float64Array {
  const out = new Float64Array(ns);
  switch (code) {
    case 1:
      for (let i = 0; i < ns; i++) out[i] = view.getInt16(start + 2 * i, little);
      break;
    case 2:
      for (let i = 0; i < ns; i++) out[i] = view.getInt32(start + 4 * i, little);
      break;
    case 3:
      for (let g = 0; g < ns / 4; g++) decode20BitGroup(view, start + 10 * g, little, out, 4 * g);
      break;
    case 4:
      for (let i = 0; i < ns; i++) out[i] = view.getFloat32(start + 4 * i, little);
      break;
    case 5:
      for (let i = 0; i < ns; i++) out[i] = view.getFloat64(start + 8 * i, little);
      break;
  }
  return out;
}

// ------------------------------------------------------------------ reader

interface TraceBlock {
  pointer: number;
  headerBytes: number;
  dataBytes: number;
  sampleCount: number;
  formatCode: number;
}

/** Check one trace descriptor block's declared sizes against the file length; nothing is allocated. */
function checkTraceBlock(
  view: DataView,
  fileLength: number,
  pointer: number,
  little: boolean,
  index: number,
  file: string,
): TraceBlock {
  const where = `trace ${index + 1} (descriptor at byte ${pointer})`;
  if (pointer + TRACE_HEADER_BYTES > fileLength) {
    fail(
      'SEG2_POINTER_PAST_END',
      `${where}: pointer leaves no room for a 32-byte trace descriptor in a ${fileLength}-byte file`,
      file,
      `trace pointer ${index + 1}`,
    );
  }
  const id = view.getUint16(pointer, little);
  if (id !== SEG2_TRACE_BLOCK_ID) {
    fail(
      'SEG2_BAD_BLOCK_ID',
      `${where}: block id is 0x${id.toString(16)}, expected 0x4422`,
      file,
      `trace ${index + 1} block id`,
    );
  }
  const headerBytes = view.getUint16(pointer + 2, little);
  const dataBytes = view.getUint32(pointer + 4, little);
  const sampleCount = view.getUint32(pointer + 8, little);
  const formatCode = view.getUint8(pointer + 12);
  if (headerBytes < TRACE_HEADER_BYTES || pointer + headerBytes > fileLength) {
    fail(
      'SEG2_TRUNCATED',
      `${where}: descriptor size ${headerBytes} bytes runs past the end of the ${fileLength}-byte file or is below 32`,
      file,
      `trace ${index + 1} descriptor size`,
    );
  }
  const bps = BYTES_PER_SAMPLE[formatCode];
  if (bps === undefined) {
    fail(
      'SEG2_BAD_FORMAT_CODE',
      `${where}: data format code ${formatCode} is not one of 1, 2, 3, 4, 5`,
      file,
      `trace ${index + 1} format code`,
    );
  }
  if (formatCode === 3 && sampleCount % 4 !== 0) {
    fail(
      'SEG2_BAD_SAMPLE_COUNT',
      `${where}: format 3 needs a multiple of 4 samples, found ${sampleCount}`,
      file,
      `trace ${index + 1} samples`,
    );
  }
  const available = fileLength - (pointer + headerBytes);
  const needed = sampleCount * bps;
  if (needed > fileLength) {
    fail(
      'SEG2_ABSURD_SAMPLE_COUNT',
      `${where}: ${sampleCount} samples would need ${needed} bytes, more than the whole ${fileLength}-byte file`,
      file,
      `trace ${index + 1} samples`,
    );
  }
  if (needed > available) {
    fail(
      'SEG2_TRUNCATED',
      `${where}: ${sampleCount} samples need ${needed} bytes but only ${available} remain`,
      file,
      `trace ${index + 1} data`,
    );
  }
  if (dataBytes < needed) {
    fail(
      'SEG2_BAD_DATA_SIZE',
      `${where}: data block size ${dataBytes} bytes is smaller than ${sampleCount} samples need (${needed})`,
      file,
      `trace ${index + 1} data size`,
    );
  }
  return { pointer, headerBytes, dataBytes, sampleCount, formatCode };
}

/**
 * Read a SEG-2 file (either byte order, data formats 1-5). Throws BorewaveError naming the file,
 * the field and the problem; problems that do not stop the reading are in record.warnings.
 */
export function readSeg2(bytes: Uint8Array, fileName: string): WaveRecord {
  const file = fileName;
  const n = bytes.length;
  if (n === 0) fail('SEG2_EMPTY_FILE', 'the file is empty (0 bytes)', file);
  const byteOrder = seg2ByteOrder(bytes);
  if (!byteOrder) {
    const got = Array.from(bytes.subarray(0, 2), (b) => b.toString(16).padStart(2, '0')).join(' ');
    fail(
      'SEG2_BAD_BLOCK_ID',
      `file block id bytes are "${got}", expected "55 3a" (little-endian) or "3a 55" (big-endian)`,
      file,
      'file block id',
    );
  }
  if (n < FILE_HEADER_BYTES)
    fail('SEG2_TRUNCATED', `the file has ${n} bytes, fewer than the 32-byte file descriptor`, file, 'file descriptor');
  const little = byteOrder === 'little';
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const warnings: ErrorInfo[] = [];
  const revision = view.getUint16(2, little);
  if (revision !== 1) {
    // Pullan (1990) defines revision 1 only; later revisions are read as revision 1.
    warnings.push({
      code: 'SEG2_REVISION',
      message: `${file}: revision number ${revision}; the standard defines revision 1, read as revision 1`,
      file,
      field: 'revision number',
    });
  }
  const pointerBlockBytes = view.getUint16(4, little);
  const traceCount = view.getUint16(6, little);
  if (traceCount === 0) {
    fail('SEG2_NO_TRACES', 'the file descriptor declares 0 traces: there is no waveform to read', file, 'trace count');
  }
  if (4 * traceCount > pointerBlockBytes) {
    fail(
      'SEG2_BAD_POINTER_BLOCK',
      `${traceCount} traces need ${4 * traceCount} pointer bytes but the pointer block holds ${pointerBlockBytes}`,
      file,
      'trace pointer block size',
    );
  }
  if (FILE_HEADER_BYTES + pointerBlockBytes > n) {
    fail(
      'SEG2_TRUNCATED',
      `the trace pointer block (${pointerBlockBytes} bytes at byte 32) runs past the end of the ${n}-byte file`,
      file,
      'trace pointer block',
    );
  }
  const term: Terminators = {
    stringTerminator: terminatorAt(bytes, 8, file, 'string terminator'),
    lineTerminator: terminatorAt(bytes, 11, file, 'line terminator'),
  };

  const pointers: number[] = [];
  for (let i = 0; i < traceCount; i++) pointers.push(view.getUint32(FILE_HEADER_BYTES + 4 * i, little));
  // Validate every trace block's sizes before decoding anything.
  const blocks = pointers.map((p, i) => checkTraceBlock(view, n, p, little, i, file));
  // Traces sharing or overlapping data could multiply the allocation: their data must fit the file together.
  const totalDataBytes = blocks.reduce((s, b) => s + b.sampleCount * BYTES_PER_SAMPLE[b.formatCode], 0);
  if (totalDataBytes > n) {
    fail(
      'SEG2_ABSURD_SAMPLE_COUNT',
      `the ${traceCount} traces together declare ${totalDataBytes} data bytes, more than the ${n}-byte file holds`,
      file,
      'trace sample counts',
    );
  }

  const fileStringsStart = FILE_HEADER_BYTES + pointerBlockBytes;
  const firstTrace = pointers.filter((p) => p >= fileStringsStart).reduce((a, b) => Math.min(a, b), n);
  const fileList = readStringList(view, bytes, fileStringsStart, firstTrace, little, term, file, 'file');
  const fileStrings = fileList.last;
  const noteTexts = fileList.lists.NOTE ?? (fileStrings.NOTE !== undefined ? [fileStrings.NOTE] : []);
  const notes = noteTexts.flatMap((t) => splitNoteLines(t, term.lineTerminator));

  const traces: Trace[] = blocks.map((b, i) => readTrace(view, bytes, b, i, little, term, fileStrings, file));
  const seen = new Map<number, number>();
  traces.forEach((t, i) => {
    const first = seen.get(t.channel);
    if (first !== undefined) {
      fail(
        'SEG2_DUPLICATE_CHANNEL',
        `traces ${first + 1} and ${i + 1} both carry CHANNEL_NUMBER ${t.channel}; channels must be unique to map them to receivers`,
        file,
        'CHANNEL_NUMBER',
      );
    }
    seen.set(t.channel, i);
  });
  return {
    id: fileName,
    fileName,
    format: 'seg2',
    byteOrder,
    formatCode: blocks[0].formatCode,
    fileStrings,
    ...(Object.keys(fileList.lists).length > 0 ? { fileStringLists: fileList.lists } : {}),
    notes,
    traces,
    ...(warnings.length > 0 ? { warnings } : {}),
  };
}

/**
 * Time of sample 0 after the trigger from the header. Pullan (1990) defines DELAY (s, negative =
 * recording started before the trigger). SKEW, TRIGGER_SAMPLE_NO and FIRST_SAMPLE_NO are not in the
 * standard; instruments write them. ASSUMPTIONS (reasoning in docs/seg2-vendor-keywords.md):
 * - SKEW (s) is added to the time of every sample: t_i = DELAY + SKEW + i*dt. A negative SKEW
 *   (the usual sign: a converter or filter latency) moves every sample earlier.
 * - TRIGGER_SAMPLE_NO is the number of the sample taken at the trigger, counted from FIRST_SAMPLE_NO
 *   (1 when absent), so sample 0 lies (TRIGGER_SAMPLE_NO - FIRST_SAMPLE_NO) samples before the trigger.
 *   It sets the pre-trigger part only when DELAY is absent or 0; a non-zero DELAY that disagrees by
 *   more than half a sample is an error (SEG2_TRIGGER_CONFLICT): the trigger time would be a guess.
 */
export function seg2TimeBase(
  kw: { delay?: number; skew?: number; triggerSampleNo?: number; firstSampleNo?: number },
  sampleIntervalS: number,
): { delayS: number; timeBase: TimeBase; conflict: boolean } {
  const delayKeywordS = kw.delay ?? 0;
  const skewS = kw.skew ?? 0;
  const triggerIndex = kw.triggerSampleNo !== undefined ? kw.triggerSampleNo - (kw.firstSampleNo ?? 1) : null;
  let pre = delayKeywordS;
  let delaySource: TimeBase['delaySource'] = 'DELAY';
  let conflict = false;
  if (triggerIndex !== null) {
    const fromTrigger = -triggerIndex * sampleIntervalS;
    if (delayKeywordS === 0) {
      pre = fromTrigger;
      delaySource = 'TRIGGER_SAMPLE_NO';
    } else if (Math.abs(delayKeywordS - fromTrigger) > 0.5 * sampleIntervalS) conflict = true;
  }
  const delayS = pre + skewS;
  return {
    delayS,
    conflict,
    timeBase: { delayKeywordS, skewS, triggerIndex, delaySource, shiftS: delayS - delayKeywordS },
  };
}

function readTrace(
  view: DataView,
  bytes: Uint8Array,
  b: TraceBlock,
  index: number,
  little: boolean,
  term: Terminators,
  fileStrings: Record<string, string>,
  file: string,
): Trace {
  const where = `trace ${index + 1}`;
  const list = readStringList(
    view,
    bytes,
    b.pointer + TRACE_HEADER_BYTES,
    b.pointer + b.headerBytes,
    little,
    term,
    file,
    where,
  );
  const strings = list.last;
  // Trace values override file values of the same keyword.
  const merged: Record<string, string> = { ...fileStrings, ...strings };
  const has = (k: string) => Object.hasOwn(merged, k);

  const siText = merged.SAMPLE_INTERVAL;
  const siRaw = siText === undefined ? NaN : strictDecimal(siText.split(/\s+/)[0]);
  const [siMin, siMax] = SEG2_LIMITS.sampleIntervalS;
  if (!(siRaw >= siMin && siRaw <= siMax)) {
    fail(
      'SEG2_BAD_SAMPLE_INTERVAL',
      `${where}: SAMPLE_INTERVAL is ${siText === undefined ? 'missing' : `"${siText}"`}; it must be a decimal number of seconds from ${siMin} to ${siMax}`,
      file,
      'SAMPLE_INTERVAL',
    );
  }
  const sampleIntervalS = siRaw;
  const recordS = b.sampleCount * sampleIntervalS;
  const delay = has('DELAY')
    ? parseBounded(
        merged.DELAY,
        'DELAY',
        file,
        where,
        -recordS,
        SEG2_LIMITS.maxPositiveDelayS,
        `s (a pre-trigger delay cannot exceed the ${b.sampleCount}-sample record, ${recordS} s)`,
      )
    : undefined;
  const skew = has('SKEW')
    ? parseBounded(merged.SKEW, 'SKEW', file, where, -recordS, recordS, `s (at most the record length, ${recordS} s)`)
    : undefined;
  const firstSampleNo = has('FIRST_SAMPLE_NO')
    ? parseBounded(
        merged.FIRST_SAMPLE_NO,
        'FIRST_SAMPLE_NO',
        file,
        where,
        0,
        1,
        '(the first sample is numbered 0 or 1)',
      )
    : undefined;
  const triggerSampleNo = has('TRIGGER_SAMPLE_NO')
    ? parseBounded(
        merged.TRIGGER_SAMPLE_NO,
        'TRIGGER_SAMPLE_NO',
        file,
        where,
        firstSampleNo ?? 1,
        (firstSampleNo ?? 1) + b.sampleCount - 1,
        '(a sample of this trace)',
      )
    : undefined;
  for (const [k, v] of [
    ['FIRST_SAMPLE_NO', firstSampleNo],
    ['TRIGGER_SAMPLE_NO', triggerSampleNo],
  ] as const) {
    if (v !== undefined && !Number.isInteger(v))
      fail('SEG2_BAD_KEYWORD_VALUE', `${where}: ${k} "${merged[k]}" is not a whole sample number`, file, k);
  }
  const [dMin, dMax] = SEG2_LIMITS.descaling;
  const descaling = has('DESCALING_FACTOR')
    ? parseNumbers(merged.DESCALING_FACTOR, 'DESCALING_FACTOR', file, where)[0]
    : 1;
  if (!(Math.abs(descaling) >= dMin && Math.abs(descaling) <= dMax)) {
    fail(
      'SEG2_IMPLAUSIBLE_VALUE',
      `${where}: DESCALING_FACTOR "${merged.DESCALING_FACTOR}" must be non-zero with a magnitude from ${dMin} to ${dMax}`,
      file,
      'DESCALING_FACTOR',
    );
  }
  const channel = has('CHANNEL_NUMBER')
    ? parseBounded(merged.CHANNEL_NUMBER, 'CHANNEL_NUMBER', file, where, 0, SEG2_LIMITS.maxChannel, '')
    : index + 1;
  if (!Number.isInteger(channel)) {
    fail(
      'SEG2_BAD_CHANNEL',
      `${where}: CHANNEL_NUMBER "${merged.CHANNEL_NUMBER}" is not a whole number`,
      file,
      'CHANNEL_NUMBER',
    );
  }
  const location = (k: 'RECEIVER_LOCATION' | 'SOURCE_LOCATION') => {
    if (!has(k)) return undefined;
    const xs = parseNumbers(merged[k], k, file, where);
    if (xs.some((x) => Math.abs(x) > SEG2_LIMITS.maxAbsLocation))
      fail(
        'SEG2_IMPLAUSIBLE_VALUE',
        `${where}: ${k} "${merged[k]}" has a coordinate beyond ${SEG2_LIMITS.maxAbsLocation}`,
        file,
        k,
      );
    return xs;
  };
  const receiverLocation = location('RECEIVER_LOCATION');
  const sourceLocation = location('SOURCE_LOCATION');
  const { delayS, timeBase, conflict } = seg2TimeBase({ delay, skew, triggerSampleNo, firstSampleNo }, sampleIntervalS);
  if (conflict) {
    fail(
      'SEG2_TRIGGER_CONFLICT',
      `${where}: DELAY "${merged.DELAY}" s and TRIGGER_SAMPLE_NO "${merged.TRIGGER_SAMPLE_NO}" (first sample ${firstSampleNo ?? 1}) place the trigger more than half a sample apart`,
      file,
      'TRIGGER_SAMPLE_NO',
    );
  }

  const raw = decodeSamples(view, b.pointer + b.headerBytes, b.sampleCount, b.formatCode, little);
  const samples = new Float32Array(raw.length);
  for (let i = 0; i < raw.length; i++) {
    const v = raw[i] * descaling;
    samples[i] = v;
    if (!Number.isFinite(samples[i])) {
      fail(
        'SEG2_NONFINITE_SAMPLE',
        `${where} (channel ${channel}), sample ${i}: value ${raw[i]} x DESCALING_FACTOR ${descaling} is not a finite 32-bit number`,
        file,
        `trace ${index + 1} sample ${i}`,
      );
    }
  }
  const trace: Trace = { channel, samples, sampleIntervalS, delayS, strings };
  if (Object.keys(list.lists).length > 0) trace.stringLists = list.lists;
  if (skew !== undefined || triggerSampleNo !== undefined) trace.timeBase = timeBase;
  if (receiverLocation) trace.receiverLocation = receiverLocation;
  if (sourceLocation) trace.sourceLocation = sourceLocation;
  return trace;
}

// ------------------------------------------------------------------ writer

export interface Seg2TraceInput {
  channel: number;
  samples: ArrayLike<number>;
  sampleIntervalS: number;
  delayS: number;
  receiverLocation?: number[];
  sourceLocation?: number[];
  strings?: Record<string, string>;
}

export interface Seg2WriteInput {
  fileStrings?: Record<string, string>;
  notes?: string[];
  traces: Seg2TraceInput[];
}

const STRING_TERMINATOR = 0x00;
const LINE_TERMINATOR = 0x0a;

/** Encode a string list (entries then a zero length word), padded to a multiple of 4 bytes. */
function encodeStringList(entries: [string, string][]): Uint8Array {
  const parts: Uint8Array[] = [];
  for (const [k, v] of entries) {
    const text = encodeUtf8(v.length > 0 ? `${k} ${v}` : k);
    const len = 2 + text.length + 1;
    if (len > 0xffff)
      throw new BorewaveError('SEG2_STRING_TOO_LONG', `SEG-2 string ${k} is longer than 65535 bytes`, undefined, k);
    const entry = new Uint8Array(len);
    new DataView(entry.buffer).setUint16(0, len, true); // rewritten in the file's byte order below
    entry.set(text, 2);
    entry[len - 1] = STRING_TERMINATOR;
    parts.push(entry);
  }
  const body = parts.reduce((s, p) => s + p.length, 0) + 2; // + zero length word
  const total = Math.ceil(body / 4) * 4;
  const out = new Uint8Array(total);
  let off = 0;
  for (const p of parts) {
    out.set(p, off);
    off += p.length;
  }
  return out;
}

/** Rewrite the length words of an encoded string list in the wanted byte order. */
function fixStringLengths(list: Uint8Array, little: boolean): void {
  const v = new DataView(list.buffer, list.byteOffset, list.byteLength);
  let off = 0;
  while (off + 2 <= list.length) {
    const len = v.getUint16(off, true);
    if (len === 0) break;
    v.setUint16(off, len, little);
    off += len;
  }
}

function formatNumber(x: number): string {
  return String(x); // shortest text that reads back to the same double
}

/**
 * Descaling factor for integer formats: the largest |sample| maps to the largest integer, so the
 * quantisation step is max|x| / intMax. All-zero traces get 1.
 */
export function chooseDescalingFactor(samples: ArrayLike<number>, formatCode: 1 | 2): number {
  let maxAbs = 0;
  for (let i = 0; i < samples.length; i++) maxAbs = Math.max(maxAbs, Math.abs(samples[i]));
  const intMax = formatCode === 1 ? 32767 : 2147483647;
  return maxAbs > 0 ? maxAbs / intMax : 1;
}

/** Write a SEG-2 file (revision 1, NUL string terminator, LF line terminator). */
export function writeSeg2(
  input: Seg2WriteInput,
  opts: { byteOrder: ByteOrder; formatCode: 1 | 2 | 4 | 5 },
): Uint8Array {
  const little = opts.byteOrder === 'little';
  const code = opts.formatCode;
  const bps = BYTES_PER_SAMPLE[code];
  const nTraces = input.traces.length;
  if (nTraces > 0xffff / 4)
    throw new BorewaveError('SEG2_TOO_MANY_TRACES', `SEG-2 holds at most 16383 traces, got ${nTraces}`);

  const fileEntries: [string, string][] = Object.entries(input.fileStrings ?? {}).filter(
    ([k]) => k.toUpperCase() !== 'NOTE',
  );
  if (input.notes && input.notes.length > 0)
    fileEntries.push([
      'NOTE',
      String.fromCharCode(LINE_TERMINATOR) + input.notes.join(String.fromCharCode(LINE_TERMINATOR)),
    ]);
  const fileList = encodeStringList(fileEntries);
  fixStringLengths(fileList, little);

  const pointerBlockBytes = 4 * nTraces;
  const traceParts: { header: Uint8Array; data: Uint8Array }[] = [];
  for (const t of input.traces) {
    for (let i = 0; i < t.samples.length; i++) {
      if (!Number.isFinite(t.samples[i]))
        throw new BorewaveError(
          'SEG2_NONFINITE_SAMPLE',
          `channel ${t.channel}, sample ${i} is not finite`,
          undefined,
          `channel ${t.channel}`,
        );
    }
    const descaling = code === 1 || code === 2 ? chooseDescalingFactor(t.samples, code) : 1;
    const own: Record<string, string> = {
      SAMPLE_INTERVAL: formatNumber(t.sampleIntervalS),
      DELAY: formatNumber(t.delayS),
      DESCALING_FACTOR: formatNumber(descaling),
      CHANNEL_NUMBER: formatNumber(t.channel),
    };
    if (t.receiverLocation) own.RECEIVER_LOCATION = t.receiverLocation.map(formatNumber).join(' ');
    if (t.sourceLocation) own.SOURCE_LOCATION = t.sourceLocation.map(formatNumber).join(' ');
    const extra = Object.entries(t.strings ?? {}).filter(([k]) => !(k.toUpperCase() in own));
    const list = encodeStringList([...Object.entries(own), ...extra]);
    fixStringLengths(list, little);

    const ns = t.samples.length;
    const data = new Uint8Array(ns * bps);
    const dv = new DataView(data.buffer);
    for (let i = 0; i < ns; i++) {
      const x = t.samples[i];
      if (code === 1) dv.setInt16(2 * i, Math.round(x / descaling), little);
      else if (code === 2) dv.setInt32(4 * i, Math.round(x / descaling), little);
      else if (code === 4) dv.setFloat32(4 * i, x, little);
      else dv.setFloat64(8 * i, x, little);
    }
    const header = new Uint8Array(TRACE_HEADER_BYTES + list.length);
    const hv = new DataView(header.buffer);
    hv.setUint16(0, SEG2_TRACE_BLOCK_ID, little);
    hv.setUint16(2, header.length, little);
    hv.setUint32(4, data.length, little);
    hv.setUint32(8, ns, little);
    hv.setUint8(12, code);
    header.set(list, TRACE_HEADER_BYTES);
    traceParts.push({ header, data });
  }

  const total =
    FILE_HEADER_BYTES +
    pointerBlockBytes +
    fileList.length +
    traceParts.reduce((s, p) => s + p.header.length + p.data.length, 0);
  const out = new Uint8Array(total);
  const v = new DataView(out.buffer);
  v.setUint16(0, SEG2_FILE_BLOCK_ID, little);
  v.setUint16(2, 1, little); // revision 1
  v.setUint16(4, pointerBlockBytes, little);
  v.setUint16(6, nTraces, little);
  out[8] = 1; // string terminator: one byte, NUL
  out[9] = STRING_TERMINATOR;
  out[11] = 1; // line terminator: one byte, LF
  out[12] = LINE_TERMINATOR;
  out.set(fileList, FILE_HEADER_BYTES + pointerBlockBytes);
  let off = FILE_HEADER_BYTES + pointerBlockBytes + fileList.length;
  traceParts.forEach((p, i) => {
    v.setUint32(FILE_HEADER_BYTES + 4 * i, off, little);
    out.set(p.header, off);
    out.set(p.data, off + p.header.length);
    off += p.header.length + p.data.length;
  });
  return out;
}
