/**
 * Format dispatch for waveform files, and the per-file summary printed by `inspect`.
 */
import { BorewaveError, toErrorInfo, type ErrorInfo } from '../errors';
import type { ByteOrder, TimeBase, WaveRecord } from '../model';
import { decodeText, hexPrefix, looksLikeText, textBom } from './bytes';
import { readSeg2, seg2ByteOrder } from './seg2';
import { readDelimitedText, type TextReadOptions, textLayout } from './text';

export type ReadOutcome = { ok: true; record: WaveRecord } | { ok: false; error: ErrorInfo };

const SEG2_EXTENSIONS = /\.(sg2|seg2|seg)$/i;

/** Largest text waveform file read (bytes), checked before decoding. */
export const MAX_TEXT_FILE_BYTES = 256 * 1024 * 1024;

/** Options for one file: text files without a time column need the sample interval. */
export type WaveReadOptions = TextReadOptions;

/**
 * Read one waveform file: SEG-2 when it starts with the SEG-2 file block id (either byte order) or has
 * a SEG-2 extension, else delimited text when the bytes are text (UTF-8, or UTF-16 with a byte order
 * mark), else an error. Never throws.
 */
export function readWaveFile(bytes: Uint8Array, fileName: string, opts: WaveReadOptions = {}): ReadOutcome {
  try {
    if (bytes.length === 0) {
      throw new BorewaveError('FILE_EMPTY', `${fileName}: the file is empty (0 bytes)`, fileName);
    }
    if (seg2ByteOrder(bytes) || SEG2_EXTENSIONS.test(fileName)) return { ok: true, record: readSeg2(bytes, fileName) };
    const bom = textBom(bytes);
    if (bom !== null || looksLikeText(bytes)) {
      if (bytes.length > MAX_TEXT_FILE_BYTES) {
        throw new BorewaveError(
          'TEXT_TOO_LARGE',
          `${fileName}: ${bytes.length} bytes, more than the ${MAX_TEXT_FILE_BYTES} a text waveform file can have`,
          fileName,
        );
      }
      const { text, encoding } = decodeText(bytes);
      const record = readDelimitedText(text, fileName, opts);
      if (encoding !== 'utf-8') record.fileStrings.ENCODING = encoding;
      return { ok: true, record };
    }
    throw new BorewaveError(
      'UNKNOWN_FORMAT',
      `${fileName}: not a SEG-2 file (first bytes ${hexPrefix(bytes)}, expected 55 3a or 3a 55) and not text`,
      fileName,
      'file block id',
    );
  } catch (e) {
    const info = toErrorInfo(e, fileName);
    return { ok: false, error: { ...info, file: info.file ?? fileName } };
  }
}

// ------------------------------------------------------------------ summary

export interface TraceSummary {
  channel: number;
  samples: number;
  sampleIntervalS: number;
  delayS: number;
  min: number;
  max: number;
  rms: number;
  receiverLocation?: number[];
  sourceLocation?: number[];
  /** SEG-2 SKEW / trigger-sample shift applied beyond DELAY (docs/seg2-vendor-keywords.md). */
  timeBase?: TimeBase;
  /** SEG-2 SCALE_UNIT as written. */
  scaleUnit?: string;
}

export type FileSummary =
  | {
      file: string;
      ok: true;
      format: WaveRecord['format'];
      byteOrder?: ByteOrder;
      formatCode?: number;
      /** Record id in the session (unique even when two files share a name). */
      recordId: string;
      notes: string[];
      /** Problems that did not stop the reading. */
      warnings: ErrorInfo[];
      /** Text: unit of the time column ('none' without one), its header (null without one). */
      timeUnit?: string;
      timeColumn?: string | null;
      /** Text: where the sample interval came from ('time column', 'given', 'preamble line 3: ...'). */
      sampleIntervalSource?: string;
      /** Text: lines skipped before the data (header not counted). */
      preambleLines?: number;
      /** Text: encoding when not UTF-8. */
      encoding?: string;
      traces: TraceSummary[];
    }
  | { file: string; ok: false; error: ErrorInfo };

/** Min, max and RMS of samples (0 for an empty trace). */
export function sampleStats(samples: ArrayLike<number>): { min: number; max: number; rms: number } {
  const n = samples.length;
  if (n === 0) return { min: 0, max: 0, rms: 0 };
  let min = Infinity;
  let max = -Infinity;
  let sumSq = 0;
  for (let i = 0; i < n; i++) {
    const x = samples[i];
    if (x < min) min = x;
    if (x > max) max = x;
    sumSq += x * x;
  }
  return { min, max, rms: Math.sqrt(sumSq / n) };
}

/** Summary of a record (values after DESCALING_FACTOR, positions as written in the file). */
export function summarizeRecord(record: WaveRecord): FileSummary {
  const layout = textLayout(record);
  return {
    file: record.fileName,
    ok: true,
    format: record.format,
    ...(record.byteOrder ? { byteOrder: record.byteOrder } : {}),
    ...(record.formatCode !== undefined ? { formatCode: record.formatCode } : {}),
    recordId: record.id,
    notes: record.notes,
    warnings: record.warnings ?? [],
    ...(layout
      ? {
          timeUnit: layout.timeUnit,
          timeColumn: layout.timeColumn,
          sampleIntervalSource: layout.sampleIntervalSource,
          preambleLines: layout.preambleLines,
          ...(record.fileStrings.ENCODING ? { encoding: record.fileStrings.ENCODING } : {}),
        }
      : {}),
    traces: record.traces.map((t) => ({
      channel: t.channel,
      samples: t.samples.length,
      sampleIntervalS: t.sampleIntervalS,
      delayS: t.delayS,
      ...sampleStats(t.samples),
      ...(t.receiverLocation ? { receiverLocation: t.receiverLocation } : {}),
      ...(t.sourceLocation ? { sourceLocation: t.sourceLocation } : {}),
      ...(t.timeBase ? { timeBase: t.timeBase } : {}),
      ...(t.strings.SCALE_UNIT !== undefined ? { scaleUnit: t.strings.SCALE_UNIT } : {}),
    })),
  };
}

/** Summary of one read outcome. */
export function summarizeOutcome(fileName: string, outcome: ReadOutcome): FileSummary {
  return outcome.ok
    ? { ...summarizeRecord(outcome.record), file: fileName }
    : { file: fileName, ok: false, error: outcome.error };
}
