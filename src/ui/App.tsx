/**
 * The one window: top bar, Records (left), Trace board or Geometry (centre), Profile (right, always
 * visible) with the Site and Export sheets over it, and the bottom strip with Pair check and Travel time.
 */
import { memo, useDeferredValue, useEffect, useRef, useState } from 'react';
import { unitText } from './unitText';
import type { Derived } from '../core';
import { profileMethodFor, softwareVersion } from '../core';
import type { UnitSystem } from '../core';
import type { Station, Survey, Wave } from '../core';
import type { Settings } from '../core';
import { STANDARD_NAMES } from '../core';
import { EXPORT_CAUTIONS } from '../core';
import { useAutosave, restoreSession, discardSavedSession } from '../state/autosave';
import { currentDerived, settleSpread, useDerived } from '../state/derived';
import { clearPick, setPick, toggleStationExcluded } from '../state/edits';
import { loadFiles, startFresh } from '../state/files';
import { cancelProcessing, runProcessing } from '../state/processing';
import { dismissMessage, redo, setUnitSystem, setView, undo, useApp, useResults } from '../state/store';
import { EDITABLE_METHODS, methodInfo } from '../core';
import { kindInfo } from '../core';
import { GeometryPane } from './Geometry';
import { PairCheck } from './PairCheck';
import { boardStations, effectiveReceiver, pickFor } from './picks';
import { ProfilePane } from './Profile';
import { DesignPane, DesignPrintSection } from './Design';
import { filesFromList, RecordsPane } from './Records';
import { ExportSheet, SiteSheet } from './Sheets';
import { TraceBoard } from './TraceBoard';
import { TravelTime } from './TravelTime';
import { Splitter } from './Splitter';
import { UpdateBanner } from './UpdateBanner';
import { warmHardwareWebgl } from './gl';
import { fmt, fmtRange95, label, useUnits } from './units';

function isTyping(t: EventTarget | null): boolean {
  const el = t as HTMLElement | null;
  if (!el) return false;
  const tag = el.tagName;
  return tag === 'INPUT' || tag === 'TEXTAREA' || tag === 'SELECT' || el.isContentEditable;
}

type Ctx = { e: KeyboardEvent; key: string; ctrl: boolean };

/** The board's selected station (with its wave) for the keys that act on it; null when there is none. */
function selectedOnBoard(): { s: Station; wave: Wave; stations: Station[]; idx: number } | null {
  const { view } = useApp.getState();
  const prepared = useResults.getState().prepared;
  if (!prepared) return null;
  const wave: Wave = view.wave;
  const stations = boardStations(prepared.stations, wave, effectiveReceiver(prepared.stations, wave, view.receiver));
  if (!stations.length) return null;
  const idx = stations.findIndex((s) => s.key === view.selectedStation);
  return { s: stations[idx], wave, stations, idx };
}

interface Binding {
  /** Keys as shown in the help. */
  keys: string;
  help: string;
  /** Whether the key event is this binding (absent = mouse, listed for help only). */
  match?: (c: Ctx) => boolean;
  run?: (c: Ctx) => void;
  /** Bindings that work without ctrl/alt only. */
  plain?: boolean;
}

