/**
 * Regenerates the demo data deterministically (npm run make-demo):
 *   sample-data/downhole/, sample-data/downhole-pair/, sample-data/crosshole/
 *     SEG-2 files, deviation tables (crosshole), truth.csv (true arrivals), project.zip
 *   sample-data/model.csv (the true layered model)
 * The web app makes the same surveys in the browser with makeDemoProject(), so nothing is copied to public/.
 */
import { mkdirSync, readdirSync, rmSync, writeFileSync, statSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readSeg2 } from '../src/core/io/seg2';
import { writeProjectArchive, type ProjectFile } from '../src/core/io/project';
import type { TestKind } from '../src/core/model';
import { demoEarthModel, makeDemoProject } from '../src/core/synth/demo';
import type { SynthResult } from '../src/core/synth/synthesize';
import type { EarthModel } from '../src/core/synth/earth';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const sampleDir = join(root, 'sample-data');

function truthCsv(result: SynthResult): string {
  const head =
    'record_id,depth_m,hit,channel,receiver,component,s_arrival_s,p_arrival_s,s_travel_s,p_travel_s,trigger_delay_s,s_path_m,p_path_m,q_eff_s,q_eff_p,noise_std';
  const f = (x: number, d = 9) => x.toFixed(d);
  const rows = result.truth.records.flatMap((r) =>
    r.channels.map((c) =>
      [
        r.recordId,
        r.depthM,
        r.hit,
        c.channel,
        c.receiver,
        c.component,
        f(c.sArrivalS),
        f(c.pArrivalS),
        f(c.sTravelS),
        f(c.pTravelS),
        f(r.triggerDelayS),
        f(c.sPathM, 6),
        f(c.pPathM, 6),
        f(c.qEffS, 3),
        f(c.qEffP, 3),
        r.noiseStd.toPrecision(6),
      ].join(','),
    ),
  );
  return [head, ...rows].join('\n') + '\n';
}

function modelCsv(model: EarthModel): string {
  const head = 'layer,top_m,bottom_m,vs_mps,vp_skeleton_mps,unit_weight_kn_m3,q_s,q_p,behaviour';
  const rows = model.layers.map((l) =>
    [
      `"${l.name}"`,
      l.topM,
      Number.isFinite(l.thicknessM) ? l.topM + l.thicknessM : '',
      l.vsMps,
      l.vpMps,
      l.unitWeightKnM3,
      l.qS,
      l.qP,
      l.behaviour,
    ].join(','),
  );
  return (
    [
      head,
      ...rows,
      `# water table ${model.waterTableM} m; below it Vp = max(skeleton Vp, ${model.waterVpMps ?? 1500} m/s)`,
    ].join('\n') + '\n'
  );
}

/** Largest difference between written-then-read samples and the synthetic ones, relative to the trace peak. */
function roundTripError(result: SynthResult, files: ProjectFile[]): number {
  let worst = 0;
  result.records.forEach((rec, k) => {
    const back = readSeg2(files[k].bytes, files[k].name);
    rec.traces.forEach((t, j) => {
      let peak = 0;
      let err = 0;
      for (let i = 0; i < t.samples.length; i++) {
        peak = Math.max(peak, Math.abs(t.samples[i]));
        err = Math.max(err, Math.abs(t.samples[i] - back.traces[j].samples[i]));
      }
      worst = Math.max(worst, err / peak);
    });
  });
  return worst;
}

function makeSurvey(kind: TestKind): void {
  const { plan, doc, files, result } = makeDemoProject(kind);
  const dir = join(sampleDir, plan.folder);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const err = roundTripError(result, files);
  if (err > 1e-3) throw new Error(`${plan.folder}: SEG-2 round trip differs by ${err} of the trace peak`);
  for (const f of files) writeFileSync(join(dir, f.name), f.bytes);
  writeFileSync(join(dir, 'truth.csv'), truthCsv(result));
  const zip = writeProjectArchive(doc, files);
  writeFileSync(join(dir, 'project.zip'), zip);
  console.log(
    `${plan.folder}: ${result.records.length} SEG-2 files (${plan.byteOrder}-endian, format ${plan.formatCode}), round-trip error ${err.toExponential(2)} of peak, project.zip ${(zip.length / 1e6).toFixed(2)} MB`,
  );
}

function folderBytes(dir: string): number {
  return readdirSync(dir).reduce((s, n) => {
    const p = join(dir, n);
    const st = statSync(p);
    return s + (st.isDirectory() ? folderBytes(p) : st.size);
  }, 0);
}

function main(): void {
  const model = demoEarthModel();
  mkdirSync(sampleDir, { recursive: true });
  writeFileSync(join(sampleDir, 'model.csv'), modelCsv(model));
  for (const kind of ['downhole', 'downhole-pair', 'crosshole'] as const) makeSurvey(kind);
  console.log(`sample-data: ${(folderBytes(sampleDir) / 1e6).toFixed(2)} MB`);
}

main();
