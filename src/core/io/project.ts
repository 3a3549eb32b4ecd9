/**
 * From an opened project (archive or folder contents) to what the pipeline needs: the survey, the
 * parsed records, settings and edits, and a list of problems (missing or unreadable files) that do not
 * stop the rest of the survey from computing.
 */
import type { ErrorInfo } from '../errors';
import type { WaveRecord } from '../model';
import type { Settings, UserEdits } from '../settings';
import type { Survey } from '../model';
import type { OpenedProject } from './archive';
import type { ComparisonProfile } from '../site/comparison';
import { readWaveFile } from './readers';

export interface LoadedProject {
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  records: Map<string, WaveRecord>;
  comparison: ComparisonProfile | null;
  issues: ErrorInfo[];
}

export function loadProject(opened: OpenedProject, archiveName: string): LoadedProject {
  const issues: ErrorInfo[] = opened.missing.map((name) => ({
    code: 'PROJECT_FILE_MISSING',
    message: `${name} is listed in project.json but is not in ${archiveName}.`,
    file: name,
  }));
  const records = new Map<string, WaveRecord>();
  const used = new Set(opened.doc.survey.records.map((r) => r.recordId));
  for (const f of opened.files) {
    if (!used.has(f.name)) continue; // deviation tables and other attachments
    const out = readWaveFile(f.bytes, f.name);
    if (out.ok) records.set(f.name, { ...out.record, id: f.name });
    else issues.push(out.error);
  }
  return {
    survey: opened.doc.survey,
    settings: opened.doc.settings,
    edits: opened.doc.edits,
    records,
    comparison: opened.doc.comparison ?? null,
    issues,
  };
}
