/**
 * Record log reader (our CSV contract, README "Record log"): file, depth_m | depth_ft, hit, components.
 * Feet to metres at 0.3048 m/ft exactly (international foot, NIST SP 811).
 */
import { describe, expect, it } from 'vitest';
import { matchRecordLog, readRecordLog, writeRecordLog } from '../../src/core/io/recordlog';
import { BorewaveError } from '../../src/core/errors';

describe('readRecordLog', () => {
  it('reads file, depth_m, hit and components (with receivers) in any column order and case', () => {
    const log = readRecordLog(
      'Hit,File,Depth_m,Components\nL,1.sg2,3.5,V H1 H2\nright,2.sg2,3.5,"r0:V r0:H1 r1:V r1:H1"\n,3.sg2,,\n',
      'log.csv',
    );
    expect(log.depthColumn).toBe('depth_m');
    expect(log.rows[0]).toEqual({
      line: 2,
      file: '1.sg2',
      depthM: 3.5,
      hit: 'left',
      components: [
        { receiver: null, component: 'V' },
        { receiver: null, component: 'H1' },
        { receiver: null, component: 'H2' },
      ],
    });
    expect(log.rows[1].components?.map((c) => `${c.receiver}:${c.component}`)).toEqual([
      'r0:V',
      'r0:H1',
      'r1:V',
      'r1:H1',
    ]);
    expect(log.rows[2]).toMatchObject({ depthM: null, hit: null, components: null });
  });
  it('depth_ft is converted at 0.3048 m/ft (NIST SP 811)', () => {
    const log = readRecordLog('file;depth_ft\na.sg2;10\nb.sg2;32,5\n', 'log.csv');
    expect(log.rows[0].depthM).toBeCloseTo(3.048, 12);
    expect(log.rows[1].depthM).toBeCloseTo(9.906, 12);
  });
  it('a file named twice is an error naming the file and both lines', () => {
    expect(() => readRecordLog('file,depth_m\nday1/7.sg2,3\nDAY1/7.sg2,4\n', 'log.csv')).toThrowError(
      /day1\/7\.sg2 is named twice \(lines 2 and 3\)/i,
    );
    let caught: unknown = null;
    try {
      readRecordLog('file,depth_m\n7.sg2,3\n7.sg2,4\n', 'log.csv');
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(BorewaveError);
    expect((caught as BorewaveError).file).toBe('log.csv');
    expect((caught as BorewaveError).field).toBe('7.sg2');
  });
  it('rejects a missing file column, both depth columns, a bad hit, a bad component, a negative depth', () => {
    expect(() => readRecordLog('name,depth_m\na,1\n', 'l.csv')).toThrow(/no "file" column/);
    expect(() => readRecordLog('file,depth_m,depth_ft\na,1,3\n', 'l.csv')).toThrow(/both depth_m and depth_ft/);
    expect(() => readRecordLog('file,depth_m,hit\na,1,sideways\n', 'l.csv')).toThrow(/line 2, column hit/);
    expect(() => readRecordLog('file,components\na,V Q\n', 'l.csv')).toThrow(/"Q" is not a component/);
    expect(() => readRecordLog('file,depth_m\na,-2\n', 'l.csv')).toThrow(/"-2" is not a depth/);
  });
  it('matches by path, else by the last path part; unknown names are listed', () => {
    const log = readRecordLog('file,depth_m\nday1/1.sg2,1\n2.sg2,2\nmissing.sg2,3\n', 'log.csv');
    const m = matchRecordLog(log, ['day1/1.sg2', 'day2/2.sg2', 'day2/1.sg2']);
    expect(m.byFile.get('day1/1.sg2')?.depthM).toBe(1);
    expect(m.byFile.get('day2/2.sg2')?.depthM).toBe(2);
    expect(m.unknown.map((r) => r.file)).toEqual(['missing.sg2']);
  });
  it('writes what it reads (round trip, file names with commas quoted)', () => {
    const text = writeRecordLog([
      { file: 'a,b.sg2', depthM: 1.25, hit: 'up' },
      { file: 'c.sg2', depthM: null, hit: null },
    ]);
    const log = readRecordLog(text, 'x.csv');
    expect(log.rows.map((r) => [r.file, r.depthM, r.hit])).toEqual([
      ['a,b.sg2', 1.25, 'up'],
      ['c.sg2', null, null],
    ]);
  });
});
