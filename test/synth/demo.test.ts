/**
 * The demo scenario: plausible model, files that read back through the project's own readers, and
 * the same bytes on every run.
 */
import { describe, expect, it } from 'vitest';
import { readSeg2 } from '../../src/core/io/seg2';
import { readDeviationTable } from '../../src/core/io/deviation';
import { demoEarthModel, makeDemoProject } from '../../src/core/synth/demo';
import { trueVsAt, validateEarthModel } from '../../src/core/synth/earth';

describe('demo site model', () => {
  const m = demoEarthModel();

  it('is valid, water table near 2 m, weathered rock from 25 m', () => {
    expect(() => validateEarthModel(m)).not.toThrow();
    expect(m.waterTableM).toBeGreaterThan(1.5);
    expect(m.waterTableM).toBeLessThan(2.5);
    expect(m.layers[m.layers.length - 1].topM).toBe(25);
  });

  it('Vs and unit weights inside the typical ranges of docs/methods.md section 5 (memory): Vs 80-900 m/s, 15-22 kN/m3', () => {
    for (const l of m.layers) {
      expect(l.vsMps).toBeGreaterThanOrEqual(80);
      expect(l.vsMps).toBeLessThanOrEqual(900);
      expect(l.unitWeightKnM3).toBeGreaterThanOrEqual(15);
      expect(l.unitWeightKnM3).toBeLessThanOrEqual(22);
    }
  });

  it('time-averaged Vs to 30 m = 30 / sum(d_i / Vs_i) (EN 1998-1 eq. 3.1) = 238.0 m/s by hand from the layer table', () => {
    // 1.6/165 + 5.4/115 + 6.5/215 + 7.5/330 + 4/440 + 5/680 = 0.1260579 s -> 237.99 m/s.
    let slowness = 0;
    for (let z = 0.005; z < 30; z += 0.01) slowness += 0.01 / trueVsAt(m, z);
    expect(30 / slowness).toBeCloseTo(237.99, 1);
  });
});

describe('demo crosshole project', () => {
  const demo = makeDemoProject('crosshole');

  it('every SEG-2 file reads back (io/seg2.ts) with the depth in RECEIVER_LOCATION and the hit in a NOTE line', () => {
    const seg2 = demo.files.filter((f) => f.name.endsWith('.sg2'));
    expect(seg2.length).toBe(38);
    for (const f of seg2) {
      const rec = readSeg2(f.bytes, f.name);
      const a = demo.doc.survey.records.find((r) => r.recordId === f.name)!;
      expect(rec.traces[0].receiverLocation![2]).toBeCloseTo(a.depthM!, 9);
      expect(rec.notes).toContain(`HIT ${a.hit}`);
      expect(rec.byteOrder).toBe('big');
      expect(rec.formatCode).toBe(2);
    }
  });

  it('deviation tables read back (io/deviation.ts) to the survey boreholes', () => {
    for (const hole of demo.doc.survey.boreholes) {
      const name = demo.doc.deviationFiles![hole.id];
      const f = demo.files.find((x) => x.name === name)!;
      const stations = readDeviationTable(new TextDecoder().decode(f.bytes), name);
      expect(stations).toEqual(hole.deviation);
    }
  });

  it('holes drift a few tenths of a metre over 30 m', () => {
    for (const hole of demo.doc.survey.boreholes) {
      const last = hole.deviation[hole.deviation.length - 1];
      const drift = Math.hypot(last.eastM, last.northM);
      expect(drift).toBeGreaterThan(0.1);
      expect(drift).toBeLessThan(0.5);
    }
  });

  it('is byte-for-byte the same on a second run (seeded)', () => {
    const again = makeDemoProject('crosshole');
    expect(again.files.length).toBe(demo.files.length);
    again.files.forEach((f, i) => expect(Buffer.from(f.bytes).equals(Buffer.from(demo.files[i].bytes))).toBe(true));
  });
});