/** Every key and mouse binding of the board: handleKey runs them, KeyboardHelp lists them. */
export const BINDINGS: readonly Binding[] = [
  { keys: 'click (Pick tool)', help: 'place the pick of the method being edited on the nearest trace' },
  { keys: 'drag (Pick tool)', help: 'move it; one undo step per drag' },
  { keys: 'click on the Travel time depth axis', help: 'add a layer boundary there (S waves, downhole surveys)' },
  { keys: 'drag a boundary handle', help: 'move the boundary; double-click removes it; one undo step each' },
  {
    keys: '↑ ↓  Delete  on a boundary handle',
    help: 'move it 0.1 m or ft (with shift: 1) / remove it; Tab reaches the handles',
  },
  {
    keys: 'z  or  ctrl+z',
    help: 'undo',
    match: ({ e, key, ctrl }) => (ctrl && key.toLowerCase() === 'z' && !e.shiftKey) || (!ctrl && key === 'z'),
    run: ({ e }) => {
      e.preventDefault();
      undo();
    },
  },
  {
    keys: 'shift+z  or  ctrl+y',
    help: 'redo',
    match: ({ e, key, ctrl }) =>
      (ctrl && (key.toLowerCase() === 'y' || (key.toLowerCase() === 'z' && e.shiftKey))) || (!ctrl && key === 'Z'),
    run: ({ e }) => {
      e.preventDefault();
      redo();
    },
  },
  {
    keys: '?',
    help: 'this list',
    plain: true,
    match: ({ key }) => key === '?',
    run: () => setView({ helpOpen: !useApp.getState().view.helpOpen }),
  },
  {
    keys: 'Escape',
    help: 'close this list or the open sheet',
    plain: true,
    match: ({ key }) => key === 'Escape',
    run: () => setView({ helpOpen: false, sheet: null }),
  },
  {
    keys: '1 2 3 4',
    help: `edit ${EDITABLE_METHODS.map((m) => methodInfo(m).label).join(' / ')}`,
    plain: true,
    match: ({ key }) => key >= '1' && key <= String(EDITABLE_METHODS.length) && key.length === 1,
    run: ({ key }) => setView({ editMethod: EDITABLE_METHODS[Number(key) - 1] }),
  },
  {
    keys: 'p  m  n',
    help: 'Pick tool / Zoom tool (drag a box; double-click to see all) / Pan tool; the wheel zooms',
    plain: true,
    match: ({ key }) => key === 'p' || key === 'm' || key === 'n',
    run: ({ key }) => setView({ tool: key === 'p' ? 'pick' : key === 'm' ? 'zoom' : 'pan' }),
  },
  {
    keys: 's',
    help: 'snap on or off',
    plain: true,
    match: ({ key }) => key === 's',
    run: () => setView({ snap: !useApp.getState().view.snap }),
  },
  {
    keys: '↑ ↓',
    help: 'previous / next trace',
    plain: true,
    match: ({ key }) => key === 'ArrowUp' || key === 'ArrowDown',
    run: ({ e, key }) => {
      const b = selectedOnBoard();
      if (!b) return;
      e.preventDefault();
      const { stations, idx } = b;
      const next = idx < 0 ? 0 : Math.max(0, Math.min(stations.length - 1, idx + (key === 'ArrowUp' ? -1 : 1)));
      setView({ selectedStation: stations[next].key, selectedInterval: null });
    },
  },
  {
    keys: '← →',
    help: 'nudge the pick one sample (with shift: ten)',
    plain: true,
    match: ({ key }) => key === 'ArrowLeft' || key === 'ArrowRight',
    run: ({ e, key }) => {
      const b = selectedOnBoard();
      if (!b?.s) return;
      e.preventDefault();
      const { view } = useApp.getState();
      const d = currentDerived();
      const p = d ? pickFor(d.picks, b.s.key, b.wave, view.editMethod) : undefined;
      if (!p) return;
      const steps = (key === 'ArrowLeft' ? -1 : 1) * (e.shiftKey ? 10 : 1);
      setPick(b.s.key, b.wave, view.editMethod, p.timeS + steps * b.s.working.sampleIntervalS);
    },
  },
  {
    keys: 'x',
    help: 'exclude the trace, or restore it',
    plain: true,
    match: ({ key }) => key === 'x',
    run: () => {
      const b = selectedOnBoard();
      if (b?.s) toggleStationExcluded(b.s.key, b.wave);
    },
  },
  {
    keys: 'Delete  or  Backspace',
    help: 'back to the automatic pick',
    plain: true,
    match: ({ key }) => key === 'Delete' || key === 'Backspace',
    run: () => {
      const b = selectedOnBoard();
      if (b?.s) clearPick(b.s.key, b.wave, useApp.getState().view.editMethod);
    },
  },
];

/** Keyboard editing on the Trace board: the first binding that matches runs (listed in KeyboardHelp). */
export function handleKey(e: KeyboardEvent): void {
  if (isTyping(e.target)) return;
  const c: Ctx = { e, key: e.key, ctrl: e.ctrlKey || e.metaKey };
  for (const b of BINDINGS) {
    if (!b.match || !b.run) continue;
    if (b.plain && (c.ctrl || e.altKey)) continue;
    if (b.match(c)) {
      b.run(c);
      return;
    }
  }
}

