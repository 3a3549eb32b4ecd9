/**
 * Deviation tables. Foot conversion: 1 ft = 0.3048 m exactly (international foot, NIST SP 811);
 * other expected values are the numbers written in the input.
 */
import { describe, expect, it } from 'vitest';
import { errorOf } from '../helpers/errors';
import { readDeviationTable } from '../../src/core/io/deviation';

describe('readDeviationTable', () => {
  it('reads a metre table with header', () => {
    const s = readDeviationTable('depth_m,east_m,north_m\n0,0,0\n1.5,0.01,-0.02\n3.0,0.03,-0.05\n', 'dev.csv');
    expect(s).toEqual([
      { depthAlongM: 0, eastM: 0, northM: 0 },
      { depthAlongM: 1.5, eastM: 0.01, northM: -0.02 },
      { depthAlongM: 3, eastM: 0.03, northM: -0.05 },
    ]);
  });

  it('reads a table without header (depth, east, north order), whitespace separated, comments skipped', () => {
    const s = readDeviationTable('# hole B2\n0 0 0\n2 0.1 0.2\n', 'dev.txt');
    expect(s[1]).toEqual({ depthAlongM: 2, eastM: 0.1, northM: 0.2 });
  });

  it('converts feet columns: 10 ft -> 3.048 m, 0.5 ft -> 0.1524 m (0.3048 m/ft exact)', () => {
    const s = readDeviationTable('Depth (ft);East (ft);North (ft)\n0;0;0\n10;0,5;-1\n', 'ft.csv');
    expect(s[1].depthAlongM).toBeCloseTo(3.048, 12);
    expect(s[1].eastM).toBeCloseTo(0.1524, 12);
    expect(s[1].northM).toBeCloseTo(-0.3048, 12);
  });

  it('finds columns by header name in any order', () => {
    const s = readDeviationTable('north,east,depth\n0.2,0.1,5\n0.4,0.3,6\n', 'o.csv');
    expect(s[0]).toEqual({ depthAlongM: 5, eastM: 0.1, northM: 0.2 });
  });

  it('depth not strictly increasing -> DEVIATION_NOT_INCREASING naming the line', () => {
    const e = errorOf(() => readDeviationTable('depth,east,north\n0,0,0\n1,0,0\n1,0,0.1\n', 'd.csv'));
    expect(e.code).toBe('DEVIATION_NOT_INCREASING');
    expect(e.field).toBe('line 4');
    expect(errorOf(() => readDeviationTable('0,0,0\n2,0,0\n1,0,0\n', 'd.csv')).field).toBe('line 3');
  });

  it('other errors: empty, too few columns, non-numeric, ragged, negative depth', () => {
    expect(errorOf(() => readDeviationTable('', 'd.csv')).code).toBe('DEVIATION_EMPTY');
    expect(errorOf(() => readDeviationTable('depth,east,north\n', 'd.csv')).code).toBe('DEVIATION_EMPTY');
    expect(errorOf(() => readDeviationTable('0,0\n1,0\n', 'd.csv')).code).toBe('DEVIATION_TOO_FEW_COLUMNS');
    const nn = errorOf(() => readDeviationTable('depth,east,north\n0,0,0\n1,abc,0\n', 'd.csv'));
    expect(nn.code).toBe('DEVIATION_NOT_NUMERIC');
    expect(nn.field).toBe('line 3, column 2');
    expect(errorOf(() => readDeviationTable('0,0,0\n1,0\n', 'd.csv')).code).toBe('DEVIATION_RAGGED_ROW');
    expect(errorOf(() => readDeviationTable('-1,0,0\n1,0,0\n', 'd.csv')).code).toBe('DEVIATION_NEGATIVE_DEPTH');
  });
});
