/**
 * `cli report <project.zip|folder> --out report.html [--units SI|US] [--paper A4|Letter] [--method <m>]`:
 * runs the pipeline on a project and writes the report as one self-contained HTML file (styles and SVG
 * figures inline, system fonts, no links), printable to PDF by any browser. Exit 2 on a bad project or
 * bad options, with a one-line reason.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { toErrorInfo } from '../core';
import { reportDataFrom } from '../core';
import { reportHtml, type Paper } from '../core';
import { INTERVAL_METHODS, type IntervalMethod } from '../core';
import type { UnitSystem } from '../core';
import type { CliIo } from './inspect';
import { openSavedProject, runOpenedProject, unitsOption } from './profile';
import { cliSoftwareVersion } from './version';

export interface ReportRun {
  html: string;
  warnings: string[];
  name: string;
}

/** The report for a project archive or folder (used by the command and the tests). */
export function makeReport(
  input: string,
  o: { units?: UnitSystem; paper?: Paper; method?: IntervalMethod; madeAt?: string } = {},
): ReportRun {
  if (!existsSync(input)) throw new Error(`${input} does not exist`);
  const opened = openSavedProject(input);
  const project = opened.doc;
  const settings = o.method
    ? { ...project.settings, intervals: { ...project.settings.intervals, profileMethod: o.method } }
    : project.settings;
  const result = runOpenedProject(opened, settings);
  const data = reportDataFrom({
    survey: project.survey,
    settings,
    edits: project.edits,
    prepared: result.prepared,
    derived: result.derived,
    units: o.units ?? 'SI',
    softwareVersion: cliSoftwareVersion(),
    madeAt: o.madeAt ?? new Date().toISOString(),
  });
  const warnings = opened.issues.map((p) => `${p.file ? `${p.file}: ` : ''}${p.message} [${p.code}]`);
  return { html: reportHtml(data, { paper: o.paper ?? 'A4' }), warnings, name: project.survey.name };
}

export async function runReport(args: string[], io: CliIo): Promise<number> {
  let input: string | undefined;
  let out: string | undefined;
  let units: UnitSystem = 'SI';
  let paper: Paper = 'A4';
  let method: IntervalMethod | undefined;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--out') out = args[++i];
    else if (a === '--units') {
      const u = unitsOption('report', args[++i], io);
      if (!u) return 2;
      units = u;
    } else if (a === '--paper') {
      const p = args[++i];
      if (p !== 'A4' && p !== 'Letter') {
        io.stderr.write(`report: --paper ${p ?? ''} is not A4 or Letter\n`);
        return 2;
      }
      paper = p;
    } else if (a === '--method') {
      const m = args[++i];
      if (!INTERVAL_METHODS.includes(m as IntervalMethod)) {
        io.stderr.write(`report: --method ${m ?? ''} is not one of ${INTERVAL_METHODS.join(', ')}\n`);
        return 2;
      }
      method = m as IntervalMethod;
    } else if (a.startsWith('--')) {
      io.stderr.write(`report: unknown option ${a}\n`);
      return 2;
    } else input = a;
  }
  if (!input || !out) {
    io.stderr.write(
      `usage: cli report <project.zip|folder> --out report.html [--units SI|US] [--paper A4|Letter] [--method ${INTERVAL_METHODS.join('|')}]\n`,
    );
    return 2;
  }
  let run: ReportRun;
  try {
    run = makeReport(input, { units, paper, method });
  } catch (e) {
    io.stderr.write(`report: ${toErrorInfo(e, input).message.replace(/^Unexpected problem: /, '')}\n`);
    return 2;
  }
  for (const w of run.warnings) io.stderr.write(`warning: ${w}\n`);
  const dir = dirname(out);
  if (dir && dir !== '.') mkdirSync(dir, { recursive: true });
  writeFileSync(out, run.html);
  io.stdout.write(`${run.name}: wrote the report (${paper}, ${units}) to ${out}\n`);
  return 0;
}
