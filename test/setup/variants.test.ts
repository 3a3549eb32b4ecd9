/**
 * Placement on forward-model variants built to break it (our own forward model, src/core/synth): every
 * component order, instrument-numbered files with depths only in a record log, spread positions in
 * RECEIVER_LOCATION, text files with component column names, crosshole holes with user names, and a
 * seismic cone at 0.5 m steps. The truth is what the forward model wrote; the check is exact placement.
 */
import { describe, expect, it } from 'vitest';
import type { Component } from '../../src/core/model';
import { receiverDepthFromLogged } from '../../src/core/setup/cone';
import { makeVariantSurvey, type VariantSpec } from '../../src/core/synth/variants';
import { inferSetup } from '../../src/core/setup/infer';
import { defaultPlacementSettings } from '../../src/core/setup/types';
import { inferVariant, readVariant, scorePlacement, variantGeometry } from './helpers';

const ORDERS3: Component[][] = [
  ['H1', 'H2', 'V'],
  ['H1', 'V', 'H2'],
  ['H2', 'H1', 'V'],
  ['H2', 'V', 'H1'],
  ['V', 'H1', 'H2'],
  ['V', 'H2', 'H1'],
];

const base: VariantSpec = {
  kind: 'downhole',
  seed: 101,
  componentOrder: ['V', 'H1', 'H2'],
  labels: 'receiver-words',
  locations: 'depth',
  naming: 'depth-names',
  notes: false,
  format: 'seg2',
  depthCount: 4,
};

describe('components from trace strings and column names, every order', () => {
  for (const order of ORDERS3) {
    for (const labels of ['receiver-words', 'registration'] as const) {
      it(`downhole SEG-2, ${labels}, order ${order.join(' ')}: every channel placed from the header`, () => {
        const v = makeVariantSurvey({ ...base, componentOrder: order, labels });
        const r = inferVariant(v);
        expect(scorePlacement(v, r).channels).toBe(1);
        expect(r.records.every((p) => p.channels.every((c) => c.source === 'header'))).toBe(true);
        expect(r.channelMap.map((c) => c.component)).toEqual(order);
      });
    }
    it(`text files with Z N E column names, order ${order.join(' ')}`, () => {
      const v = makeVariantSurvey({ ...base, componentOrder: order, labels: 'zne', format: 'text', locations: 'none' });
      const r = inferVariant(v, { withLog: true });
      expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 1, channels: 1 });
      expect(r.records[0].channels.every((c) => c.source === 'header')).toBe(true);
      expect(r.inferences.some((i) => i.what === 'component' && i.rule === 'column name')).toBe(true);
    });
  }
  it('two receivers, V-first order with upper/lower words: slots and components from the header', () => {
    const v = makeVariantSurvey({ ...base, kind: 'downhole-pair', componentOrder: ['V', 'H2', 'H1'] });
    const r = inferVariant(v);
    expect(scorePlacement(v, r)).toMatchObject({ depth: 1, channels: 1 });
    expect(r.records[0].depthM?.source).toBe('header');
  });
  it('unlabelled channels get the kind default, marked default (and do not match a V-first truth)', () => {
    const v = makeVariantSurvey({ ...base, labels: 'none' });
    const r = inferVariant(v);
    expect(r.records.every((p) => p.channels.every((c) => c.source === 'default'))).toBe(true);
    expect(scorePlacement(v, r).channels).toBe(0);
  });
});

