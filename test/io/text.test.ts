/**
 * Delimited text waveforms. Expected values are the numbers written in each input (the reader only
 * converts units: 1 ms = 1e-3 s, SI definition); separator, decimal-comma and comment conventions are
 * common practice for instrument CSV exports (RFC 4180 for comma-separated quoting).
 */
import { describe, expect, it } from 'vitest';
import { errorOf } from '../helpers/errors';
import { readDelimitedText } from '../../src/core/io/text';

describe('readDelimitedText: separators and units', () => {
  it('comma separated, header time_ms: dt = 0.5 ms -> 5e-4 s, delay = first time', () => {
    const r = readDelimitedText('time_ms,ch1,ch2\n-1.0,1,2\n-0.5,3,4\n0.0,5,6\n', 'a.csv');
    expect(r.format).toBe('text');
    expect(r.traces).toHaveLength(2);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(5e-4, 15);
    expect(r.traces[0].delayS).toBeCloseTo(-1e-3, 15);
    expect(Array.from(r.traces[0].samples)).toEqual([1, 3, 5]);
    expect(Array.from(r.traces[1].samples)).toEqual([2, 4, 6]);
    expect(r.traces[1].channel).toBe(2);
    expect(r.traces[1].strings.COLUMN_NAME).toBe('ch2');
    expect(r.fileStrings.TIME_UNIT).toBe('ms');
    expect(r.fileStrings.TIME_UNIT_SOURCE).toBe('header');
  });

  it('semicolon separated with decimal comma, header "t (s)"', () => {
    const r = readDelimitedText('t (s);geo A;geo B\n0,000;1,5;-2,25\n0,001;2,5;3\n0,002;-0,5;1e-3\n', 'b.csv');
    expect(r.fileStrings.SEPARATOR).toBe(';');
    expect(r.fileStrings.TIME_UNIT).toBe('s');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(1e-3, 15);
    expect(Array.from(r.traces[0].samples)).toEqual([1.5, 2.5, -0.5]);
    expect(Array.from(r.traces[1].samples)).toEqual([-2.25, 3, Math.fround(1e-3)]);
  });

  it('tab separated with decimal comma and a header naming milliseconds', () => {
    const r = readDelimitedText('Time [msec]\tH1\n0,25\t10\n0,50\t20\n0,75\t30\n', 'c.txt');
    expect(r.fileStrings.SEPARATOR).toBe('tab');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(2.5e-4, 15);
    expect(r.traces[0].delayS).toBeCloseTo(2.5e-4, 15);
    expect(Array.from(r.traces[0].samples)).toEqual([10, 20, 30]);
  });

  it('whitespace separated (runs of spaces), no header, # and // comments and blank lines skipped', () => {
    const text =
      '# exported by a logger\n// second comment\n\n  0.00002   1.0  -1.0\n  0.00004   2.0  -2.0\n\n  0.00006   3.0  -3.0\n';
    const r = readDelimitedText(text, 'd.dat');
    expect(r.fileStrings.SEPARATOR).toBe('whitespace');
    expect(r.traces).toHaveLength(2);
    // no header and no unit given: step 2e-5 < 0.005 -> seconds (stated rule)
    expect(r.fileStrings.TIME_UNIT).toBe('s');
    expect(r.fileStrings.TIME_UNIT_SOURCE).toMatch(/^guessed/);
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(2e-5, 15);
    expect(r.traces[0].delayS).toBeCloseTo(2e-5, 15);
    expect(Array.from(r.traces[1].samples)).toEqual([-1, -2, -3]);
  });

  it('no header, step 0.02 >= 0.005 -> guessed milliseconds (dt = 2e-5 s)', () => {
    const r = readDelimitedText('0,5\n0.02,6\n0.04,7\n', 'e.csv');
    expect(r.fileStrings.TIME_UNIT).toBe('ms');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(2e-5, 15);
  });

  it('a given unit overrides the guess', () => {
    const r = readDelimitedText('0,5\n0.02,6\n0.04,7\n', 'e.csv', { timeUnit: 's' });
    expect(r.fileStrings.TIME_UNIT).toBe('s');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(0.02, 15);
  });

  it('quoted header cells (RFC 4180) are unquoted', () => {
    const r = readDelimitedText('"time_ms","ch, one"\n0,1\n1,2\n', 'q.csv');
    expect(r.traces[0].strings.COLUMN_NAME).toBe('ch, one');
    expect(r.traces[0].sampleIntervalS).toBeCloseTo(1e-3, 15);
  });

  it('times printed with rounding (step 1/30 ms at 3 decimals) still count as regular', () => {
    const lines = ['t_ms,a'];
    for (let i = 0; i < 60; i++) lines.push(`${(i / 30).toFixed(3)},${i}`);
    const r = readDelimitedText(lines.join('\n'), 'round.csv');
    // step = (last - first) / 59; first and last each rounded by up to 0.0005 ms -> error <= 0.001 ms / 59
    expect(Math.abs(r.traces[0].sampleIntervalS - 1e-3 / 30)).toBeLessThanOrEqual((0.001e-3 / 59) * (1 + 1e-9));
  });
});

