import { describe, expect, it } from 'vitest';
import { zipSync, strToU8 } from 'fflate';
import { newProjectDocument, readProjectArchive, toProjectJson, writeProjectArchive } from '../../src/core/io/project';
import { BorewaveError } from '../../src/core/errors';
import type { Survey } from '../../src/core/model';
import { pickEditKey, stationKey } from '../../src/core/keys';

const survey: Survey = {
  name: 'Test',
  kind: 'downhole',
  boreholes: [{ id: 'BH1', collarEastM: 0, collarNorthM: 0, deviation: [] }],
  mainHoleId: 'BH1',
  sourceOffsetM: 2,
  sourceDepthM: 0,
  receiverSpacingM: 1,
  receiverCount: 1,
  coneOffsetM: 0.2,
  receiverHoleIds: [],
  records: [
    {
      recordId: 'a.sg2',
      depthM: 1,
      hit: 'left',
      channels: [],
      excluded: false,
      depthSource: 'user',
      hitSource: 'user',
    },
  ],
  soil: { layers: [], waterTableM: 2, waterUnitWeightKnM3: 9.81 },
};

describe('project archive (docs/conventions.md contract: project.json + original files in one zip, via fflate)', () => {
  it('round trip keeps the document and the file bytes exactly', () => {
    const doc = newProjectDocument(survey);
    doc.edits.picks[pickEditKey(stationKey('r0', 1, 'H1'), 'S', 'onset')] = 0.0123;
    const bytes = new Uint8Array([0x55, 0x3a, 1, 2, 3]);
    const zip = writeProjectArchive(doc, [{ name: 'a.sg2', bytes }]);
    const back = readProjectArchive(zip, 'p.zip');
    // Fields version 2 adds come back with their defaults.
    expect(back.doc.survey).toEqual({ ...survey, siteName: '', testDate: null, hitSwap: false, channelMap: [] });
    expect(back.doc.edits).toEqual({ ...doc.edits, azimuthDeg: {} });
    expect(back.doc.settings).toEqual(doc.settings);
    expect(back.files[0].bytes).toEqual(bytes);
    expect(back.missing).toEqual([]);
    // same content -> same bytes (fixed timestamps)
    expect(writeProjectArchive(doc, [{ name: 'a.sg2', bytes }])).toEqual(zip);
  });
  it('names a file listed in project.json but absent', () => {
    const doc = toProjectJson({ ...newProjectDocument(survey), files: ['a.sg2', 'gone.sg2'] });
    const zip = zipSync({ 'project.json': strToU8(JSON.stringify(doc)), 'a.sg2': new Uint8Array([1]) });
    const opened = readProjectArchive(zip, 'p.zip');
    expect(opened.missing).toEqual(['gone.sg2']);
    expect(opened.issues.map((i) => i.code)).toContain('PROJECT_FILE_MISSING');
  });
  it('rejects a non-zip, a zip without project.json and a wrong format name with typed errors', () => {
    const codeOf = (f: () => unknown) => {
      try {
        f();
        return 'none';
      } catch (e) {
        return (e as BorewaveError).code;
      }
    };
    expect(codeOf(() => readProjectArchive(new Uint8Array(100), 'x.zip'))).toBe('ARCHIVE_NOT_ZIP');
    expect(codeOf(() => readProjectArchive(zipSync({ 'a.txt': strToU8('x') }), 'x.zip'))).toBe('ARCHIVE_NO_PROJECT');
    expect(codeOf(() => readProjectArchive(zipSync({ 'project.json': strToU8('{"format":"other"}') }), 'x.zip'))).toBe(
      'PROJECT_BAD_FIELD',
    );
    expect(codeOf(() => readProjectArchive(zipSync({ 'project.json': strToU8('{not json') }), 'x.zip'))).toBe(
      'PROJECT_BAD_JSON',
    );
  });
  it('refuses parent-folder names when writing', () => {
    expect(() => writeProjectArchive(newProjectDocument(survey), [{ name: '../', bytes: new Uint8Array(1) }])).toThrow(
      BorewaveError,
    );
  });
});
