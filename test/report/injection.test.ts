/**
 * CSV injection end to end (OWASP "CSV Injection"): names that come from the user's files and geometry
 * (borehole ids) must not reach the exported CSVs as formulas; keys use receiver slots, not hole names.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/core/pipeline';
import { intervalsTable, picksTable, profileTable, toCsv } from '../../src/core/report/tables';
import { defaultSettings, emptyEdits } from '../../src/core/settings';
import { demoCrossholeGeometry, demoCrossholeOptions, demoEarthModel, synthesizeSurvey } from '../../src/core/synth';

describe('hostile names from geometry and files are neutralised in every CSV', () => {
  it('borehole ids "=HYPERLINK(..)", "+SUM(1)" and "-2+3" never start a cell', () => {
    const res = synthesizeSurvey(demoEarthModel(), demoCrossholeGeometry(), { ...demoCrossholeOptions(), snr: null });
    const rename: Record<string, string> = {
      B1: '-2+3',
      B2: '=HYPERLINK("http://example.invalid","x")',
      B3: '+SUM(1)',
    };
    const s = res.survey;
    s.boreholes = s.boreholes.map((b) => ({ ...b, id: rename[b.id] }));
    s.mainHoleId = rename[s.mainHoleId];
    s.receiverHoleIds = s.receiverHoleIds.map((h) => rename[h]);
    const out = runPipeline({
      survey: s,
      records: new Map(res.records.map((r) => [r.id, r])),
      settings: defaultSettings(),
      edits: emptyEdits(),
    });
    expect(out.derived.profile.length).toBeGreaterThan(10);
    const withNames = [toCsv(picksTable(out.prepared.stations, out.derived)), toCsv(intervalsTable(out.derived))];
    for (const csv of [...withNames, toCsv(profileTable(out.derived))]) {
      const rows = Papa.parse<string[]>(csv, { comments: '#', skipEmptyLines: true }).data;
      for (const row of rows) {
        for (const cell of row) {
          // A negative number is a number, not a formula: only text cells are checked.
          if (Number.isFinite(Number(cell))) continue;
          expect(cell).not.toMatch(/^[=+\-@\t\r]/);
        }
      }
    }
    // Keys and the receiver column name receiver slots (r0, r1), never a hole: the names stay out.
    for (const csv of withNames) expect(csv).not.toContain('HYPERLINK');
  });
});
