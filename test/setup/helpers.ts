import { readWaveFile } from '../../src/core/io/readers';
import { readRecordLog } from '../../src/core/io/recordlog';
import type { WaveRecord } from '../../src/core/model';
import { inferSetup, type SetupResult } from '../../src/core/setup/infer';
import { defaultPlacementSettings, type PlacementSettings, type SetupGeometry } from '../../src/core/setup/types';
import type { VariantSurvey } from '../../src/core/synth/variants';

export function readVariant(v: VariantSurvey): WaveRecord[] {
  return v.files.map((f) => {
    const out = readWaveFile(f.bytes, f.name);
    if (!out.ok) throw new Error(out.error.message);
    return out.record;
  });
}

export function variantGeometry(v: VariantSurvey): SetupGeometry {
  const holes = v.geometry.holes;
  return {
    kind: v.spec.kind,
    receiverCount: v.spec.kind === 'downhole' || v.spec.kind === 'seismic-cone' ? 1 : 2,
    receiverSpacingM: v.geometry.receiverSpacingM,
    coneOffsetM: v.geometry.coneOffsetM,
    receiverHoles: holes
      .slice(1)
      .map((h) => ({ holeId: h.id, collarEastM: h.collarEastM, collarNorthM: h.collarNorthM })),
  };
}

export function inferVariant(
  v: VariantSurvey,
  opts: { withLog?: boolean; settings?: Partial<PlacementSettings> } = {},
): SetupResult {
  return inferSetup({
    records: readVariant(v),
    geometry: variantGeometry(v),
    settings: { ...defaultPlacementSettings(), ...opts.settings },
    log: opts.withLog ? readRecordLog(v.recordLogCsv, 'log.csv') : null,
  });
}

/** Share of records whose depth, hit and every channel match the truth. */
export function scorePlacement(v: VariantSurvey, r: SetupResult): { depth: number; hit: number; channels: number } {
  let depth = 0;
  let hit = 0;
  let channels = 0;
  for (const t of v.truth) {
    const p = r.records.find((x) => x.file === t.file)!;
    if (p.depthM && Math.abs(p.depthM.value - t.loggedDepthM) < 1e-6) depth++;
    if (p.hit?.value === t.hit) hit++;
    if (
      t.channels.every((c) =>
        p.channels.some((q) => q.channel === c.channel && q.receiver === c.receiver && q.component === c.component),
      )
    )
      channels++;
  }
  const n = v.truth.length;
  return { depth: depth / n, hit: hit / n, channels: channels / n };
}
