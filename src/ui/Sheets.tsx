/**
 * Side sheets over the Profile: Site (Vs30 with its spread, class per standard with probabilities, the
 * questions each standard asks beyond Vs30, cautions) and Export (tables from core/report, plots as
 * images, the project archive, a printable summary).
 */
import { unitText } from './unitText';
import { hasDirectVelocities } from '../core';
import { CurrentSetupProblems } from './Setup';
import { siteQuestions, STANDARD_NAMES, type SiteStandard } from '../core';
import {
  directTable,
  intervalsTable,
  layersTable,
  picksTable,
  profileTable,
  profileCautions,
  siteJson,
  toCsv,
  EXPORT_CAUTIONS,
} from '../core';
import { curvesCautions, curvesTable, liquefactionCautions, liquefactionTable } from '../core';
import type { Vs30RuleSetting } from '../core';
import { settledDerived, useDerived, useSpreadPending } from '../state/derived';
import { updateSettings } from '../state/edits';
import { projectArchiveBytes } from '../state/files';
import { setView, useApp, useResults } from '../state/store';
import { downloadPlot, PLOT_NAMES, plotRegistry } from './plot';
import { currentFigure, figurePng, figureSvgFile, FIGURE_PNG_WIDTH_PX, openReport } from './report';
import type { Figure } from '../core';
import type { Paper } from '../core';
import { fmt, label, useUnits } from './units';
import { useState } from 'react';

export const CAUTIONS_PLAIN = [
  'Results need review by a qualified professional before they are used; local codes govern.',
];

function SheetFrame({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <aside className="sheet" role="dialog" aria-label={title}>
      <div className="sheet-head">
        <h2>{title}</h2>
        <button onClick={() => setView({ sheet: null })} aria-label="Close">
          Close
        </button>
      </div>
      <div className="sheet-body">{children}</div>
    </aside>
  );
}

