/**
 * The forward model's records as delimited text (a time column in ms, then one column per channel,
 * comma-separated with a header row), the layout src/core/io/text.ts reads: the text variant of the
 * demo surveys for the benchmark and the reader tests.
 */
import type { WaveRecord } from '../model';

/** One record as delimited text; samples keep 7 significant digits (a 32-bit float holds about 7). */
export function toDelimitedText(record: WaveRecord): string {
  const traces = record.traces;
  if (!traces.length) return 'time_ms\n';
  const n = traces[0].samples.length;
  const dtMs = traces[0].sampleIntervalS * 1000;
  const delayMs = traces[0].delayS * 1000;
  const decimals = Math.min(9, Math.max(3, Math.ceil(-Math.log10(dtMs)) + 3));
  const lines: string[] = [['time_ms', ...traces.map((t) => `ch${t.channel}`)].join(',')];
  for (let i = 0; i < n; i++) {
    let line = (delayMs + i * dtMs).toFixed(decimals);
    for (const t of traces) line += ',' + String(Number(t.samples[i].toPrecision(7)));
    lines.push(line);
  }
  return lines.join('\n') + '\n';
}
