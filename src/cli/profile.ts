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
import { toErrorInfo } from '../core';
import { openProject, readProjectArchive, type OpenedProject, type ProjectSource } from '../core';
import { patchSettings } from '../core';
import { runPipeline, type PipelineResult, type Settings } from '../core';
import {
  directTable,
  intervalsTable,
  layersTable,
  picksTable,
  profileCautions,
  profileTable,
  siteJson,
  toCsv,
} from '../core';
import { INTERVAL_METHODS, profileMethodFor, type IntervalMethod } from '../core';
import { hasDirectVelocities } from '../core';
import { curvesCautions, curvesTable, liquefactionCautions, liquefactionTable } from '../core';
import { type CliIo, cliPath } from './inspect';
import { openFieldFolder, type FolderFlags } from './folder';
import type { UnitSystem } from '../core';

/** A folder as a project source: project.json and the listed files beside it (sub-folders allowed). */
export function folderSource(dir: string): ProjectSource {
  const inside = (p: string) => join(dir, ...p.split('/'));
  const walk = (rel: string): string[] =>
    readdirSync(join(dir, rel), { withFileTypes: true }).flatMap((e) => {
      const p = rel ? `${rel}/${e.name}` : e.name;
      return e.isDirectory() ? walk(p) : [p];
    });
  return {
    name: basename(dir),
    projectJson: () =>
      existsSync(inside('project.json')) ? new Uint8Array(readFileSync(inside('project.json'))) : null,
    readListed(paths) {
      const files = new Map<string, Uint8Array>();
      for (const p of paths) {
        const full = inside(p);
        if (existsSync(full) && statSync(full).isFile()) files.set(p, new Uint8Array(readFileSync(full)));
      }
      return { files, present: walk('') };
    },
  };
}

/** A saved project: a project archive, or a folder holding project.json and its files. */
export function openSavedProject(input: string): OpenedProject {
  return statSync(input).isDirectory()
    ? openProject(folderSource(input))
    : readProjectArchive(new Uint8Array(readFileSync(input)), basename(input));
}

/** The pipeline over an opened project under the given settings. */
export function runOpenedProject(opened: OpenedProject, settings: Settings): PipelineResult {
  const project = opened.doc;
  return runPipeline({
    survey: project.survey,
    records: opened.records,
    settings,
    edits: project.edits,
    comparison: project.comparison ?? null,
  });
}

/** The value of --units, or null after saying why it is refused (`command` starts the line). */
export function unitsOption(command: string, value: string | undefined, io: CliIo): UnitSystem | null {
  if (value === 'SI' || value === 'US') return value;
  io.stderr.write(`${command}: --units ${value ?? ''} is not SI or US\n`);
  return null;
}

/** A folder is set up from its files when it has no project.json, or one whose survey has no records. */
function needsSetup(dir: string): boolean {
  const path = join(dir, 'project.json');
  if (!existsSync(path)) return true;
  try {
    const raw = JSON.parse(readFileSync(path, 'utf8')) as { survey?: { records?: unknown } };
    return raw.survey !== undefined && raw.survey.records === undefined;
  } catch {
    return false; // openFolder reports the bad JSON
  }
}

const NUMBER_FLAGS: Record<string, keyof FolderFlags> = {
  '--source-offset-m': 'sourceOffsetM',
  '--receiver-spacing-m': 'receiverSpacingM',
  '--cone-offset-m': 'coneOffsetM',
  '--receiver-count': 'receiverCount',
  '--max-header-depth-m': 'maxHeaderDepthM',
};

