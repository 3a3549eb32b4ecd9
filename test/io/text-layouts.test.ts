/**
 * Delimited text as instruments and spreadsheets export it: time columns in microseconds or sample
 * numbers, files without a time column after a preamble, a `# sample_rate_hz` header line, UTF-16
 * "Unicode text", and hostile sizes. Expected values follow from the numbers written in each input
 * and the SI definitions of the units (1 ms = 1e-3 s, 1 us = 1e-6 s, dt = 1 / sample rate).
 * The Unicode byte order marks (FF FE, FE FF, EF BB BF) are from the Unicode Standard, section 23.8.
 */
import { describe, expect, it } from 'vitest';
import { readWaveFile } from '../../src/core/io/readers';
import { readDelimitedText, TEXT_LIMITS, timeUnitFromHeader } from '../../src/core/io/text';
import { errorOf } from '../helpers/errors';

function utf16(text: string, order: 'le' | 'be'): Uint8Array {
  const out = new Uint8Array(2 + 2 * text.length);
  out[0] = order === 'le' ? 0xff : 0xfe;
  out[1] = order === 'le' ? 0xfe : 0xff;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    out[2 + 2 * i + (order === 'le' ? 0 : 1)] = c & 0xff;
    out[2 + 2 * i + (order === 'le' ? 1 : 0)] = c >> 8;
  }
  return out;
}

describe('time unit from the header', () => {
  it.each([
    ['Time (us)', 'us'],
    ['time [µs]', 'us'],
    ['t_musec', 'us'],
    ['Time usec', 'us'],
    ['Sample', 'sample'],
    ['Sample number', 'sample'],
    ['time_ms', 'ms'],
    ['t (s)', 's'],
    ['Time', null],
  ])('"%s" -> %s', (cell, unit) => {
    expect(timeUnitFromHeader(cell)).toBe(unit);
  });

  it('"Time (us)" at 50 us steps: dt = 5e-5 s (not 1000x larger), delay = -1e-4 s', () => {
    const r = readDelimitedText('Time (us),geo\n-100,1\n-50,2\n0,3\n50,4\n', 'us.csv');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(5e-5, 18);
    expect(r.traces[0].delayS).toBeCloseTo(-1e-4, 18);
    expect(r.fileStrings.TIME_UNIT).toBe('us');
    expect(r.fileStrings.TIME_COLUMN).toBe('Time (us)');
    expect(r.warnings).toBeUndefined();
  });

  it('whitespace separated "Time (us)" header is one column', () => {
    const r = readDelimitedText('Time (us)  H1  H2\n0 1 2\n20 3 4\n40 5 6\n', 'ws.txt');
    expect(r.traces).toHaveLength(2);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(2e-5, 18);
    expect(r.traces[1].strings.COLUMN_NAME).toBe('H2');
  });

  it('a "Sample" column needs the sample interval; given 1e-4 s it reads sample 1 as the trigger', () => {
    const text = 'Sample,ch1,ch2\n1,0.5,1\n2,0.25,2\n3,0,3\n';
    const e = errorOf(() => readDelimitedText(text, 'smp.csv'));
    expect(e.code).toBe('TEXT_NO_SAMPLE_INTERVAL');
    expect(e.message).toContain('counts samples');
    const r = readDelimitedText(text, 'smp.csv', { sampleIntervalS: 1e-4 });
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(1e-4, 18);
    expect(r.traces[0].delayS).toBe(0);
    expect(r.fileStrings.TIME_UNIT).toBe('sample');
    expect(r.fileStrings.SAMPLE_INTERVAL_SOURCE).toBe('given');
  });

  it('no header and no unit: the guessed unit is a warning the user sees', () => {
    const r = readDelimitedText('0,5\n0.02,6\n0.04,7\n', 'g.csv');
    expect(r.warnings?.map((w) => w.code)).toEqual(['TEXT_TIME_UNIT_GUESSED']);
  });
});