function KeyboardHelp() {
  const rows: [string, string][] = BINDINGS.map((b) => [b.keys, b.help]);
  return (
    <div className="modal" role="dialog" aria-label="Keyboard" onClick={() => setView({ helpOpen: false })}>
      <div className="modal-box" onClick={(e) => e.stopPropagation()}>
        <h2>Keyboard and mouse</h2>
        <p className="muted">
          Borewave {softwareVersion()} · MIT licence · third-party licences in THIRD-PARTY-NOTICES.txt
        </p>
        <table className="plain">
          <tbody>
            {rows.map(([k, v]) => (
              <tr key={k}>
                <td>
                  <kbd>{k}</kbd>
                </td>
                <td>{v}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <button onClick={() => setView({ helpOpen: false })}>Close</button>
      </div>
    </div>
  );
}

function TopBar() {
  const survey = useApp((s) => s.survey);
  const units = useApp((s) => s.unitSystem);
  const canUndo = useApp((s) => s.past.length > 0);
  const canRedo = useApp((s) => s.future.length > 0);
  const autosave = useAutosave();
  const status = useResults((s) => s.status);
  const openRef = useRef<HTMLInputElement>(null);
  const saveText =
    autosave.status === 'saving'
      ? 'saving…'
      : autosave.status === 'saved' && autosave.savedAt
        ? `saved ${new Date(autosave.savedAt).toLocaleTimeString()}`
        : autosave.status === 'failed'
          ? `autosave failed: ${autosave.error}`
          : autosave.status === 'off'
            ? 'autosave off'
            : autosave.offer
              ? 'autosave paused (restore?)'
              : 'autosave on';
  return (
    <header className="topbar">
      <span className="brand">Borewave</span>
      <span className="survey-name" title="Survey name (edit in Geometry)">
        {survey.name}
      </span>
      <span className="kind">{kindInfo(survey.kind).label}</span>
      <span className="seg" role="group" aria-label="Units">
        <button
          className={units === 'SI' ? 'on' : ''}
          aria-pressed={units === 'SI'}
          onClick={() => setUnitSystem('SI')}
        >
          SI
        </button>
        <button
          className={units === 'US' ? 'on' : ''}
          aria-pressed={units === 'US'}
          onClick={() => setUnitSystem('US')}
        >
          US
        </button>
      </span>
      <button onClick={() => openRef.current?.click()}>Open project…</button>
      <input
        ref={openRef}
        type="file"
        accept=".zip"
        hidden
        data-testid="project-input"
        onChange={(e) => {
          const f = e.target.files;
          if (f?.length) void filesFromList(f).then(loadFiles);
          e.target.value = '';
        }}
      />
      <button onClick={() => setView({ sheet: 'export' })}>Save project…</button>
      <button onClick={undo} disabled={!canUndo} title="Undo (z)">
        Undo
      </button>
      <button onClick={redo} disabled={!canRedo} title="Redo (shift+z)">
        Redo
      </button>
      <span className="proc" data-testid="process-status" data-state={status.state}>
        {status.state === 'running' ? (
          <>
            {status.stage === 'auto-pick' ? 'auto-picking' : 'preparing'}{' '}
            <progress max={status.total || 1} value={status.done} />{' '}
            <button className="link" onClick={cancelProcessing}>
              cancel
            </button>
          </>
        ) : status.state === 'failed' ? (
          <span className="error">processing failed: {status.error?.message}</span>
        ) : status.state === 'done' ? (
          <span title={status.elapsedMs ? `processed in ${(status.elapsedMs / 1000).toFixed(1)} s` : undefined}>
            picks up to date
          </span>
        ) : status.state === 'cancelled' ? (
          'auto-pick stopped'
        ) : null}
      </span>
      <button
        onClick={() => void runProcessing()}
        title="Run the automatic picker again on every trace (your edits are kept)"
      >
        Auto-pick
      </button>
      <span className="spacer" />
      <span className="autosave" data-testid="autosave-status">
        {saveText}
      </span>
      <button
        onClick={() => {
          if (window.confirm('Start fresh: drop every loaded file, edit and setting of this session?')) {
            startFresh();
            void discardSavedSession();
          }
        }}
      >
        Start fresh
      </button>
      <button onClick={() => setView({ helpOpen: true })} aria-label="Keyboard help" title="Keyboard and mouse (?)">
        ?
      </button>
    </header>
  );
}

function RestoreBanner() {
  const offer = useAutosave((s) => s.offer);
  if (!offer) return null;
  return (
    <div className="banner" role="alert" data-testid="restore-banner">
      A session saved on this computer at {new Date(offer.savedAt).toLocaleString()} ({offer.doc.survey.name},{' '}
      {offer.fileCount} files) can be restored.{' '}
      <button
        onClick={async () => {
          const err = await restoreSession();
          if (err) useApp.setState((s) => ({ messages: [...s.messages, err] }));
        }}
      >
        Restore it
      </button>{' '}
      <button onClick={() => void discardSavedSession()}>Start fresh</button>
    </div>
  );
}

function Messages() {
  const messages = useApp((s) => s.messages);
  const d = useDerived();
  const units = useUnits();
  const issues = d?.issues ?? [];
  const [open, setOpen] = useState(false);
  if (!messages.length && !issues.length) return null;
  const count = messages.length + Math.min(issues.length, 4);
  return (
    <div className={`messages ${open ? 'open' : ''}`} role="status">
      {(count > 1 || open) && (
        <button className="link messages-toggle" onClick={() => setOpen(!open)} aria-expanded={open}>
          {open ? 'fewer lines' : 'show in full'}
        </button>
      )}
      {messages.map((m, i) => (
        <div key={`m${i}`} className="error" title={unitText(m.message, units)}>
          {unitText(m.message, units)}{' '}
          <button className="link" onClick={() => dismissMessage(i)}>
            dismiss
          </button>
        </div>
      ))}
      {issues.slice(0, 4).map((m, i) => (
        <div key={`i${i}`} className="warn" title={unitText(m.message, units)}>
          {unitText(m.message, units)}
        </div>
      ))}
      {issues.length > 4 && <div className="warn">…and {issues.length - 4} more problems.</div>}
    </div>
  );
}

/**
 * Shown only when printing (print stylesheet): survey, settings, profile table (Vs with its sd and 95%
 * range), site class, cautions.
 */
function PrintSummary() {
  // Deferred: an edit re-renders this hidden summary after the frame that shows the Profile.
  const d = useDeferredValue(useDerived());
  const survey = useApp((s) => s.survey);
  const settings = useApp((s) => s.settings);
  const units = useUnits();
  return <PrintBody d={d} survey={survey} settings={settings} units={units} />;
}

const PrintBody = memo(function PrintBody({
  d,
  survey,
  settings,
  units,
}: {
  d: Derived | null;
  survey: Survey;
  settings: Settings;
  units: UnitSystem;
}) {
  const v = label('velocity', units);
  const dep = label('depth', units);
  return (
    <div className="print-summary" aria-hidden="true">
      <h1>{survey.name}</h1>
      <p>
        {kindInfo(survey.kind).label} · {survey.records.filter((r) => !r.excluded).length} records · printed{' '}
        {new Date().toLocaleString()}
      </p>
      <h2>Settings</h2>
      <p>
        Profile method: {methodInfo(profileMethodFor(settings.intervals.profileMethod, survey.kind)).label} · onset
        picker: {settings.picking.onsetMethod} · reversed hits:{' '}
        {settings.conditioning.useReversedHits ? 'used' : 'not used'} · S band-pass:{' '}
        {settings.conditioning.bandpassS
          ? `${settings.conditioning.bandpassS.lowHz}-${settings.conditioning.bandpassS.highHz} Hz`
          : 'none'}{' '}
        · source offset {fmt('depth', units, survey.sourceOffsetM)} {dep} · water table{' '}
        {survey.soil.waterTableM === null ? 'none' : `${fmt('depth', units, survey.soil.waterTableM)} ${dep}`}
      </p>
      <h2>Profile</h2>
      <table className="num">
        <thead>
          <tr>
            <th>Top ({dep})</th>
            <th>Bottom ({dep})</th>
            <th>Vs ({v})</th>
            <th>± 1 sd ({v})</th>
            <th title="Vs ∓ k95 × sd, k95 per test kind and method (docs/true-vs.md)">95% range ({v})</th>
            <th>Vp ({v})</th>
            <th>Gmax ({label('modulus', units)})</th>
            <th>Vs1 ({v})</th>
            <th className="text">Method</th>
            <th className="text">Flags</th>
          </tr>
        </thead>
        <tbody>
          {(d?.profile ?? []).map((r) => (
            <tr key={r.intervalKey}>
              <td>{fmt('depth', units, r.topM)}</td>
              <td>{fmt('depth', units, r.bottomM)}</td>
              <td>{fmt('velocity', units, r.vsMps)}</td>
              <td>{fmt('velocity', units, r.vsSdMps)}</td>
              <td data-col="range95">{fmtRange95(units, r.vsLow95Mps, r.vsHigh95Mps)}</td>
              <td>{fmt('velocity', units, r.vpMps)}</td>
              <td>{fmt('modulus', units, r.gmaxKpa)}</td>
              <td>{fmt('velocity', units, r.vs1Mps)}</td>
              <td className="text">{methodInfo(r.method).label}</td>
              <td className="text">{r.flags.join(', ')}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <h2>Site</h2>
      <p>
        {d?.site.setupIncomplete ? `Vs30 not given: ${d.site.setupIncomplete}` : null}
        Vs30 = {fmt('velocity', units, d?.site.vs30?.vsMps)} {v}
        {d?.site.uncertainty
          ? ` (P05 ${fmt('velocity', units, d.site.uncertainty.vs30P05Mps)}, P95 ${fmt('velocity', units, d.site.uncertainty.vs30P95Mps)})`
          : ''}
      </p>
      <ul>
        {(d?.site.classes ?? []).map((c) => (
          <li key={c.standard}>
            {STANDARD_NAMES[c.standard]}: class {c.siteClass}
          </li>
        ))}
      </ul>
      <DesignPrintSection design={d?.design} units={units} />
      <h2>Cautions</h2>
      <ul>
        {EXPORT_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </div>
  );
});

export function App() {
  // Only the fields the frame needs: the panes read the rest themselves, so an edit does not re-render all.
  const recordsOpen = useApp((s) => s.view.recordsOpen);
  const centre = useApp((s) => s.view.centre);
  const sheet = useApp((s) => s.view.sheet);
  const helpOpen = useApp((s) => s.view.helpOpen);
  const view = { recordsOpen, centre, sheet, helpOpen };
  useEffect(() => {
    window.addEventListener('keydown', handleKey);
    warmHardwareWebgl();
    // The printable summary carries the Vs30 spread: compute it now if the user has not paused yet.
    const beforePrint = () => void settleSpread();
    window.addEventListener('beforeprint', beforePrint);
    return () => {
      window.removeEventListener('keydown', handleKey);
      window.removeEventListener('beforeprint', beforePrint);
    };
  }, []);
  return (
    <div className={`app ${view.recordsOpen ? '' : 'records-closed'}`}>
      <TopBar />
      <RestoreBanner />
      <UpdateBanner />
      <Messages />
      <main className="main">
        <RecordsPane />
        <div className="centre">
          <nav className="tabs" role="tablist">
            <button
              role="tab"
              aria-selected={view.centre === 'traces'}
              className={view.centre === 'traces' ? 'on' : ''}
              onClick={() => setView({ centre: 'traces' })}
            >
              Trace board
            </button>
            <button
              role="tab"
              aria-selected={view.centre === 'geometry'}
              className={view.centre === 'geometry' ? 'on' : ''}
              onClick={() => setView({ centre: 'geometry' })}
            >
              Geometry
            </button>
            <button
              role="tab"
              aria-selected={view.centre === 'design'}
              className={view.centre === 'design' ? 'on' : ''}
              onClick={() => setView({ centre: 'design' })}
            >
              Curves &amp; liquefaction
            </button>
          </nav>
          {view.centre === 'traces' ? <TraceBoard /> : view.centre === 'geometry' ? <GeometryPane /> : <DesignPane />}
        </div>
        <div className="right">
          <Splitter cssVar="--right-w" axis="col" sign={-1} min={380} max={900} label="Resize the Profile pane" />
          <ProfilePane />
          {view.sheet === 'site' && <SiteSheet />}
          {view.sheet === 'export' && <ExportSheet />}
        </div>
      </main>
      <footer className="strip">
        <Splitter cssVar="--strip-h" axis="row" sign={-1} min={120} max={520} label="Resize the bottom strip" />
        <PairCheck />
        <TravelTime />
      </footer>
      {view.helpOpen && <KeyboardHelp />}
      <PrintSummary />
    </div>
  );
}