export function SiteSheet() {
  const d = useDerived();
  const units = useUnits();
  const settings = useApp((s) => s.settings);
  const site = d?.site;
  const vs30 = site?.vs30;
  const u = site?.uncertainty;
  const spreadPending = useSpreadPending();
  const v = label('velocity', units);
  const questions = siteQuestions();
  const standards = (site?.classes ?? []).map((c) => c.standard);
  return (
    <SheetFrame title="Site">
      {!vs30 && site?.setupIncomplete ? (
        <>
          <p data-testid="site-withheld">Vs30 and the site classes are not given: set-up incomplete.</p>
          <CurrentSetupProblems />
        </>
      ) : !vs30 ? (
        <p>No time-averaged velocity yet: the profile needs at least one interval.</p>
      ) : (
        <>
          <div className="big" data-testid="site-vs30">
            Vs30 = {fmt('velocity', units, vs30.vsMps)} {v}
          </div>
          <p className="caution-top">{CAUTIONS_PLAIN[0]} Full cautions at the end of this sheet.</p>
          {d?.comparison && (
            <p data-testid="site-comparison">
              Compared profile {d.comparison.name}: Vs30 = {fmt('velocity', units, d.comparison.vs30?.vsMps)} {v} (this
              profile {fmt('velocity', units, vs30.vsMps)} {v}; per interval in the Profile table)
            </p>
          )}
          <p className="muted">
            averaged over {fmt('depth', units, vs30.toDepthM)} {label('depth', units)}
            {vs30.extended ? ' (deepest velocity extended to 30 m)' : ''}; profile to{' '}
            {fmt('depth', units, vs30.profileDepthM)} {label('depth', units)}
            {vs30.flags.length ? ` · ${unitText(vs30.flags.join(', '), units)}` : ''}
          </p>
          {spreadPending && !u && (
            <p className="muted" data-testid="spread-updating">
              Spread updating…
            </p>
          )}
          {u && (
            <p data-testid="site-spread">
              Spread from the interval uncertainties ({settings.site.monteCarloDraws} draws): P05{' '}
              {fmt('velocity', units, u.vs30P05Mps)} · P50 {fmt('velocity', units, u.vs30P50Mps)} · P95{' '}
              {fmt('velocity', units, u.vs30P95Mps)} {v}
            </p>
          )}
          <label>
            Profile shorter than {fmt('depth', units, 30)} {label('depth', units)}{' '}
            <select
              value={settings.site.vs30Rule}
              onChange={(e) => updateSettings({ site: { vs30Rule: e.target.value as Vs30RuleSetting } })}
            >
              <option value="no-extrapolation">average over the measured depth only</option>
              <option value="extend-deepest">
                extend the deepest velocity to {fmt('depth', units, 30)} {label('depth', units)}
              </option>
            </select>
          </label>
          <table className="num site-classes">
            <thead>
              <tr>
                <th className="text">Standard</th>
                <th>Class</th>
                <th className="text">Chance of each class (from the spread)</th>
              </tr>
            </thead>
            <tbody>
              {site!.classes.map((c) => (
                <tr key={c.standard} data-standard={c.standard}>
                  <td className="text">{STANDARD_NAMES[c.standard]}</td>
                  <td className="cls">{c.siteClass}</td>
                  <td className="text">
                    {spreadPending && !u
                      ? 'updating…'
                      : u
                        ? Object.entries(u.classProbabilities[c.standard] ?? {})
                            .filter(([, p]) => p > 0)
                            .sort((a, b) => b[1] - a[1])
                            .map(([k, p]) => `${k} ${(p * 100).toFixed(0)} %`)
                            .join(' · ')
                        : '–'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {site!.classes.map((c) => (
            <p key={c.standard} className="small">
              {c.basis} {c.notes.filter((n) => !n.startsWith('Not answered')).join(' ')}
            </p>
          ))}
        </>
      )}
      <h3>Questions beyond Vs30</h3>
      <p className="small muted">
        Vs cannot show these; answer from the borehole logs and laboratory tests. Unanswered counts as no.
      </p>
      {questions.map((q) => (
        <label key={q.id} className="question">
          <input
            type="checkbox"
            checked={settings.site.siteAnswers[q.id] === true}
            onChange={(e) =>
              updateSettings({ site: { siteAnswers: { ...settings.site.siteAnswers, [q.id]: e.target.checked } } })
            }
          />{' '}
          <span>
            {q.text}{' '}
            <span className="muted">
              (
              {q.appliesTo
                .map((s: SiteStandard) =>
                  standards.includes(s) ? STANDARD_NAMES[s].split(' (')[0] : STANDARD_NAMES[s],
                )
                .join(', ')}
              : yes gives {q.yesClass})
            </span>
          </span>
        </label>
      ))}
      <h3>Cautions</h3>
      <ul className="cautions">
        {[...CAUTIONS_PLAIN, ...(site?.cautions ?? [])].map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </SheetFrame>
  );
}

/** Report figures that export on their own (title, legend and units inside each). */
const REPORT_FIGURES: [Figure['id'], string][] = [
  ['trace-board', 'Trace board with picks'],
  ['travel-time', 'Travel time with layer fits'],
  ['profile', 'Vs and Vp profile'],
  ['stiffness', 'Gmax and Vs1'],
];

function download(name: string, content: string | Uint8Array | Blob, type: string): void {
  const blob = content instanceof Blob ? content : new Blob([content as BlobPart], { type });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 5000);
}

export function safeBaseName(name: string): string {
  return (
    name
      .replace(/[^A-Za-z0-9_-]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 60) || 'survey'
  );
}

export function ExportSheet() {
  const d = useDerived();
  const prepared = useResults((s) => s.prepared);
  const settings = useApp((s) => s.settings);
  const name = useApp((s) => s.survey.name);
  const [error, setError] = useState<string | null>(null);
  const base = safeBaseName(name);
  const ready = !!(d && prepared);
  const liquefactionReady = !!d?.design.liquefaction;
  const units = useUnits();
  const surveyKind = useApp((s) => s.survey.kind);
  const csv = (kind: 'picks' | 'intervals' | 'profile' | 'layers' | 'direct') => {
    const full = settledDerived();
    if (!full || !prepared) return;
    // Columns carry the unit of the system the user works in (vs_mps or vs_ftps ...).
    const table =
      kind === 'picks'
        ? picksTable(prepared.stations, full, units)
        : kind === 'intervals'
          ? intervalsTable(full, units)
          : kind === 'layers'
            ? layersTable(full, units)
            : kind === 'direct'
              ? directTable(full, units)
              : profileTable(full, units);
    download(`${base}-${kind}.csv`, toCsv(table, kind === 'profile' ? profileCautions(full) : undefined), 'text/csv');
  };
  const [paper, setPaper] = useState<Paper>('A4');
  const figure = (id: Figure['id'], f: 'png' | 'svg') => {
    setError(null);
    const fig = currentFigure(id);
    if (!fig) return setError('No result yet: the figures follow the first auto-pick.');
    if (f === 'svg') return download(`${base}-${fig.name}.svg`, figureSvgFile(fig), 'image/svg+xml');
    figurePng(fig)
      .then((png) => download(`${base}-${fig.name}.png`, png, 'image/png'))
      .catch((e: Error) => setError(e.message));
  };
  const plot = (p: string, f: 'png' | 'svg') => {
    setError(null);
    downloadPlot(p, f, `${base}-${p}`).catch((e: Error) => setError(e.message));
  };
  return (
    <SheetFrame title="Export">
      <h3>Tables</h3>
      <div className="btn-col">
        <button disabled={!ready} onClick={() => csv('picks')}>
          Picks (CSV)
        </button>
        <button disabled={!ready} onClick={() => csv('intervals')}>
          Intervals, every method (CSV)
        </button>
        <button disabled={!ready} onClick={() => csv('profile')}>
          Profile with stiffness (CSV)
        </button>
        <button disabled={!ready} onClick={() => csv('layers')}>
          Layer fits: straight-line and refracted-ray (CSV)
        </button>
        {hasDirectVelocities(surveyKind) && (
          <button disabled={!ready} onClick={() => csv('direct')}>
            Direct velocities, source to each receiver (CSV)
          </button>
        )}
        <button
          disabled={!ready}
          onClick={() => {
            const full = settledDerived();
            if (full) download(`${base}-curves.csv`, toCsv(curvesTable(full, units), curvesCautions(full)), 'text/csv');
          }}
        >
          Modulus reduction and damping curves per layer (CSV)
        </button>
        <button
          disabled={!ready || !liquefactionReady}
          title={liquefactionReady ? undefined : 'Enter peak ground acceleration and magnitude in Geometry first'}
          onClick={() => {
            const full = settledDerived();
            const t = full ? liquefactionTable(full, units) : null;
            if (t) download(`${base}-liquefaction.csv`, toCsv(t, liquefactionCautions()), 'text/csv');
          }}
        >
          Liquefaction screen from Vs (CSV)
        </button>
        <button
          disabled={!ready}
          onClick={() => {
            const full = settledDerived();
            if (full)
              download(`${base}-site.json`, JSON.stringify(siteJson(full, settings), null, 2), 'application/json');
          }}
        >
          Site summary (JSON)
        </button>
      </div>
      <h3>Report</h3>
      <p className="small muted">
        One document with the title block, settings, figures, tables, Vs30, method notes and cautions; print it to PDF
        from the new tab.
      </p>
      <div className="btn-row">
        <label>
          Paper{' '}
          <select value={paper} onChange={(e) => setPaper(e.target.value as Paper)} aria-label="Paper">
            <option value="A4">A4</option>
            <option value="Letter">US Letter</option>
          </select>
        </label>{' '}
        <button
          disabled={!ready}
          data-testid="open-report"
          onClick={() => {
            setError(null);
            if (!openReport(paper)) setError('The report did not open: allow pop-ups for this page.');
          }}
        >
          Report…
        </button>
      </div>
      <h3>Report figures</h3>
      <table className="plain">
        <tbody>
          {REPORT_FIGURES.map(([id, title]) => (
            <tr key={id}>
              <td>{title}</td>
              <td>
                <button disabled={!ready} data-testid={`figure-png-${id}`} onClick={() => figure(id, 'png')}>
                  PNG ({FIGURE_PNG_WIDTH_PX} px)
                </button>{' '}
                <button disabled={!ready} data-testid={`figure-svg-${id}`} onClick={() => figure(id, 'svg')}>
                  SVG
                </button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <h3>Plots as on screen</h3>
      <table className="plain screen-plots">
        <tbody>
          {Object.entries(PLOT_NAMES).map(([k, title]) => (
            <tr key={k}>
              <td>{title}</td>
              <td>
                <button disabled={!plotRegistry.has(k)} onClick={() => plot(k, 'png')}>
                  PNG
                </button>{' '}
                <button disabled={!plotRegistry.has(k)} onClick={() => plot(k, 'svg')}>
                  SVG
                </button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {error && <p className="error">{error}</p>}
      <h3>Project</h3>
      <div className="btn-col">
        <button
          onClick={() => {
            try {
              download(`${base}.zip`, projectArchiveBytes(), 'application/zip');
            } catch (e) {
              setError((e as Error).message);
            }
          }}
        >
          Project archive (.zip: settings, picks, edits and the original files)
        </button>
      </div>
      <h3>Cautions carried by every export</h3>
      <ul className="cautions small">
        {EXPORT_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </SheetFrame>
  );
}