describe('files without a time column', () => {
  // 24 channels after a 4-line preamble, 3 rows of amplitudes (cell = 100 * (r % 2) - 7 * r + c: no column is a regular ramp).
  const preamble = ['Borehole export', 'Site: north field', 'Operator: crew B', 'Channels: 24'];
  const header = Array.from({ length: 24 }, (_, i) => `CH${i + 1}`).join('\t');
  const rows = [0, 1, 2].map((r) => Array.from({ length: 24 }, (_, c) => String(100 * (r % 2) - 7 * r + c)).join('\t'));
  const noHeader24 = [...preamble, ...rows].join('\n');

  it('24 numeric columns after a 4-line preamble: the error names the real problem', () => {
    const e = errorOf(() => readDelimitedText(noHeader24, 'spread.txt'));
    expect(e.code).toBe('TEXT_NO_SAMPLE_INTERVAL');
    expect(e.message).toContain('24 numeric columns from line 5; no time column: give the sample interval');
  });

  it('given the sample interval: 24 channels, the preamble skipped and reported', () => {
    const r = readDelimitedText(noHeader24, 'spread.txt', { sampleIntervalS: 2.5e-4 });
    expect(r.traces).toHaveLength(24);
    expect(Array.from(r.traces[23].samples)).toEqual([23, 116, 9]);
    expect(r.traces[0].sampleIntervalS).toBe(2.5e-4);
    expect(r.traces[0].delayS).toBe(0);
    expect(r.fileStrings.PREAMBLE_LINES).toBe('4');
    expect(r.warnings?.find((w) => w.code === 'TEXT_PREAMBLE_SKIPPED')?.message).toContain('lines 1-4');
  });

  it('a header of channel names (no time word) and a preamble "Sample interval (ms): 0.125"', () => {
    const text = ['Export v2', 'Sample interval (ms): 0.125', header, ...rows].join('\n');
    const r = readDelimitedText(text, 'spread2.txt');
    expect(r.traces).toHaveLength(24);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(1.25e-4, 18);
    expect(r.traces[5].strings.COLUMN_NAME).toBe('CH6');
    expect(r.fileStrings.TIME_UNIT).toBe('none');
    expect(r.fileStrings.SAMPLE_INTERVAL_SOURCE).toBe('preamble line 2: Sample interval (ms) 0.125');
  });

  it('"# sample_rate_hz: 8000" in a comment header: dt = 1/8000 s = 1.25e-4 s', () => {
    const r = readDelimitedText('# sample_rate_hz: 8000\n# units: m/s\nv1,v2\n1,2\n3,4\n5,6\n', 'rate.csv');
    expect(r.traces).toHaveLength(2);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(1.25e-4, 18);
    expect(r.fileStrings.SAMPLE_INTERVAL_SOURCE).toContain('sample_rate_hz');
  });

  it('"dt = 2.5e-5" in the preamble, and an absurd "dt = 1e300" is refused naming the line', () => {
    expect(readDelimitedText('dt = 2.5e-5\n1\n-2\n3\n', 'dt.txt').traces[0].sampleIntervalS).toBe(2.5e-5);
    const e = errorOf(() => readDelimitedText('dt = 1e300\n1\n-2\n3\n', 'dt.txt'));
    expect(e.code).toBe('TEXT_BAD_SAMPLE_INTERVAL');
    expect(e.message).toContain('1e300');
  });

  it('a sample list with a one-line header ("Amplitude") and a given interval: one channel', () => {
    const r = readDelimitedText('Amplitude\n0.5\n-0.25\n0.125\n', 'list.txt', { sampleIntervalS: 1e-3 });
    expect(Array.from(r.traces[0].samples)).toEqual([0.5, -0.25, 0.125]);
    expect(r.fileStrings.TIME_COLUMN).toBeUndefined();
  });
});

describe('UTF-16 text with a byte order mark', () => {
  it.each(['le', 'be'] as const)('UTF-16 %s reads like UTF-8', (order) => {
    const out = readWaveFile(utf16('Time (ms)\tA\r\n0\t1,5\r\n0,5\t-2\r\n', order), 'unicode.txt');
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.record.traces[0].sampleIntervalS).toBeCloseTo(5e-4, 18);
    expect(Array.from(out.record.traces[0].samples)).toEqual([1.5, -2]);
    expect(out.record.fileStrings.ENCODING).toBe(`utf-16${order}`);
  });
});