describe('depths: record log, header plausibility, spreads', () => {
  it('instrument-numbered files in shuffled order, depths only in the record log', () => {
    const v = makeVariantSurvey({ ...base, naming: 'instrument', locations: 'none', depthCount: 6 });
    expect(v.files.map((f) => f.name)).toContain('1.sg2');
    const noLog = inferVariant(v);
    expect(noLog.records.every((p) => p.depthM === null && p.hit === null)).toBe(true);
    const r = inferVariant(v, { withLog: true });
    expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 1, channels: 1 });
    expect(r.records.every((p) => p.depthM?.source === 'log' && p.hit?.source === 'log')).toBe(true);
  });
  it('two files of the same name (instrument numbering restarted) are two records, keyed by their ids', () => {
    const v = makeVariantSurvey({ ...base, naming: 'instrument', locations: 'none', depthCount: 2 });
    const [a, b] = readVariant(v);
    // Same original name, different session ids (folder or order suffix), as the app and the CLI give them.
    const twins = [
      { ...a, id: 'day1/1.sg2', fileName: '1.sg2' },
      { ...b, id: 'day2/1.sg2', fileName: '1.sg2' },
    ];
    const r = inferSetup({
      records: twins,
      geometry: variantGeometry(v),
      settings: defaultPlacementSettings(),
      log: null,
    });
    expect(r.records.map((p) => p.file)).toEqual(['day1/1.sg2', 'day2/1.sg2']);
    expect(new Set(r.records.map((p) => p.recordId)).size).toBe(2);
  });
  it('spread positions 0..n-1 in RECEIVER_LOCATION are rejected as a spread, not read as depth', () => {
    const v = makeVariantSurvey({ ...base, naming: 'instrument', locations: 'spread-index' });
    const r = inferVariant(v);
    expect(r.records.every((p) => p.depthM === null)).toBe(true);
    expect(r.rejected.length).toBe(v.files.length);
    expect(r.rejected.every((x) => x.rule === 'traces-differ-spread' && x.value === '0, 1, 2')).toBe(true);
  });
  it('station numbers (1001..) differ: spread; one station number 1004 on every trace: deeper than the limit', () => {
    const a = inferVariant(makeVariantSurvey({ ...base, naming: 'instrument', locations: 'station-numbers' }));
    expect(a.rejected.every((x) => x.rule === 'traces-differ-spread')).toBe(true);
    const b = inferVariant(makeVariantSurvey({ ...base, naming: 'instrument', locations: 'one-station' }));
    expect(b.records.every((p) => p.depthM === null)).toBe(true);
    expect(b.rejected.every((x) => x.rule === 'deeper-than-limit' && x.value === '1004')).toBe(true);
    // A higher limit lets the same value through (the limit is a setting).
    const c = inferVariant(makeVariantSurvey({ ...base, naming: 'instrument', locations: 'one-station' }), {
      settings: { maxHeaderDepthM: 2000 },
    });
    expect(c.records.every((p) => p.depthM?.value === 1004)).toBe(true);
  });
  it('the record log outranks a plausible header depth, and the header outranks nothing', () => {
    const v = makeVariantSurvey({ ...base, locations: 'depth' });
    const head = inferVariant(v);
    expect(scorePlacement(v, head).depth).toBe(1);
    expect(head.records.every((p) => p.depthM?.source === 'header')).toBe(true);
    const log = inferVariant(v, { withLog: true });
    expect(log.records.every((p) => p.depthM?.source === 'log')).toBe(true);
  });
  it('a file-name pattern with {depth} gives the depth (source filename) over the header', () => {
    const v = makeVariantSurvey({ ...base, locations: 'depth' });
    const r = inferVariant(v, { settings: { fileNamePattern: '*_d{depth}_{hit}.sg2' } });
    expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 1, channels: 1 });
    expect(r.records.every((p) => p.depthM?.source === 'filename' && p.hit?.source === 'filename')).toBe(true);
  });
  it('hits named nowhere stay unknown (no source), never a guessed direction', () => {
    const v = makeVariantSurvey({ ...base, naming: 'instrument' });
    const r = inferVariant(v);
    expect(r.records.every((p) => p.hit === null)).toBe(true);
    expect(r.inferences.find((i) => i.what === 'hit')?.rule).toBe('nothing names the hit (left unknown)');
  });
  it('NOTE lines with hit and depth words are read as header values', () => {
    const v = makeVariantSurvey({ ...base, naming: 'instrument', locations: 'spread-index', notes: true });
    const r = inferVariant(v);
    expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 1, channels: 1 });
    expect(r.rejected.length).toBe(v.files.length); // the spread is still reported
  });
});

describe('crosshole with user-named holes', () => {
  for (const names of [
    ['S', 'R1', 'R2'],
    ['src@1', 'near:a|b', 'far>2'],
  ] as [string, string, string][]) {
    for (const order of [
      ['V', 'H1'],
      ['H1', 'V'],
    ] as Component[][]) {
      it(`holes ${names.join(', ')}, order ${order.join(' ')}: slots from the hole names, components from words`, () => {
        const v = makeVariantSurvey({ ...base, kind: 'crosshole', holeNames: names, componentOrder: order });
        const r = inferVariant(v);
        expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 0, channels: 1 });
        expect(r.records.every((p) => p.depthM?.source === 'header')).toBe(true);
      });
    }
  }
  it('locations away from the receiver holes are rejected (not at a collar)', () => {
    const v = makeVariantSurvey({
      ...base,
      kind: 'crosshole',
      holeNames: ['S', 'R1', 'R2'],
      componentOrder: ['V', 'H1'],
    });
    const g = variantGeometry(v);
    g.receiverHoles = g.receiverHoles.map((h) => ({ ...h, collarEastM: h.collarEastM + 5 }));
    const r = inferSetup({ records: readVariant(v), geometry: g, settings: defaultPlacementSettings() });
    expect(r.records.every((p) => p.depthM === null)).toBe(true);
    expect(r.rejected.length).toBe(v.files.length);
    expect(r.rejected.every((x) => x.rule === 'not-at-collar')).toBe(true);
  });
});

describe('seismic cone: tip depth logged, receiver = tip - offset', () => {
  it('0.5 m steps, tip depths in the log, receivers 0.25 m above the tip', () => {
    const v = makeVariantSurvey({
      ...base,
      kind: 'seismic-cone',
      naming: 'instrument',
      locations: 'none',
      stepM: 0.5,
      depthCount: 10,
      coneOffsetM: 0.25,
    });
    const r = inferVariant(v, { withLog: true });
    expect(scorePlacement(v, r)).toEqual({ depth: 1, hit: 1, channels: 1 });
    const g = variantGeometry(v);
    for (const t of v.truth) {
      const p = r.records.find((x) => x.file === t.file)!;
      expect(receiverDepthFromLogged(g, 'r0', p.depthM!.value)).toBeCloseTo(t.receiverDepthsM.r0!, 9);
      expect(t.loggedDepthM - t.receiverDepthsM.r0!).toBeCloseTo(0.25, 9);
    }
    const tips = [...new Set(v.truth.map((t) => t.loggedDepthM))].sort((a, b) => a - b);
    expect(tips.slice(0, 3)).toEqual([1, 1.5, 2]);
  });
  it('tip depth written on every trace header is read as the tip depth', () => {
    const v = makeVariantSurvey({ ...base, kind: 'seismic-cone', stepM: 0.5, depthCount: 6, coneOffsetM: 0.3 });
    const r = inferVariant(v);
    expect(scorePlacement(v, r).depth).toBe(1);
  });
});
