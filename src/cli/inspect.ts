/**
 * `inspect <files...> [--json]`: per file its format, byte order, data format, traces, samples,
 * sample interval, delay, positions, min/max/RMS per trace, or its error. Exit code 1 when any file
 * failed. The per-file work is summarizeOutcome (src/core/io/readers.ts); this file only reads and prints.
 */
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { readWaveFile, summarizeOutcome, type FileSummary } from '../core/io/readers';

export interface CliIo {
  stdout: { write(text: string): unknown };
  stderr: { write(text: string): unknown };
}

const USAGE = 'usage: inspect <files...> [--json]\n';

export async function runInspect(args: string[], io: CliIo): Promise<number> {
  const json = args.includes('--json');
  const unknown = args.filter((a) => a.startsWith('--') && a !== '--json');
  const files = args.filter((a) => !a.startsWith('--'));
  if (unknown.length > 0 || files.length === 0) {
    io.stderr.write(unknown.length > 0 ? `inspect: unknown option ${unknown.join(', ')}\n${USAGE}` : USAGE);
    return 2;
  }
  const summaries: FileSummary[] = [];
  for (const path of files) {
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await readFile(path));
    } catch (e) {
      const reason = e instanceof Error ? e.message : String(e);
      summaries.push({
        file: path,
        ok: false,
        error: { code: 'FILE_NOT_READABLE', message: `${path}: cannot read the file (${reason})`, file: path },
      });
      continue;
    }
    summaries.push(summarizeOutcome(path, readWaveFile(bytes, basename(path))));
  }
  io.stdout.write(json ? JSON.stringify({ files: summaries }, null, 2) + '\n' : formatTable(summaries));
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
  return cells.map((r) => '  ' + r.map((v, c) => v.padStart(widths[c])).join('  ')).join('\n') + '\n';
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
    out.push(`${s.file}: ${s.format}${order}${code}, ${s.traces.length} trace(s)\n`);
    if (s.notes.length > 0) out.push(s.notes.map((n) => `  note: ${n}\n`).join(''));
    const rows = [['chan', 'samples', 'dt (s)', 'delay (s)', 'min', 'max', 'rms', 'receiver', 'source']];
    for (const t of s.traces) {
      rows.push([
        String(t.channel),
        String(t.samples),
        num(t.sampleIntervalS),
        num(t.delayS),
        num(t.min),
        num(t.max),
        num(t.rms),
        pos(t.receiverLocation),
        pos(t.sourceLocation),
      ]);
    }
    out.push(pad(rows));
  }
  const failed = summaries.filter((s) => !s.ok).length;
  out.push(`${summaries.length} file(s), ${failed} failed\n`);
  return out.join('');
}
