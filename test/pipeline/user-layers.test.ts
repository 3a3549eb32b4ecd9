import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readProjectArchive } from '../../src/core';
import { runPipeline } from '../../src/core/pipeline';

describe('user layer boundaries on the one-receiver demo survey (issue 14)', () => {
  it('[1.5, 10.89] m gives a layered model of three layers, the top one between 120 and 250 m/s', () => {
    // The demo's forward model has 165 m/s down to 1.6 m (src/core/synth demoEarthModel); a 1.5 m top
    // layer of one receiver is poorly resolved but must come out positive, with an sd that covers it.
    const opened = readProjectArchive(new Uint8Array(readFileSync('sample-data/downhole/project.zip')), 'project.zip');
    const doc = opened.doc;
    const settings = {
      ...doc.settings,
      layering: { ...doc.settings.layering, mode: 'user' as const, boundariesM: [1.5, 10.89] },
    };
    const r = runPipeline({ survey: doc.survey, records: opened.records, settings, edits: doc.edits });
    expect(r.derived.layering.reason).toBeNull();
    const layers = r.derived.layering.fit!.layers;
    expect(layers.map((l) => l.topM)).toEqual([0, 1.5, 10.89]);
    expect(layers[0].vsMps).toBeGreaterThan(120);
    expect(layers[0].vsMps).toBeLessThan(250);
    expect(Math.abs(layers[0].vsMps - 165)).toBeLessThan(2 * layers[0].vsSdMps);
  });
});
