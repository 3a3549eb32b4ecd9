/**
 * Placement figures on forward-model variants (held-out seeds, not used while writing the rules):
 * share of records with depth, hit and every channel placed right, and the sources used.
 * Run: npx tsx scripts/setup-figures.ts
 */
import { readWaveFile } from '../src/core/io/readers';
import { readRecordLog } from '../src/core/io/recordlog';
import type { Component } from '../src/core/model';
import { inferSetup } from '../src/core/setup/infer';
import { defaultPlacementSettings, type SetupGeometry } from '../src/core/setup/types';
import { makeVariantSurvey, type VariantSpec } from '../src/core/synth/variants';

const ORDERS: Component[][] = [
  ['H1', 'H2', 'V'],
  ['H1', 'V', 'H2'],
  ['H2', 'H1', 'V'],
  ['H2', 'V', 'H1'],
  ['V', 'H1', 'H2'],
  ['V', 'H2', 'H1'],
];
const specs: VariantSpec[] = [];
let seed = 9000;
for (const kind of ['downhole', 'downhole-pair', 'seismic-cone'] as const)
  for (const order of ORDERS)
    for (const labels of ['receiver-words', 'registration'] as const)
      for (const locations of ['depth', 'spread-index', 'station-numbers', 'one-station', 'none'] as const)
        specs.push({
          kind,
          seed: seed++,
          componentOrder: order,
          labels,
          locations,
          naming: 'instrument',
          notes: false,
          format: 'seg2',
          depthCount: 3,
          stepM: kind === 'seismic-cone' ? 0.5 : 1,
        });
for (const order of ORDERS)
  specs.push({
    kind: 'downhole',
    seed: seed++,
    componentOrder: order,
    labels: 'zne',
    locations: 'none',
    naming: 'instrument',
    notes: false,
    format: 'text',
    depthCount: 3,
  });
for (const names of [
  ['S', 'R1', 'R2'],
  ['src@1', 'a:b|c', 'far>2'],
  ['B1', 'B2', 'B3'],
] as [string, string, string][])
  for (const order of [
    ['V', 'H1'],
    ['H1', 'V'],
  ] as Component[][])
    for (const locations of ['depth', 'spread-index'] as const)
      specs.push({
        kind: 'crosshole',
        seed: seed++,
        componentOrder: order,
        labels: 'receiver-words',
        locations,
        naming: 'instrument',
        notes: false,
        format: 'seg2',
        depthCount: 3,
        holeNames: names,
      });

let surveys = 0;
let records = 0;
let okDepthHeader = 0;
let headerDepthExpected = 0;
let wrongHeaderDepth = 0;
let okAllWithLog = 0;
let rejected = 0;
for (const spec of specs) {
  const v = makeVariantSurvey(spec);
  const recs = v.files.map((f) => {
    const o = readWaveFile(f.bytes, f.name);
    if (!o.ok) throw new Error(o.error.message);
    return o.record;
  });
  const g: SetupGeometry = {
    kind: spec.kind,
    receiverCount: spec.kind === 'downhole' || spec.kind === 'seismic-cone' ? 1 : 2,
    receiverSpacingM: v.geometry.receiverSpacingM,
    coneOffsetM: v.geometry.coneOffsetM,
    receiverHoles: v.geometry.holes
      .slice(1)
      .map((h) => ({ holeId: h.id, collarEastM: h.collarEastM, collarNorthM: h.collarNorthM })),
  };
  const noLog = inferSetup({ records: recs, geometry: g, settings: defaultPlacementSettings() });
  const withLog = inferSetup({
    records: recs,
    geometry: g,
    settings: defaultPlacementSettings(),
    log: readRecordLog(v.recordLogCsv, 'log.csv'),
  });
  surveys++;
  rejected += noLog.rejected.length;
  for (const t of v.truth) {
    records++;
    const a = noLog.records.find((r) => r.file === t.file)!;
    if (spec.locations === 'depth') {
      headerDepthExpected++;
      if (a.depthM && Math.abs(a.depthM.value - t.loggedDepthM) < 1e-6 && a.depthM.source === 'header') okDepthHeader++;
    } else if (a.depthM) wrongHeaderDepth++;
    const b = withLog.records.find((r) => r.file === t.file)!;
    const chOk = t.channels.every((c) =>
      b.channels.some((q) => q.channel === c.channel && q.receiver === c.receiver && q.component === c.component),
    );
    if (b.depthM?.value === t.loggedDepthM && b.depthM.source === 'log' && b.hit?.value === t.hit && chOk)
      okAllWithLog++;
  }
}
console.log(`${surveys} variant surveys, ${records} records`);
console.log(
  `header depth placed right (source header) where the header holds one: ${okDepthHeader}/${headerDepthExpected}`,
);
console.log(`depth taken from a header that holds no depth (spread, station numbers, none): ${wrongHeaderDepth}`);
console.log(`header values rejected with a rule: ${rejected}`);
console.log(`with the record log, depth + hit + every channel right: ${okAllWithLog}/${records}`);
