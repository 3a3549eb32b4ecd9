/**
 * Format dispatch for waveform files, and the per-file summary printed by `inspect`.
 */
import { BorewaveError, toErrorInfo, type ErrorInfo } from '../errors';
import type { ByteOrder, WaveRecord } from '../model';
import { decodeUtf8, hexPrefix, looksLikeText } from './bytes';
import { readSeg2, seg2ByteOrder } from './seg2';
import { readDelimitedText } from './text';

export type ReadOutcome = { ok: true; record: WaveRecord } | { ok: false; error: ErrorInfo };

const SEG2_EXTENSIONS = /\.(sg2|seg2|seg)$/i;

/**
 * Read one waveform file: SEG-2 when it starts with the SEG-2 file block id (either byte order) or has
 * a SEG-2 extension, else delimited text when the bytes are text, else an error. Never throws.
 */
export function readWaveFile(bytes: Uint8Array, fileName: string): ReadOutcome {
  try {
    if (bytes.length === 0) {
      throw new BorewaveError('FILE_EMPTY', `${fileName}: the file is empty (0 bytes)`, fileName);
    }
    if (seg2ByteOrder(bytes) || SEG2_EXTENSIONS.test(fileName)) return { ok: true, record: readSeg2(bytes, fileName) };
    if (looksLikeText(bytes)) return { ok: true, record: readDelimitedText(decodeUtf8(bytes), fileName) };
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
}

export type FileSummary =
  | {
      file: string;
      ok: true;
      format: WaveRecord['format'];
      byteOrder?: ByteOrder;
      formatCode?: number;
      notes: string[];
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
  return {
    file: record.fileName,
    ok: true,
    format: record.format,
    ...(record.byteOrder ? { byteOrder: record.byteOrder } : {}),
    ...(record.formatCode !== undefined ? { formatCode: record.formatCode } : {}),
    notes: record.notes,
    traces: record.traces.map((t) => ({
      channel: t.channel,
      samples: t.samples.length,
      sampleIntervalS: t.sampleIntervalS,
      delayS: t.delayS,
      ...sampleStats(t.samples),
      ...(t.receiverLocation ? { receiverLocation: t.receiverLocation } : {}),
      ...(t.sourceLocation ? { sourceLocation: t.sourceLocation } : {}),
    })),
  };
}

/** Summary of one read outcome. */
export function summarizeOutcome(fileName: string, outcome: ReadOutcome): FileSummary {
  return outcome.ok
    ? { ...summarizeRecord(outcome.record), file: fileName }
    : { file: fileName, ok: false, error: outcome.error };
}
