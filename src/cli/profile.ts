/**
 * `cli profile <project.zip|folder> --out <dir> [--method <m>] [--units SI|US] [--pga-g <g> --magnitude <Mw>]
 * [--strict]`: runs the pipeline on a project and writes picks.csv, intervals.csv, profile.csv, layers.csv,
 * curves.csv, site.json, for crosshole direct.csv (source-to-receiver velocities), and liquefaction.csv when
 * the shaking is given (by the options, which override the project's settings.design, or by the project). Problems with single items
 * (a missing file, a record with no depth) are listed on stderr and the rest still computes; an
 * unreadable project exits 2 with a one-line reason; --strict also exits 3 when any problem was listed.
 */
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { toErrorInfo } from '../core/errors';
import { readProjectArchive, validateProjectDocument, type OpenedProject } from '../core/io/archive';
import { loadProject } from '../core/io/project';
import { runPipeline } from '../core/pipeline';
import {
  directTable,
  intervalsTable,
  layersTable,
  picksTable,
  profileTable,
  siteJson,
  toCsv,
} from '../core/report/tables';
import { INTERVAL_METHODS, type IntervalMethod } from '../core/catalogue/methods';
import { hasDirectVelocities } from '../core/catalogue/testKinds';
import { curvesCautions, curvesTable, liquefactionCautions, liquefactionTable } from '../core/report/design';
import { defaultDesignSettings } from '../core/settings';
import type { CliIo } from './inspect';
import type { UnitSystem } from '../core/units';

function openFolder(dir: string): OpenedProject {
  const path = join(dir, 'project.json');
  if (!existsSync(path)) throw new Error(`${dir} has no project.json`);
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, 'utf8'));
  } catch (e) {
    throw new Error(`${path} is not valid JSON: ${(e as Error).message}`);
  }
  const doc = validateProjectDocument(raw, dir);
  const present = new Set(readdirSync(dir));
  const files = doc.files
    .filter((n) => present.has(n))
    .map((n) => ({ name: n, bytes: new Uint8Array(readFileSync(join(dir, n))) }));
  return { doc, files, missing: doc.files.filter((n) => !present.has(n)) };
}

export async function runProfile(args: string[], io: CliIo): Promise<number> {
  let input: string | undefined;
  let out: string | undefined;
  let method: string | undefined;
  let strict = false;
  let units: UnitSystem = 'SI';
  let pgaG: number | undefined;
  let magnitude: number | undefined;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--out') out = args[++i];
    else if (a === '--pga-g' || a === '--magnitude') {
      const raw = args[++i];
      const v = Number(raw);
      const ok = a === '--pga-g' ? v > 0 && v <= 3 : v >= 4 && v <= 9.5;
      if (raw === undefined || raw.trim() === '' || !Number.isFinite(v) || !ok) {
        io.stderr.write(
          `profile: ${a} ${raw ?? ''} must be a number ${a === '--pga-g' ? 'above 0 and at most 3 (g)' : 'from 4 to 9.5'}\n`,
        );
        return 2;
      }
      if (a === '--pga-g') pgaG = v;
      else magnitude = v;
    } else if (a === '--method') method = args[++i];
    else if (a === '--strict') strict = true;
    else if (a === '--units') {
      const u = args[++i];
      if (u !== 'SI' && u !== 'US') {
        io.stderr.write(`profile: --units ${u ?? ''} is not SI or US\n`);
        return 2;
      }
      units = u;
    } else if (a.startsWith('--')) {
      io.stderr.write(`profile: unknown option ${a}\n`);
      return 2;
    } else input = a;
  }
  if (!input || !out) {
    io.stderr.write(
      'usage: cli profile <project.zip|folder> --out <dir> [--method ' +
        INTERVAL_METHODS.join('|') +
        '] [--units SI|US] [--pga-g <g> --magnitude <Mw>] [--strict]\n',
    );
    return 2;
  }
  if (method && !INTERVAL_METHODS.includes(method as IntervalMethod)) {
    io.stderr.write(`profile: --method ${method} is not one of ${INTERVAL_METHODS.join(', ')}\n`);
    return 2;
  }
  if ((pgaG === undefined) !== (magnitude === undefined)) {
    io.stderr.write('profile: give both --pga-g and --magnitude for the liquefaction screen\n');
    return 2;
  }
  let opened: OpenedProject;
  try {
    if (!existsSync(input)) throw new Error(`${input} does not exist`);
    opened = statSync(input).isDirectory()
      ? openFolder(input)
      : readProjectArchive(new Uint8Array(readFileSync(input)), basename(input));
  } catch (e) {
    io.stderr.write(`profile: ${toErrorInfo(e, input).message.replace(/^Unexpected problem: /, '')}\n`);
    return 2;
  }
  const project = loadProject(opened, basename(input));
  const base = method ? { ...project.settings, profileMethod: method as IntervalMethod } : project.settings;
  const design = { ...defaultDesignSettings(), ...(base.design ?? {}) };
  if (pgaG !== undefined && magnitude !== undefined) Object.assign(design, { pgaG, magnitude });
  const settings = { ...base, design };
  const result = runPipeline({
    survey: project.survey,
    records: project.records,
    settings,
    edits: project.edits,
    comparison: project.comparison,
  });
  const issues = [...project.issues, ...result.derived.issues];
  for (const p of issues) io.stderr.write(`warning: ${p.file ? p.file + ': ' : ''}${p.message} [${p.code}]\n`);
  mkdirSync(out, { recursive: true });
  writeFileSync(join(out, 'picks.csv'), toCsv(picksTable(result.prepared.stations, result.derived, units)));
  writeFileSync(join(out, 'intervals.csv'), toCsv(intervalsTable(result.derived, units)));
  writeFileSync(join(out, 'profile.csv'), toCsv(profileTable(result.derived, units)));
  writeFileSync(join(out, 'layers.csv'), toCsv(layersTable(result.derived, units)));
  writeFileSync(join(out, 'curves.csv'), toCsv(curvesTable(result.derived, units), curvesCautions(result.derived)));
  const liq = liquefactionTable(result.derived, units);
  if (liq) writeFileSync(join(out, 'liquefaction.csv'), toCsv(liq, liquefactionCautions()));
  if (hasDirectVelocities(project.survey.kind))
    writeFileSync(join(out, 'direct.csv'), toCsv(directTable(result.derived, units)));
  writeFileSync(join(out, 'site.json'), JSON.stringify(siteJson(result.derived, settings), null, 2) + '\n');
  const v = result.derived.site.vs30;
  io.stdout.write(
    `${project.survey.name}: ${result.derived.profile.length} intervals (${settings.profileMethod}), ` +
      (v ? `Vs30 ${v.vsMps.toFixed(1)} m/s to ${v.toDepthM.toFixed(1)} m` : 'no time-averaged Vs') +
      `; wrote picks.csv, intervals.csv, profile.csv, layers.csv, curves.csv, ${liq ? 'liquefaction.csv, ' : ''}${hasDirectVelocities(project.survey.kind) ? 'direct.csv, ' : ''}site.json to ${out}\n`,
  );
  return strict && issues.length ? 3 : 0;
}