describe('limits checked before allocating', () => {
  it('2.5 million columns -> TEXT_LINE_TOO_LONG or TEXT_TOO_MANY_COLUMNS, never a crash', () => {
    const wide = `${'1,'.repeat(2_500_000)}1\n${'2,'.repeat(2_500_000)}2\n`;
    const e = errorOf(() => readDelimitedText(wide, 'wide.csv'));
    expect(e.code).toBe('TEXT_LINE_TOO_LONG');
    // Short cells under the line limit: the column count is checked.
    const n = TEXT_LIMITS.maxColumns + 10;
    const many = `${'1,'.repeat(n)}1\n${'2,'.repeat(n)}2\n`;
    expect(errorOf(() => readDelimitedText(many, 'many.csv')).code).toBe('TEXT_TOO_MANY_COLUMNS');
  });

  it('one 50 MB line -> TEXT_LINE_TOO_LONG naming line 1', () => {
    const e = errorOf(() => readDelimitedText('9'.repeat(50_000_000), 'line.csv'));
    expect(e.code).toBe('TEXT_LINE_TOO_LONG');
    expect(e.field).toBe('line 1');
  });

  it('too many cells -> TEXT_TOO_MANY_CELLS before the columns are allocated', () => {
    const saved = TEXT_LIMITS.maxCells;
    TEXT_LIMITS.maxCells = 10;
    try {
      const e = errorOf(() => readDelimitedText('t_ms,a\n0,1\n1,2\n2,3\n3,4\n4,5\n5,6\n', 'cells.csv'));
      expect(e.code).toBe('TEXT_TOO_MANY_CELLS');
      expect(e.message).toContain('6 rows x 2 columns = 12 cells');
    } finally {
      TEXT_LIMITS.maxCells = saved;
    }
  });
});

describe('a first column with another name', () => {
  it('"x" rising at a regular 0.05 step is time, its unit guessed (ms) with a warning', () => {
    const r = readDelimitedText('x,geo\n0,1\n0.05,2\n0.1,3\n', 'x.csv');
    expect(r.traces).toHaveLength(1);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(5e-5, 18);
    expect(r.warnings?.map((w) => w.code)).toEqual(['TEXT_TIME_UNIT_GUESSED']);
  });
  it('"CH1" holding amplitudes is a channel', () => {
    const r = readDelimitedText('CH1,CH2\n0.3,1\n-0.2,2\n0.9,3\n', 'a.csv', { sampleIntervalS: 1e-4 });
    expect(r.traces).toHaveLength(2);
    expect(r.fileStrings.TIME_UNIT).toBe('none');
  });
});

describe('quoted cells', () => {
  it('a quoted header cell holding the separator and quoted numbers read as one cell each (RFC 4180)', () => {
    const r = readDelimitedText('"time, ms","geo ""A"", x"\n"0","1.5"\n"0.5",2\n', 'q.csv');
    expect(r.traces).toHaveLength(1);
    expect(r.traces[0].strings.COLUMN_NAME).toBe('geo "A", x');
    expect(Array.from(r.traces[0].samples)).toEqual([1.5, 2]);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(5e-4, 18);
  });
});

describe('deviation tables share the limits', () => {
  it('one 50 MB line and a 10,000-column row are refused before splitting', async () => {
    const { readDeviationTable } = await import('../../src/core/io/deviation');
    expect(errorOf(() => readDeviationTable('7'.repeat(50_000_000), 'dev.csv')).code).toBe('TEXT_LINE_TOO_LONG');
    expect(errorOf(() => readDeviationTable(`${'1,'.repeat(10_000)}1\n`, 'dev.csv')).code).toBe(
      'TEXT_TOO_MANY_COLUMNS',
    );
  });
});
