/**
 * CSV injection across list separators (OWASP "CSV Injection"; RFC 4180 quoting): a text cell with a
 * formula trigger (= + - @ tab CR) right after a comma, semicolon, tab or line break opens as a live
 * formula in a spreadsheet whose list separator splits the cell there. Every export is read back with
 * papaparse (reference CSV parser) using comma, semicolon and tab as the delimiter: no cell may begin
 * with a trigger, and with the file's own delimiter each text cell is the original after removing the
 * neutralising apostrophes.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { neutraliseText, toCsv, unneutraliseText } from '../../src/core/report/tables';

const HOSTILE = [
  "R;=cmd|' /C calc'!A0",
  'a,=1+1',
  'x\t=2',
  'y\r=3',
  '\t=4',
  'z\n+5',
  '-2+3',
  '@SUM(1)',
  "'=already quoted",
  'a; =spaced',
  'a;\t=tab after semicolon',
  'hole "B2"',
  'plain text',
];
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

describe('CSV export: quoting and neutralising for every list separator', () => {
  const csv = toCsv({ columns: ['name', 'value'], rows: HOSTILE.map((h, i) => [h, i % 2 ? -i : i + 0.5]) }, []);

  it.each([',', ';', '\t'])('read back with delimiter %j: no cell begins with a formula trigger', (delimiter) => {
    const rows = Papa.parse<string[]>(csv, { delimiter, skipEmptyLines: true }).data;
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) {
      for (const cell of row) {
        if (NUMBER.test(cell)) continue; // numbers stay numbers (a negative number is not a formula)
        expect(cell, JSON.stringify(cell)).not.toMatch(/^[=+\-@\t\r]/);
      }
    }
  });

  it.each([',', ';', '\t'])(
    'split naively at %j and at every line break (no quote handling): still no trigger',
    (d) => {
      for (const line of csv.split(/\r\n|\r|\n/)) {
        for (const piece of line.split(d)) {
          const cell = piece.replace(/^"/, ''); // a reader may drop a leading quote
          if (NUMBER.test(cell)) continue;
          expect(cell, JSON.stringify(cell)).not.toMatch(/^[=+\-@\t\r]/);
        }
      }
    },
  );

  it('with the comma the file is written with: each cell is the original after removing the apostrophes', () => {
    const rows = Papa.parse<string[]>(csv, { delimiter: ',', comments: '#', skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['name', 'value']);
    expect(rows.slice(1).map((r) => unneutraliseText(r[0]))).toEqual(HOSTILE);
    // numbers are written as numbers, unquoted and without an apostrophe
    expect(rows[2][1]).toBe('-1');
    expect(csv).toContain("\n\"R;'=cmd|' /C calc'!A0\",0.5\n");
  });

  it('neutraliseText leaves harmless text alone and is undone exactly', () => {
    expect(neutraliseText('hole A; depth 5')).toBe('hole A; depth 5');
    expect(neutraliseText('=1')).toBe("'=1");
    expect(neutraliseText('a;=1')).toBe("a;'=1");
    for (const h of HOSTILE) expect(unneutraliseText(neutraliseText(h))).toBe(h);
  });
});
