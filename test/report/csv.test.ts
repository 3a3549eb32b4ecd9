import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { neutraliseText, num, toCsv } from '../../src/core/report/tables';

describe('CSV export safety (OWASP "CSV Injection": cells starting with = + - @ tab CR are neutralised)', () => {
  it('hostile text cells get a leading apostrophe; numbers stay numbers', () => {
    const csv = toCsv(
      {
        columns: ['name', 'vs_mps'],
        rows: [
          ['=HYPERLINK("http://x")', -12.5],
          ['+1+1', 3],
          ['@SUM(A1)', 0],
          ['-2+3', -1],
          ['\tcmd', 1],
          ['\rcmd', 2],
          ['plain', 4],
        ],
      },
      [],
    );
    const rows = Papa.parse<string[]>(csv.trim(), { comments: '#', skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['name', 'vs_mps']);
    expect(rows.slice(1).map((r) => r[0])).toEqual([
      '\'=HYPERLINK("http://x")',
      "'+1+1",
      "'@SUM(A1)",
      "'-2+3",
      "'\tcmd",
      "'\rcmd",
      'plain',
    ]);
    expect(rows[1][1]).toBe('-12.5');
  });
  it('neutraliseText leaves safe text alone', () => {
    expect(neutraliseText('dh_d12.0_L.sg2')).toBe('dh_d12.0_L.sg2');
  });
  it('non-finite numbers become empty cells, never NaN', () => {
    expect(num(NaN, 2)).toBeNull();
    expect(num(Infinity, 2)).toBeNull();
    const csv = toCsv({ columns: ['a'], rows: [[num(NaN, 2)]] }, []);
    expect(csv).not.toMatch(/NaN|Infinity/);
  });
  it('cautions ride along as # comment lines after the table', () => {
    const csv = toCsv({ columns: ['a'], rows: [[1]] }, ['Review by a qualified professional.']);
    expect(csv.trim().split('\n').pop()).toBe('# CAUTION: Review by a qualified professional.');
    expect(Papa.parse(csv, { comments: '#', skipEmptyLines: true }).data).toEqual([['a'], ['1']]);
  });
});
