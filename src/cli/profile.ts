/**
 * `cli profile <project.zip|folder> --out <dir> [--method <m>] [--units SI|US] [--strict]`: runs the pipeline on a
 * project and writes picks.csv, intervals.csv, profile.csv, layers.csv, site.json and, for crosshole,
 * direct.csv (source-to-receiver velocities). Problems with single items
 * (a missing file, a record with no depth) are listed on stderr and the rest still computes; an
 * unreadable project exits 2 with a one-line reason; --strict also exits 3 when any problem was listed.
 */
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { toErrorInfo } from '../core';
import { openProject, readProjectArchive, type OpenedProject, type ProjectSource } from '../core';
import { patchSettings } from '../core';
import { runPipeline } from '../core';
import { directTable, intervalsTable, layersTable, picksTable, profileTable, siteJson, toCsv } from '../core';
import { INTERVAL_METHODS, type IntervalMethod } from '../core';
import { hasDirectVelocities } from '../core';
import { type CliIo, cliPath } from './inspect';
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

export async function runProfile(args: string[], io: CliIo): Promise<number> {
  let input: string | undefined;
  let out: string | undefined;
  let method: string | undefined;
  let strict = false;
  let units: UnitSystem = 'SI';
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--out') out = args[++i];
    else if (a === '--method') method = args[++i];
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
        '] [--units SI|US] [--strict]\n',
    );
    return 2;
  }
  // Relative paths are the caller's (npm run changes to the repository folder).
  input = cliPath(io, input);
  out = cliPath(io, out);
  if (method && !INTERVAL_METHODS.includes(method as IntervalMethod)) {
    io.stderr.write(`profile: --method ${method} is not one of ${INTERVAL_METHODS.join(', ')}\n`);
    return 2;
  }
  let opened: OpenedProject;
  try {
    if (!existsSync(input)) throw new Error(`${input} does not exist`);
    opened = statSync(input).isDirectory()
      ? openProject(folderSource(input))
      : readProjectArchive(new Uint8Array(readFileSync(input)), basename(input));
  } catch (e) {
    io.stderr.write(`profile: ${toErrorInfo(e, input).message.replace(/^Unexpected problem: /, '')}\n`);
    return 2;
  }
  const project = opened.doc;
  const settings = method
    ? patchSettings(project.settings, { intervals: { profileMethod: method as IntervalMethod } })
    : project.settings;
  const result = runPipeline({
    survey: project.survey,
    records: opened.records,
    settings,
    edits: project.edits,
    comparison: project.comparison ?? null,
  });
  const issues = [...opened.issues, ...result.derived.issues];
  for (const p of issues) io.stderr.write(`warning: ${p.file ? p.file + ': ' : ''}${p.message} [${p.code}]\n`);
  mkdirSync(out, { recursive: true });
  writeFileSync(join(out, 'picks.csv'), toCsv(picksTable(result.prepared.stations, result.derived, units)));
  writeFileSync(join(out, 'intervals.csv'), toCsv(intervalsTable(result.derived, units)));
  writeFileSync(join(out, 'profile.csv'), toCsv(profileTable(result.derived, units)));
  writeFileSync(join(out, 'layers.csv'), toCsv(layersTable(result.derived, units)));
  if (hasDirectVelocities(project.survey.kind))
    writeFileSync(join(out, 'direct.csv'), toCsv(directTable(result.derived, units)));
  writeFileSync(join(out, 'site.json'), JSON.stringify(siteJson(result.derived, settings), null, 2) + '\n');
  const v = result.derived.site.vs30;
  io.stdout.write(
    `${project.survey.name}: ${result.derived.profile.length} intervals (${settings.intervals.profileMethod}), ` +
      (v ? `Vs30 ${v.vsMps.toFixed(1)} m/s to ${v.toDepthM.toFixed(1)} m` : 'no time-averaged Vs') +
      `; wrote picks.csv, intervals.csv, profile.csv, layers.csv, ${hasDirectVelocities(project.survey.kind) ? 'direct.csv, ' : ''}site.json to ${out}\n`,
  );
  return strict && issues.length ? 3 : 0;
}