export async function runProfile(args: string[], io: CliIo): Promise<number> {
  let input: string | undefined;
  let out: string | undefined;
  let method: string | undefined;
  let strict = false;
  let units: UnitSystem = 'SI';
  let pgaG: number | undefined;
  let magnitude: number | undefined;
  const flags: FolderFlags = { holes: [] };
  let setupFlagGiven = false;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a in NUMBER_FLAGS) {
      const v = Number(args[++i]);
      if (!Number.isFinite(v)) {
        io.stderr.write(`profile: ${a} ${args[i] ?? ''} is not a number\n`);
        return 2;
      }
      (flags as unknown as Record<string, number>)[NUMBER_FLAGS[a]] = v;
      setupFlagGiven = true;
    } else if (a === '--kind') {
      flags.kind = args[++i];
      setupFlagGiven = true;
    } else if (a === '--records') {
      flags.records = args[++i];
      setupFlagGiven = true;
    } else if (a === '--file-name-pattern') {
      flags.fileNamePattern = args[++i];
      setupFlagGiven = true;
    } else if (a === '--hole') {
      flags.holes.push(args[++i] ?? '');
      setupFlagGiven = true;
    } else if (a === '--pga-g' || a === '--magnitude') {
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
    } else if (a === '--out') out = args[++i];
    else if (a === '--method') method = args[++i];
    else if (a === '--strict') strict = true;
    else if (a === '--units') {
      const u = unitsOption('profile', args[++i], io);
      if (!u) return 2;
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
        '] [--units SI|US] [--pga-g <g> --magnitude <Mw>] [--strict]\n' +
        '       cli profile <folder of field files> --out <dir> [--kind downhole|downhole-pair|crosshole|seismic-cone]\n' +
        '         [--source-offset-m X] [--receiver-spacing-m S] [--cone-offset-m C] [--receiver-count 1|2]\n' +
        '         [--records log.csv] [--hole name=east,north ...] [--file-name-pattern P] [--max-header-depth-m D]\n',
    );
    return 2;
  }
  // Relative paths are the caller's (npm run changes to the repository folder).
  input = cliPath(io, input);
  out = cliPath(io, out);
  const cwd = io.cwd ?? process.cwd();
  if (method && !INTERVAL_METHODS.includes(method as IntervalMethod)) {
    io.stderr.write(`profile: --method ${method} is not one of ${INTERVAL_METHODS.join(', ')}\n`);
    return 2;
  }
  if ((pgaG === undefined) !== (magnitude === undefined)) {
    io.stderr.write('profile: give both --pga-g and --magnitude for the liquefaction screen\n');
    return 2;
  }
  let opened: OpenedProject;
  let completed: unknown = null;
  const setupIssues: { code: string; message: string; file?: string }[] = [];
  try {
    if (!existsSync(input)) throw new Error(`${input} does not exist`);
    const isDir = statSync(input).isDirectory();
    if (isDir && needsSetup(input)) {
      const s = openFieldFolder(input, flags, cwd);
      for (const line of s.lines) io.stdout.write(`${line}\n`);
      opened = s.opened;
      completed = s.completed;
      setupIssues.push(...s.issues);
    } else {
      if (setupFlagGiven)
        throw new Error(`${input} holds a complete project; set-up flags apply only to a folder of field files`);
      opened = openSavedProject(input);
    }
  } catch (e) {
    io.stderr.write(`profile: ${toErrorInfo(e, input).message.replace(/^Unexpected problem: /, '')}\n`);
    return 2;
  }
  const project = opened.doc;
  // --pga-g and --magnitude override the project's settings.design for this run.
  const settings = patchSettings(project.settings, {
    ...(method ? { intervals: { profileMethod: method as IntervalMethod } } : {}),
    ...(pgaG !== undefined && magnitude !== undefined ? { design: { pgaG, magnitude } } : {}),
  });
  const result = runOpenedProject(opened, settings);
  const issues = [...setupIssues, ...opened.issues, ...result.derived.issues];
  for (const p of issues) io.stderr.write(`warning: ${p.file ? p.file + ': ' : ''}${p.message} [${p.code}]\n`);
  const setup = result.derived.setupProblems;
  for (const p of setup)
    io.stderr.write(
      `set-up ${p.blocking ? 'problem (blocking)' : 'warning'}: ${p.message} Fix: ${p.fix} [${p.code}, ${p.count}]\n`,
    );
  mkdirSync(out, { recursive: true });
  if (completed) writeFileSync(join(out, 'project.json'), `${JSON.stringify(completed, null, 1)}\n`);
  writeFileSync(join(out, 'picks.csv'), toCsv(picksTable(result.prepared.stations, result.derived, units)));
  writeFileSync(join(out, 'intervals.csv'), toCsv(intervalsTable(result.derived, units)));
  writeFileSync(join(out, 'profile.csv'), toCsv(profileTable(result.derived, units), profileCautions(result.derived)));
  writeFileSync(join(out, 'layers.csv'), toCsv(layersTable(result.derived, units)));
  writeFileSync(join(out, 'curves.csv'), toCsv(curvesTable(result.derived, units), curvesCautions(result.derived)));
  const liq = liquefactionTable(result.derived, units);
  if (liq) writeFileSync(join(out, 'liquefaction.csv'), toCsv(liq, liquefactionCautions()));
  if (hasDirectVelocities(project.survey.kind))
    writeFileSync(join(out, 'direct.csv'), toCsv(directTable(result.derived, units)));
  writeFileSync(join(out, 'site.json'), JSON.stringify(siteJson(result.derived, settings), null, 2) + '\n');
  const v = result.derived.site.vs30;
  io.stdout.write(
    `${project.survey.name}: ${result.derived.profile.length} intervals (${profileMethodFor(settings.intervals.profileMethod, project.survey.kind)}), ` +
      (v
        ? `Vs30 ${v.vsMps.toFixed(1)} m/s to ${v.toDepthM.toFixed(1)} m`
        : (result.derived.site.setupIncomplete ?? 'no time-averaged Vs')) +
      `; wrote ${completed ? 'project.json, ' : ''}picks.csv, intervals.csv, profile.csv, layers.csv, curves.csv, ${liq ? 'liquefaction.csv, ' : ''}${hasDirectVelocities(project.survey.kind) ? 'direct.csv, ' : ''}site.json to ${out}\n`,
  );
  // Exit 0 with problems listed; under --strict, 3 when any problem (blocking set-up problems included) stands.
  return strict && (issues.length || setup.some((p) => p.blocking)) ? 3 : 0;
}