describe('readDelimitedText: errors name row and column', () => {
  it('empty file and comment-only file -> TEXT_EMPTY', () => {
    expect(errorOf(() => readDelimitedText('', 'e.csv')).code).toBe('TEXT_EMPTY');
    expect(errorOf(() => readDelimitedText('# nothing\n\n// here\n', 'e.csv')).code).toBe('TEXT_EMPTY');
    expect(errorOf(() => readDelimitedText('time_ms,a\n', 'e.csv')).code).toBe('TEXT_EMPTY');
  });

  it('ragged row -> TEXT_RAGGED_ROW naming the file line (comments counted)', () => {
    const e = errorOf(() => readDelimitedText('# c\ntime_ms,a,b\n0,1,2\n1,3\n2,5,6\n', 'r.csv'));
    expect(e.code).toBe('TEXT_RAGGED_ROW');
    expect(e.field).toBe('line 4');
    expect(e.message).toContain('line 4 has 2 columns, expected 3');
  });

  it('non-numeric cell -> TEXT_NOT_NUMERIC naming line and column', () => {
    const e = errorOf(() => readDelimitedText('time_ms,a,b\n0,1,2\n1,3,x\n', 'n.csv'));
    expect(e.code).toBe('TEXT_NOT_NUMERIC');
    expect(e.field).toBe('line 3, column 3');
    expect(e.message).toContain('"b"');
    expect(errorOf(() => readDelimitedText('time_ms,a\n0,1\n1,\n', 'n.csv')).code).toBe('TEXT_NOT_NUMERIC');
    expect(errorOf(() => readDelimitedText('time_ms,a\n0,1\n1,1e999\n', 'n.csv')).code).toBe('TEXT_NOT_NUMERIC');
  });

  it('missing sample or reversed time -> TEXT_IRREGULAR_TIME naming the line', () => {
    const e = errorOf(() => readDelimitedText('time_ms,a\n0,1\n1,2\n2,3\n4,4\n5,5\n', 'i.csv'));
    expect(e.code).toBe('TEXT_IRREGULAR_TIME');
    expect(e.field).toBe('line 5, column 1');
    expect(errorOf(() => readDelimitedText('time_ms,a\n0,1\n1,2\n1,3\n', 'i.csv')).code).toBe('TEXT_IRREGULAR_TIME');
    expect(errorOf(() => readDelimitedText('time_ms,a\n2,1\n1,2\n0,3\n', 'i.csv')).code).toBe('TEXT_IRREGULAR_TIME');
  });

  it('a time column alone -> TEXT_TOO_FEW_COLUMNS; one data row -> TEXT_TOO_FEW_ROWS', () => {
    expect(errorOf(() => readDelimitedText('0\n1\n2\n', 'c.csv')).code).toBe('TEXT_TOO_FEW_COLUMNS');
    expect(errorOf(() => readDelimitedText('time_ms,a\n0,1\n', 'c.csv')).code).toBe('TEXT_TOO_FEW_ROWS');
  });

  it('decimal comma is not accepted with a comma separator (ambiguous): the row turns ragged', () => {
    expect(errorOf(() => readDelimitedText('t_ms,a\n0,1,5\n1,2\n', 'x.csv')).code).toBe('TEXT_RAGGED_ROW');
  });
});
