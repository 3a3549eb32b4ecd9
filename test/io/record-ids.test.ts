/**
 * Same-name files (instrument numbering restarts per hole or per day, common practice): every file
 * gets its own record id, never replacing another.
 */
import { describe, expect, it } from 'vitest';
import { splitPath, uniqueRecordIds } from '../../src/core/io/record-ids';

describe('uniqueRecordIds', () => {
  it('unique names stay as they are', () => {
    expect(uniqueRecordIds([{ name: '1.dat' }, { name: '2.dat' }])).toEqual(['1.dat', '2.dat']);
  });
  it('same names from two dropped folders: the folder tells them apart', () => {
    const files = ['hole1/1.dat', 'hole1/2.dat', 'hole2/1.dat'].map(splitPath);
    expect(uniqueRecordIds(files)).toEqual(['hole1/1.dat', '2.dat', 'hole2/1.dat']);
  });
  it('same names without folders: an order suffix before the extension', () => {
    expect(uniqueRecordIds([{ name: '1.dat' }, { name: '1.dat' }, { name: '1.dat' }])).toEqual([
      '1.dat',
      '1 (2).dat',
      '1 (3).dat',
    ]);
  });
  it('a name already loaded in the session is not reused', () => {
    expect(uniqueRecordIds([{ name: '1.dat' }], ['1.dat', '1 (2).dat'])).toEqual(['1 (3).dat']);
    expect(uniqueRecordIds([{ name: 'noext' }], ['noext'])).toEqual(['noext (2)']);
  });
});
