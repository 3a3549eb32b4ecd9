/**
 * Geometry's spreadsheet paste and the test-kind change rules (core: survey/paste.ts,
 * catalogue/testKinds.ts changeKind). Inputs are small hand-made tables; expected values by inspection.
 */
import { describe, expect, it } from 'vitest';
import { applyPaste } from '../../src/core/survey/paste';
import { blankSurvey, changeKind, defaultChannels } from '../../src/core/catalogue/testKinds';
import type { RecordAssignment } from '../../src/core/model';

const rec = (id: string): RecordAssignment => ({
  recordId: id,
  depthM: null,
  hit: 'none',
  channels: defaultChannels({ kind: 'downhole-pair', receiverCount: 2 }, [1, 2, 3, 4, 5, 6]),
  excluded: false,
  depthSource: 'default',
  hitSource: 'default',
});

describe('spreadsheet paste into the records table', () => {
  it("matches rows by record name, reads depth in feet and the hit, and marks both as the user's", () => {
    const out = applyPaste('b.sg2\t10\tR\na.sg2\t3,5\tleft', [rec('a.sg2'), rec('b.sg2')], 'US');
    expect(out.changed).toBe(2);
    expect(out.problems).toEqual([]);
    // 10 ft = 3.048 m (international foot, 0.3048 m exactly).
    expect(out.records[1].depthM).toBeCloseTo(3.048, 12);
    expect(out.records[0].depthM).toBeCloseTo(3.5 * 0.3048, 12);
    expect(out.records.map((r) => [r.hit, r.depthSource, r.hitSource])).toEqual([
      ['left', 'user', 'user'],
      ['right', 'user', 'user'],
    ]);
  });
  it('without names, rows go in order; extra rows, bad depths, hits and receivers are reported', () => {
    const out = applyPaste('2\tup\tV\tr1\nx\tsideways\n5', [rec('a'), rec('b')], 'SI');
    expect(out.records[0].depthM).toBe(2);
    expect(out.records[0].channels[0]).toMatchObject({ component: 'V', receiver: 'r1' });
    expect(out.problems).toEqual([
      'Row 2: depth "x" is not a number.',
      'Row 2: hit "sideways" is not left, right, up, down or none.',
      'Row 3: more rows than records.',
    ]);
    const bad = applyPaste('1\tL\tH1\tlower', [rec('a')], 'SI');
    expect(bad.problems).toEqual(['Row 1: receiver "lower" is not one of this survey\'s receivers.']);
    const named = applyPaste('1\tL\tH1\tlower', [rec('a')], 'SI', (t) => (t === 'lower' ? 'r1' : null));
    expect(named.records[0].channels[0].receiver).toBe('r1');
  });
});

describe('changing the test kind', () => {
  it('downhole to crosshole: one hole does not fit, so the blank three-hole layout is taken and channels reset', () => {
    const s = { ...blankSurvey('downhole'), records: [rec('a')] };
    const out = changeKind(s, 'crosshole', () => [1, 2, 3, 4]);
    expect(out.boreholes.map((h) => h.id)).toEqual(['S', 'near', 'far']);
    expect(out.receiverHoleIds).toEqual(['near', 'far']);
    expect(out.receiverCount).toBe(2);
    // Crosshole default: V then H1 per receiver hole (near r0, far r1).
    expect(out.records[0].channels.map((c) => `${c.component}@${c.receiver}`)).toEqual([
      'V@r0',
      'H1@r0',
      'V@r1',
      'H1@r1',
    ]);
  });
  it('downhole to seismic cone keeps the hole and source, takes one receiver; records without loaded channels are kept', () => {
    const s = { ...blankSurvey('downhole'), sourceOffsetM: 3, records: [rec('a')] };
    const out = changeKind(s, 'seismic-cone', () => null);
    expect(out.mainHoleId).toBe('BH1');
    expect(out.sourceOffsetM).toBe(3);
    expect(out.receiverCount).toBe(1);
    expect(out.records[0]).toBe(s.records[0]);
  });
});
