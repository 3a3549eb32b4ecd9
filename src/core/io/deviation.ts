/**
 * Deviation (verticality) surveys as delimited text: depth along the hole, east offset, north offset
 * from the collar. Header optional; metres unless a header cell names feet (0.3048 m/ft exactly,
 * international foot, NIST SP 811). Separators, comments and decimal comma as for waveform text.
 */
import { BorewaveError, type ErrorCode } from '../errors';
import type { DeviationStation } from '../model';
import { allowsDecimalComma, headerTokens, isHeaderRow, parseCell, splitTextRows } from './text';

/** International foot in metres, exact by definition (NIST SP 811). */
export const METRES_PER_FOOT = 0.3048;

function fail(code: ErrorCode, message: string, file: string, field?: string): never {
  throw new BorewaveError(code, `${file}: ${message}`, file, field);
}

function isFeet(cell: string): boolean {
  return headerTokens(cell).some((t) => t === 'ft' || t === 'feet' || t === 'foot');
}

const DEPTH_NAMES = ['depth', 'md', 'along', 'measured', 'z'];
const EAST_NAMES = ['east', 'easting', 'e', 'x', 'de', 'dx'];
const NORTH_NAMES = ['north', 'northing', 'n', 'y', 'dn', 'dy'];

/** Column indices [depth, east, north] from header names, or the first three columns. */
function pickColumns(header: string[] | null): [number, number, number] {
  if (!header) return [0, 1, 2];
  const find = (names: string[]) => header.findIndex((h) => headerTokens(h).some((t) => names.includes(t)));
  const d = find(DEPTH_NAMES);
  const e = find(EAST_NAMES);
  const n = find(NORTH_NAMES);
  if (d >= 0 && e >= 0 && n >= 0 && new Set([d, e, n]).size === 3) return [d, e, n];
  return [0, 1, 2];
}

/**
 * Read a deviation table. Stations must have strictly increasing depth along the hole (errors name
 * the line); the result is in metres.
 */
export function readDeviationTable(text: string, fileName: string): DeviationStation[] {
  const file = fileName;
  const { rows, separator } = splitTextRows(text, fileName);
  if (rows.length === 0) fail('DEVIATION_EMPTY', 'the deviation table holds no rows', file);
  const decimalComma = allowsDecimalComma(separator);
  const hasHeader = isHeaderRow(rows[0].cells, separator);
  const header = hasHeader ? rows[0].cells : null;
  const data = hasHeader ? rows.slice(1) : rows;
  if (data.length === 0) fail('DEVIATION_EMPTY', 'the deviation table has a header but no stations', file);
  const nCols = header ? header.length : data[0].cells.length;
  if (nCols < 3) {
    fail(
      'DEVIATION_TOO_FEW_COLUMNS',
      `line ${rows[0].line} has ${nCols} columns; depth along hole, east and north are needed`,
      file,
      'columns',
    );
  }
  const cols = pickColumns(header);
  const scale = cols.map((c) => (header && isFeet(header[c]) ? METRES_PER_FOOT : 1));
  const names = ['depth along hole', 'east', 'north'];

  const out: DeviationStation[] = [];
  for (const row of data) {
    if (row.cells.length !== nCols) {
      fail(
        'DEVIATION_RAGGED_ROW',
        `line ${row.line} has ${row.cells.length} columns, expected ${nCols}`,
        file,
        `line ${row.line}`,
      );
    }
    const v = cols.map((c, k) => {
      const x = parseCell(row.cells[c], decimalComma);
      if (Number.isNaN(x)) {
        fail(
          'DEVIATION_NOT_NUMERIC',
          `line ${row.line}, column ${c + 1} (${names[k]}): "${row.cells[c]}" is not a number`,
          file,
          `line ${row.line}, column ${c + 1}`,
        );
      }
      return x * scale[k];
    });
    const station: DeviationStation = { depthAlongM: v[0], eastM: v[1], northM: v[2] };
    if (station.depthAlongM < 0) {
      fail(
        'DEVIATION_NEGATIVE_DEPTH',
        `line ${row.line}: depth along hole ${row.cells[cols[0]]} is negative`,
        file,
        `line ${row.line}`,
      );
    }
    const prev = out[out.length - 1];
    if (prev && !(station.depthAlongM > prev.depthAlongM)) {
      fail(
        'DEVIATION_NOT_INCREASING',
        `line ${row.line}: depth along hole ${row.cells[cols[0]]} is not greater than the previous station's`,
        file,
        `line ${row.line}`,
      );
    }
    out.push(station);
  }
  return out;
}
