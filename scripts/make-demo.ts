/**
 * Regenerates the demo data deterministically (npm run make-demo):
 *   sample-data/downhole/, sample-data/downhole-pair/, sample-data/crosshole/
 *     SEG-2 files, deviation tables (crosshole), truth.csv (true arrivals), project.zip
 *   sample-data/model.csv (the true layered model)
 *   public/demo/<survey>.zip (copies of the three project archives for the web app)
 */
import { mkdirSync, readdirSync, rmSync, writeFileSync, copyFileSync, statSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readSeg2, writeSeg2 } from '../src/core/io/seg2';
import { newProjectDocument, writeProjectArchive, type ProjectFile } from '../src/core/io/archive';
import type { ByteOrder } from '../src/core/model';
import {
  demoCrossholeGeometry,
  demoCrossholeOptions,
  demoDownholeGeometry,
  demoDownholeOptions,
  demoEarthModel,
  demoPairGeometry,
  demoPairOptions,
  deviationCsv,
} from '../src/core/synth/demo';
import { synthesizeSurvey, toSeg2Input, type SynthGeometry, type SynthOptions, type SynthResult } from '../src/core/synth/synthesize';
import type { EarthModel } from '../src/core/synth/earth';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const sampleDir = join(root, 'sample-data');
const publicDir = join(root, 'public', 'demo');

interface Plan {
  folder: string;
  geometry: SynthGeometry;
  options: SynthOptions;
  byteOrder: ByteOrder;
  formatCode: 1 | 2 | 4;
}

function truthCsv(result: SynthResult): string {
  const head = 'record_id,depth_m,hit,channel,receiver,component,s_arrival_s,p_arrival_s,s_travel_s,p_travel_s,trigger_delay_s,s_path_m,p_path_m,q_eff_s,q_eff_p,noise_std';
  const f = (x: number, d = 9) => x.toFixed(d);
  const rows = result.truth.records.flatMap((r) =>
    r.channels.map((c) =>
      [r.recordId, r.depthM, r.hit, c.channel, c.receiver, c.component, f(c.sArrivalS), f(c.pArrivalS), f(c.sTravelS), f(c.pTravelS), f(r.triggerDelayS), f(c.sPathM, 6), f(c.pPathM, 6), f(c.qEffS, 3), f(c.qEffP, 3), r.noiseStd.toPrecision(6)].join(','),
    ),
  );
  return [head, ...rows].join('\n') + '\n';
}

function modelCsv(model: EarthModel): string {
  const head = 'layer,top_m,bottom_m,vs_mps,vp_skeleton_mps,unit_weight_kn_m3,q_s,q_p,behaviour';
  const rows = model.layers.map((l) => [`"${l.name}"`, l.topM, Number.isFinite(l.thicknessM) ? l.topM + l.thicknessM : '', l.vsMps, l.vpMps, l.unitWeightKnM3, l.qS, l.qP, l.behaviour].join(','));
  return [head, ...rows, `# water table ${model.waterTableM} m; below it Vp = max(skeleton Vp, ${model.waterVpMps ?? 1500} m/s)`].join('\n') + '\n';
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

function makeSurvey(model: EarthModel, plan: Plan): void {
  const dir = join(sampleDir, plan.folder);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const result = synthesizeSurvey(model, plan.geometry, plan.options);
  const files: ProjectFile[] = result.records.map((r) => ({
    name: r.fileName,
    bytes: writeSeg2(toSeg2Input(r), { byteOrder: plan.byteOrder, formatCode: plan.formatCode }),
  }));
  const err = roundTripError(result, files);
  if (err > 1e-3) throw new Error(`${plan.folder}: SEG-2 round trip differs by ${err} of the trace peak`);
  const deviationFiles: Record<string, string> = {};
  const extra: ProjectFile[] = [];
  if (plan.geometry.kind === 'crosshole') {
    for (const hole of plan.geometry.holes) {
      const name = `${hole.id}_deviation.csv`;
      deviationFiles[hole.id] = name;
      extra.push({ name, bytes: new TextEncoder().encode(deviationCsv(hole)) });
    }
  }
  for (const f of [...files, ...extra]) writeFileSync(join(dir, f.name), f.bytes);
  writeFileSync(join(dir, 'truth.csv'), truthCsv(result));
  const doc = newProjectDocument(result.survey);
  if (Object.keys(deviationFiles).length > 0) doc.deviationFiles = deviationFiles;
  doc.notes = `Synthetic demo survey of the invented site "${model.name}" (npm run make-demo). True model: sample-data/README.md.`;
  const zip = writeProjectArchive(doc, [...files, ...extra]);
  writeFileSync(join(dir, 'project.zip'), zip);
  mkdirSync(publicDir, { recursive: true });
  copyFileSync(join(dir, 'project.zip'), join(publicDir, `${plan.folder}.zip`));
  console.log(`${plan.folder}: ${files.length} SEG-2 files (${plan.byteOrder}-endian, format ${plan.formatCode}), round-trip error ${err.toExponential(2)} of peak, project.zip ${(zip.length / 1e6).toFixed(2)} MB`);
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
  const plans: Plan[] = [
    { folder: 'downhole', geometry: demoDownholeGeometry(), options: demoDownholeOptions(), byteOrder: 'little', formatCode: 4 },
    { folder: 'downhole-pair', geometry: demoPairGeometry(), options: demoPairOptions(), byteOrder: 'big', formatCode: 1 },
    { folder: 'crosshole', geometry: demoCrossholeGeometry(), options: demoCrossholeOptions(), byteOrder: 'big', formatCode: 2 },
  ];
  for (const p of plans) makeSurvey(model, p);
  console.log(`sample-data: ${(folderBytes(sampleDir) / 1e6).toFixed(2)} MB; public/demo: ${(folderBytes(publicDir) / 1e6).toFixed(2)} MB`);
}

main();
