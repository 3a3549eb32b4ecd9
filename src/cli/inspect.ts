/**
 * `inspect <files...> [--json] [--sample-interval-s <s>]`: per file its format, byte order, data
 * format, record id, traces, samples, sample interval, delay and the shift applied by SKEW / trigger
 * sample keywords, positions, min/max/RMS per trace, text layout (time unit and column, where the
 * sample interval came from, preamble lines), warnings, or its error. Exit code 1 when any file
 * failed. Relative paths are read from the caller's folder (io.cwd). The per-file work is
 * summarizeOutcome (src/core/io/readers.ts); this file only reads and prints.
 */
import { readFile } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';
import { type FileSummary, readWaveFile, summarizeOutcome, type WaveReadOptions } from '../core';
import { splitPath, uniqueRecordIds } from '../core';

export interface CliIo {
  stdout: { write(text: string): unknown };
  stderr: { write(text: string): unknown };
  /** Folder relative paths are resolved against (the caller's folder; default process.cwd()). */
  cwd?: string;
}

/** A path given on the command line, resolved against the caller's folder. */
export function cliPath(io: CliIo, path: string): string {
  return resolve(io.cwd ?? process.cwd(), path);
}

const USAGE = 'usage: inspect <files...> [--json] [--sample-interval-s <seconds>]\n';

export async function runInspect(args: string[], io: CliIo): Promise<number> {
  let json = false;
  const opts: WaveReadOptions = {};
  const files: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--json') json = true;
    else if (a === '--sample-interval-s') {
      const v = args[++i];
      const x = v !== undefined && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(v) ? Number(v) : Number.NaN;
      if (!(x > 0) || !Number.isFinite(x)) {
        io.stderr.write(`inspect: --sample-interval-s ${v ?? ''} is not a positive number of seconds\n${USAGE}`);
        return 2;
      }
      opts.sampleIntervalS = x;
    } else if (a.startsWith('--')) {
      io.stderr.write(`inspect: unknown option ${a}\n${USAGE}`);
      return 2;
    } else files.push(a);
  }
  if (files.length === 0) {
    io.stderr.write(USAGE);
    return 2;
  }
  // Same-name files (1.dat in two folders) get distinct record ids: folder, else an order suffix.
  const ids = uniqueRecordIds(
    files.map((p) => {
      const { name } = splitPath(p);
      const folder = dirname(p.replace(/\\/g, '/'));
      return { name, folder: folder === '.' ? '' : folder };
    }),
  );
  const summaries: FileSummary[] = [];
  for (const [k, path] of files.entries()) {
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await readFile(cliPath(io, path)));
    } catch (e) {
      const reason = e instanceof Error ? e.message : String(e);
      summaries.push({
        file: path,
        ok: false,
        error: { code: 'FILE_NOT_READABLE', message: `${path}: cannot read the file (${reason})`, file: path },
      });
      continue;
    }
    const outcome = readWaveFile(bytes, splitPath(path).name, opts);
    if (outcome.ok) outcome.record.id = ids[k];
    summaries.push(summarizeOutcome(path, outcome));
  }
  io.stdout.write(json ? `${JSON.stringify({ files: summaries }, null, 2)}\n` : formatTable(summaries));
  return summaries.every((s) => s.ok) ? 0 : 1;
}

function num(x: number, digits = 4): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e-3 && a < 1e6 ? String(Number(x.toPrecision(digits))) : x.toExponential(digits - 1);
}

function pos(p?: number[]): string {
  return p ? p.map((v) => num(v, 6)).join(' ') : '-';
}

function pad(cells: string[][]): string {
  const widths = cells[0].map((_, c) => Math.max(...cells.map((r) => r[c].length)));
  return `${cells.map((r) => `  ${r.map((v, c) => v.padStart(widths[c])).join('  ')}`).join('\n')}\n`;
}

/** Plain-text report: one block per file, a table of its traces. */
export function formatTable(summaries: FileSummary[]): string {
  const out: string[] = [];
  for (const s of summaries) {
    if (!s.ok) {
      out.push(`${s.file}: ERROR ${s.error.code}: ${s.error.message}\n`);
      continue;
    }
    const order = s.byteOrder ? `, ${s.byteOrder}-endian` : '';
    const code = s.formatCode !== undefined ? `, data format ${s.formatCode}` : '';
    const id = s.recordId !== s.file && s.recordId !== splitPath(s.file).name ? ` [record ${s.recordId}]` : '';
    out.push(`${s.file}${id}: ${s.format}${order}${code}, ${s.traces.length} trace(s)\n`);
    if (s.format === 'text') {
      const dt = s.traces[0]?.sampleIntervalS;
      out.push(
        `  time column: ${s.timeColumn ?? 'none'}, unit ${s.timeUnit}; sample interval ${dt !== undefined ? num(dt) : '-'} s from ${s.sampleIntervalSource}` +
          `${s.preambleLines ? `; ${s.preambleLines} preamble line(s) skipped` : ''}${s.encoding ? `; ${s.encoding}` : ''}\n`,
      );
    }
    if (s.notes.length > 0) out.push(s.notes.map((n) => `  note: ${n}\n`).join(''));
    for (const w of s.warnings) out.push(`  warning ${w.code}: ${w.message}\n`);
    const rows = [['chan', 'samples', 'dt (s)', 'delay (s)', 'shift (s)', 'min', 'max', 'rms', 'receiver', 'source']];
    for (const t of s.traces) {
      rows.push([
        String(t.channel),
        String(t.samples),
        num(t.sampleIntervalS),
        num(t.delayS),
        t.timeBase ? num(t.timeBase.shiftS) : '-',
        num(t.min),
        num(t.max),
        num(t.rms),
        pos(t.receiverLocation),
        pos(t.sourceLocation),
      ]);
    }
    out.push(pad(rows));
    const tb = s.traces.find((t) => t.timeBase)?.timeBase;
    if (tb) {
      out.push(
        `  time base: DELAY ${num(tb.delayKeywordS)} s, SKEW ${num(tb.skewS)} s, trigger sample index ${tb.triggerIndex ?? '-'} (pre-trigger from ${tb.delaySource}); shift = delay - DELAY\n`,
      );
    }
  }
  const failed = summaries.filter((s) => !s.ok).length;
  out.push(`${summaries.length} file(s), ${failed} failed\n`);
  return out.join('');
}
