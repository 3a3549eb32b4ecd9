/**
 * Geometry: where every record sits (depth, hit direction, what each channel carries), the file-name
 * pattern, source offset, receiver spacing, boreholes with deviation tables, the soil column and the
 * processing settings. The records table takes a paste of tab-separated rows from a spreadsheet.
 */
import { useEffect, useState } from 'react';
import { OrientationTable } from './Setup';
import type {
  Borehole,
  ChannelAssignment,
  Component,
  HitDirection,
  RecordAssignment,
  SoilLayer,
  Survey,
  TestKind,
  ValueSource,
} from '../core';
import { userBoundariesM, type BandpassSetting, type Settings } from '../core';
import type { OnsetPicker } from '../core';
import { STRESS_EXPONENT_CHOICES } from '../core';
import { DEFAULT_NAME_PATTERN } from '../core';
import { applyPaste } from '../core';
import type { ReceiverSlot } from '../core';
import {
  changeKind,
  kindInfo,
  receiverCountOf,
  receiverLabel,
  receiverSlots,
  surfaceSource,
  TEST_KIND_CATALOGUE,
} from '../core';
import { useDerived } from '../state/derived';
import { rawRecords } from '../state/raw';
import { updateSettings, updateSurvey } from '../state/edits';
import { loadDeviation, loadRecordLog, reassignAll } from '../state/files';
import { setNamePattern, useApp } from '../state/store';
import { fmt, label, parseDisplay, useUnits } from './units';
import { DesignFields, SoilDesignTable } from './SoilDesign';
import type { QuantityKind, UnitSystem } from '../core';

const HITS: HitDirection[] = ['left', 'right', 'up', 'down', 'none'];
const COMPONENTS: Component[] = ['H1', 'H2', 'V'];
const SOURCE_WORDS: Record<ValueSource, string> = {
  user: 'you',
  log: 'record log',
  filename: 'file name',
  header: 'header',
  data: 'waveforms',
  default: 'default',
};

/** Text field that commits on Enter or leaving the field (one undo step per entry, not per key). */
function Field({
  value,
  onCommit,
  width = 6,
  ariaLabel,
  placeholder,
}: {
  value: string;
  onCommit: (text: string) => void;
  width?: number;
  ariaLabel?: string;
  placeholder?: string;
}) {
  const [text, setText] = useState(value);
  useEffect(() => setText(value), [value]);
  return (
    <input
      className="field"
      size={width}
      value={text}
      aria-label={ariaLabel}
      placeholder={placeholder}
      onChange={(e) => setText(e.target.value)}
      onBlur={() => text !== value && onCommit(text)}
      onKeyDown={(e) => {
        if (e.key === 'Enter') (e.target as HTMLInputElement).blur();
        if (e.key === 'Escape') setText(value);
      }}
    />
  );
}

function QtyField({
  kind,
  si,
  units,
  onCommit,
  allowEmpty = false,
  ariaLabel,
  decimals,
}: {
  kind: QuantityKind;
  si: number | null;
  units: UnitSystem;
  onCommit: (si: number | null) => void;
  allowEmpty?: boolean;
  ariaLabel?: string;
  decimals?: number;
}) {
  return (
    <Field
      value={si === null ? '' : fmt(kind, units, si, decimals ?? (kind === 'depth' ? 3 : undefined))}
      ariaLabel={ariaLabel}
      onCommit={(t) => {
        const v = parseDisplay(kind, units, t);
        if (v === null && !allowEmpty) return;
        onCommit(v);
      }}
    />
  );
}

/** A labelled depth: "text (m)" and its field. */
function DepthField({
  text,
  units,
  si,
  onCommit,
  ariaLabel,
  allowEmpty,
}: {
  text: string;
  units: UnitSystem;
  si: number | null;
  onCommit: (si: number | null) => void;
  ariaLabel: string;
  allowEmpty?: boolean;
}) {
  return (
    <label>
      {text} ({label('depth', units)}){' '}
      <QtyField kind="depth" units={units} si={si} allowEmpty={allowEmpty} onCommit={onCommit} ariaLabel={ariaLabel} />
    </label>
  );
}

/** The survey's main hole: the receiver hole under a surface source, the source hole of a crosshole test. */
function MainHoleSelect({ text, holeIds, value }: { text: string; holeIds: string[]; value: string }) {
  return (
    <label>
      {text}{' '}
      <select value={value} onChange={(e) => updateSurvey((s) => ({ ...s, mainHoleId: e.target.value }))}>
        {holeIds.map((h) => (
          <option key={h}>{h}</option>
        ))}
      </select>
    </label>
  );
}

function NumField({
  value,
  onCommit,
  ariaLabel,
}: {
  value: number;
  onCommit: (v: number) => void;
  ariaLabel?: string;
}) {
  return (
    <Field
      value={String(value)}
      ariaLabel={ariaLabel}
      onCommit={(t) => {
        const v = Number(t.trim().replace(',', '.'));
        if (Number.isFinite(v)) onCommit(v);
      }}
    />
  );
}

/** A new test kind (core: changeKind keeps what fits and resets channel meanings). */
function changeKindTo(kind: TestKind): void {
  updateSurvey((s) => changeKind(s, kind, (id) => rawRecords.get(id)?.traces.map((t) => t.channel) ?? null));
}

/** Several records at once (bulk edit): edited values count as the user's. */
function setRecords(ids: ReadonlySet<string>, patch: Partial<RecordAssignment>): void {
  updateSurvey((s) => ({
    ...s,
    records: s.records.map((r) =>
      ids.has(r.recordId)
        ? {
            ...r,
            ...patch,
            ...('depthM' in patch ? { depthSource: 'user' as const } : {}),
            ...('hit' in patch ? { hitSource: 'user' as const } : {}),
          }
        : r,
    ),
  }));
}

function setRecord(id: string, patch: Partial<RecordAssignment>): void {
  setRecords(new Set([id]), patch);
}

/** A channel edited on one record (a per-record override of the channel map): source 'user'. */
export function withChannelEdit(
  r: RecordAssignment,
  channel: number,
  patch: Partial<ChannelAssignment>,
): RecordAssignment {
  if (!r.channels.some((c) => c.channel === channel)) return r;
  return {
    ...r,
    channels: r.channels.map((c) => (c.channel === channel ? { ...c, ...patch, source: 'user' as const } : c)),
  };
}

function setChannel(id: string, channel: number, patch: Partial<ChannelAssignment>): void {
  updateSurvey((s) => ({
    ...s,
    records: s.records.map((r) => (r.recordId === id ? withChannelEdit(r, channel, patch) : r)),
  }));
}

/** One channel map applied to every record in one step; single records can be changed afterwards. */
function applyChannelMap(map: ChannelAssignment[]): void {
  updateSurvey((s) => ({
    ...s,
    records: s.records.map((r) =>
      map.reduce((acc, m) => withChannelEdit(acc, m.channel, { component: m.component, receiver: m.receiver }), r),
    ),
  }));
}

/** A hole renamed (any text): boreholes and the source/receiver hole lists (channels name slots, not holes). */
export function renameHole(oldId: string, newId: string): string | null {
  const name = newId.trim();
  if (!name || name === oldId) return null;
  if (useApp.getState().survey.boreholes.some((h) => h.id === name)) return `A hole is already named "${name}".`;
  updateSurvey((s) => ({
    ...s,
    boreholes: s.boreholes.map((h) => (h.id === oldId ? { ...h, id: name } : h)),
    mainHoleId: s.mainHoleId === oldId ? name : s.mainHoleId,
    receiverHoleIds: s.receiverHoleIds.map((h) => (h === oldId ? name : h)),
  }));
  useApp.setState((st) => {
    if (!(oldId in st.deviationFiles)) return {};
    const { [oldId]: file, ...rest } = st.deviationFiles;
    return { deviationFiles: { ...rest, [name]: file } };
  });
  return null;
}

/** The source of a placed value, in words (never colour alone). */
function Src({ source, what }: { source: ValueSource | null | undefined; what: string }) {
  const word = source ? SOURCE_WORDS[source] : 'unknown';
  return (
    <span className={`src src-${source ?? 'none'}`} title={`${what}: ${word}`} data-source={source ?? 'none'}>
      {word}
    </span>
  );
}

/** A typed receiver: slot (r1), its label (lower, far hole), or a crosshole hole's own name (any case). */
function receiverOfTyped(survey: ReturnType<typeof useApp.getState>['survey'], typed: string): ReceiverSlot | null {
  const t = typed.trim().toLowerCase();
  return (
    receiverSlots(survey).find(
      (k, i) =>
        k === t ||
        receiverLabel(survey, k).toLowerCase() === t ||
        (survey.receiverHoleIds[i] ?? '').toLowerCase() === t,
    ) ?? null
  );
}

/** Most common meaning of each channel over the records (the survey's channel map). */
function commonMap(records: RecordAssignment[]): ChannelAssignment[] {
  const byCh = new Map<number, Map<string, number>>();
  for (const r of records)
    for (const c of r.channels) {
      const m = byCh.get(c.channel) ?? new Map<string, number>();
      byCh.set(c.channel, m);
      const k = `${c.component}@${c.receiver}`;
      m.set(k, (m.get(k) ?? 0) + 1);
    }
  return [...byCh.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([channel, m]) => {
      const best = [...m.entries()].sort((a, b) => b[1] - a[1])[0][0];
      const at = best.indexOf('@');
      return { channel, component: best.slice(0, at) as Component, receiver: best.slice(at + 1) as ReceiverSlot };
    });
}

/** What one channel carries: component @ receiver (the receiver list keeps the current one). */
function ChannelMeaning({
  survey,
  meaning: { channel, component, receiver },
  receivers,
  inMapBar,
  onChange,
}: {
  survey: Survey;
  meaning: Pick<ChannelAssignment, 'channel' | 'component' | 'receiver'>;
  receivers: ReceiverSlot[];
  /** The channel map bar's menus are labelled "Map component of channel N", a record's "Component of channel N". */
  inMapBar: boolean;
  onChange: (patch: { component?: Component; receiver?: ReceiverSlot }) => void;
}) {
  const [componentAria, receiverAria] = inMapBar
    ? [`Map component of channel ${channel}`, `Map receiver of channel ${channel}`]
    : [`Component of channel ${channel}`, `Receiver of channel ${channel}`];
  return (
    <>
      <select
        value={component}
        aria-label={componentAria}
        onChange={(e) => onChange({ component: e.target.value as Component })}
      >
        {COMPONENTS.map((k) => (
          <option key={k}>{k}</option>
        ))}
      </select>
      @
      <select
        value={receiver}
        aria-label={receiverAria}
        onChange={(e) => onChange({ receiver: e.target.value as ReceiverSlot })}
      >
        {[...new Set([...receivers, receiver])].map((k) => (
          <option key={k} value={k}>
            {receiverLabel(survey, k)}
          </option>
        ))}
      </select>
    </>
  );
}

function ChannelMapBar({ receivers }: { receivers: ReceiverSlot[] }) {
  const survey = useApp((s) => s.survey);
  const records = survey.records;
  const common = commonMap(records);
  const [map, setMap] = useState<ChannelAssignment[]>(common);
  const key = JSON.stringify(common);
  // biome-ignore lint/correctness/useExhaustiveDependencies: reset when the records' common map changes
  useEffect(() => setMap(common), [key]);
  if (!map.length) return null;
  return (
    <div className="form-grid channel-map" data-testid="channel-map">
      <strong>Channel map for all records</strong>
      {map.map((m, i) => (
        <span key={m.channel} className="chan">
          Ch {m.channel}{' '}
          <ChannelMeaning
            survey={survey}
            meaning={m}
            receivers={receivers}
            inMapBar
            onChange={(patch) => setMap(map.map((x, j) => (j === i ? { ...x, ...patch } : x)))}
          />
        </span>
      ))}
      <button onClick={() => applyChannelMap(map)}>Apply to all records</button>
      <span className="small muted">then change single records in the table (per-record overrides)</span>
    </div>
  );
}

function SetupReportBox() {
  const report = useApp((s) => s.setupReport);
  const log = useApp((s) => s.recordLog);
  const [open, setOpen] = useState(false);
  if (!report && !log) return null;
  const problems = report?.problems ?? [];
  const rejected = report?.rejected ?? [];
  return (
    <div className="setup-report" data-testid="setup-report">
      <p className="small">
        {log ? (
          <>
            Record log <strong>{log.name}</strong> ({log.rows.length} rows).{' '}
          </>
        ) : null}
        {report?.inferences
          .filter((i) => i.what === 'depth' || i.what === 'hit' || i.what === 'component')
          .map((i) => `${i.what} from ${i.rule}: ${i.count}`)
          .join(' · ')}
        {rejected.length ? ` · ${rejected.length} header values not read as depths` : ''}
        {problems.length ? ` · ${problems.length} problems` : ''}{' '}
        {(rejected.length > 0 || problems.length > 0) && (
          <button className="link" onClick={() => setOpen(!open)}>
            {open ? 'hide' : 'show'}
          </button>
        )}
      </p>
      {open && (
        <ul className="small">
          {problems.map((p, i) => (
            <li key={`p${i}`} className="error">
              {p.message}
            </li>
          ))}
          {rejected.map((x, i) => (
            <li key={`r${i}`}>
              {x.file}: {x.field} {x.value} — {x.message} (rule: {x.rule})
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function RecordsTable({ units }: { units: UnitSystem }) {
  const survey = useApp((s) => s.survey);
  const [pasteNote, setPasteNote] = useState<string | null>(null);
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [bulkHit, setBulkHit] = useState<HitDirection>('left');
  const [logError, setLogError] = useState<string | null>(null);
  const receivers = receiverSlots(survey);
  const maxCh = Math.max(0, ...survey.records.map((r) => r.channels.length));
  const dep = label('depth', units);
  const allSelected = survey.records.length > 0 && survey.records.every((r) => selected.has(r.recordId));
  const sel = new Set([...selected].filter((id) => survey.records.some((r) => r.recordId === id)));
  return (
    <>
      <p className="small muted paste-hint">
        Paste rows from a spreadsheet into the table (tab-separated): record, depth ({dep}), hit, then component and
        receiver ({receivers.map((k) => receiverLabel(survey, k)).join(', ')}) for each channel. Without record names
        the rows apply in order. Or load the record log (CSV: file, depth_m or depth_ft, hit, components).{' '}
        <label className="btn-like">
          Load record log…
          <input
            type="file"
            accept=".csv,.txt,.tsv"
            hidden
            data-testid="record-log-input"
            onChange={async (e) => {
              const f = e.target.files?.[0];
              e.target.value = '';
              if (!f) return;
              const problem = loadRecordLog(f.name, await f.text());
              setLogError(problem ? problem.message : null);
            }}
          />
        </label>
      </p>
      {logError && <p className="error">{logError}</p>}
      <SetupReportBox />
      <ChannelMapBar receivers={receivers} />
      <div className="form-grid bulk" data-testid="bulk-bar">
        <span>{sel.size} selected:</span>
        <label>
          hit{' '}
          <select
            value={bulkHit}
            onChange={(e) => setBulkHit(e.target.value as HitDirection)}
            aria-label="Hit for selected"
          >
            {HITS.map((h) => (
              <option key={h}>{h}</option>
            ))}
          </select>
        </label>
        <button disabled={!sel.size} onClick={() => setRecords(sel, { hit: bulkHit })}>
          Set hit
        </button>
        <button disabled={!sel.size} onClick={() => setRecords(sel, { excluded: false })}>
          Use
        </button>
        <button disabled={!sel.size} onClick={() => setRecords(sel, { excluded: true })}>
          Leave out
        </button>
        <button disabled={!sel.size} onClick={() => setSelected(new Set())}>
          Clear selection
        </button>
      </div>
      {pasteNote && <p className="notice">{pasteNote}</p>}
      <div
        className="table-wrap tall"
        onPaste={(e) => {
          const text = e.clipboardData.getData('text/plain');
          if (!text.includes('\t') && !text.includes('\n')) return;
          e.preventDefault();
          const res = applyPaste(text, survey.records, units, (typed) => receiverOfTyped(survey, typed));
          if (res.changed) updateSurvey((s) => ({ ...s, records: res.records }));
          setPasteNote(`${res.changed} rows applied.${res.problems.length ? ` ${res.problems.join(' ')}` : ''}`);
        }}
        tabIndex={0}
        data-testid="geometry-records"
      >
        <table className="num geometry">
          <thead>
            <tr>
              <th className="sticky-col">
                <input
                  type="checkbox"
                  checked={allSelected}
                  aria-label="Select all records"
                  onChange={(e) =>
                    setSelected(e.target.checked ? new Set(survey.records.map((r) => r.recordId)) : new Set())
                  }
                />
              </th>
              <th className="sticky-col2">Record</th>
              <th>
                {kindInfo(survey.kind).tipLogged ? 'Tip depth' : 'Depth'} ({dep})
              </th>
              <th>Hit</th>
              <th>Use</th>
              {Array.from({ length: maxCh }, (_, i) => (
                <th key={i}>Ch {i + 1}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {survey.records.map((r) => (
              <tr key={r.recordId} className={r.excluded ? 'off' : ''} data-record={r.recordId}>
                <td className="sticky-col">
                  <input
                    type="checkbox"
                    checked={sel.has(r.recordId)}
                    aria-label={`Select ${r.recordId}`}
                    onChange={(e) => {
                      const next = new Set(sel);
                      if (e.target.checked) next.add(r.recordId);
                      else next.delete(r.recordId);
                      setSelected(next);
                    }}
                  />
                </td>
                <td className="text sticky-col2">{r.recordId}</td>
                <td className="placed">
                  <QtyField
                    kind="depth"
                    units={units}
                    si={r.depthM}
                    allowEmpty
                    onCommit={(v) => setRecord(r.recordId, { depthM: v })}
                    ariaLabel={`Depth of ${r.recordId}`}
                  />
                  <Src source={r.depthM === null ? null : r.depthSource} what="depth" />
                </td>
                <td className="placed">
                  <select
                    value={r.hit}
                    onChange={(e) => setRecord(r.recordId, { hit: e.target.value as HitDirection })}
                    aria-label={`Hit of ${r.recordId}`}
                  >
                    {HITS.map((h) => (
                      <option key={h}>{h}</option>
                    ))}
                  </select>
                  <Src source={r.hitSource} what="hit" />
                </td>
                <td>
                  <input
                    type="checkbox"
                    checked={!r.excluded}
                    onChange={(e) => setRecord(r.recordId, { excluded: !e.target.checked })}
                    aria-label={`Use ${r.recordId}`}
                  />
                </td>
                {r.channels.map((c) => (
                  <td key={c.channel} className="chan placed">
                    <ChannelMeaning
                      survey={survey}
                      meaning={c}
                      receivers={receivers}
                      inMapBar={false}
                      onChange={(patch) => setChannel(r.recordId, c.channel, patch)}
                    />
                    <Src source={c.source} what={`channel ${c.channel}`} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}

function BoreholeRow({ hole, units }: { hole: Borehole; units: UnitSystem }) {
  const devFile = useApp((s) => s.deviationFiles[hole.id]);
  const [paste, setPaste] = useState(false);
  const [text, setText] = useState('');
  const [err, setErr] = useState<string | null>(null);
  const setHole = (patch: Partial<Borehole>) =>
    updateSurvey((s) => ({ ...s, boreholes: s.boreholes.map((h) => (h.id === hole.id ? { ...h, ...patch } : h)) }));
  const [renameErr, setRenameErr] = useState<string | null>(null);
  const collarCell = (key: 'collarEastM' | 'collarNorthM', word: string) => (
    <td>
      <QtyField
        kind="depth"
        units={units}
        si={hole[key]}
        onCommit={(v) => setHole({ [key]: v ?? 0 })}
        ariaLabel={`${hole.id} collar ${word}`}
      />
    </td>
  );
  return (
    <>
      <tr>
        <td className="text">
          <Field
            value={hole.id}
            width={7}
            ariaLabel={`Name of hole ${hole.id}`}
            onCommit={(t) => setRenameErr(renameHole(hole.id, t))}
          />
          {renameErr && <span className="error small"> {renameErr}</span>}
        </td>
        {collarCell('collarEastM', 'east')}
        {collarCell('collarNorthM', 'north')}
        <td className="text wrap">
          {hole.deviation.length
            ? `${hole.deviation.length} stations to ${fmt('depth', units, hole.deviation[hole.deviation.length - 1].depthAlongM)} ${label('depth', units)}`
            : 'vertical'}
          {devFile ? <span className="muted"> ({devFile})</span> : null}
          <span className="cell-actions">
            <label className="btn-like">
              Load CSV…
              <input
                type="file"
                accept=".csv,.txt,.tsv"
                hidden
                onChange={async (e) => {
                  const f = e.target.files?.[0];
                  e.target.value = '';
                  if (!f) return;
                  const problem = loadDeviation(hole.id, f.name, await f.text());
                  setErr(problem ? problem.message : null);
                }}
              />
            </label>
            <button onClick={() => setPaste(!paste)} aria-expanded={paste}>
              Paste…
            </button>
            {hole.deviation.length > 0 && <button onClick={() => setHole({ deviation: [] })}>Clear</button>}
          </span>
        </td>
      </tr>
      {(paste || err) && (
        <tr>
          <td colSpan={4} className="text wrap">
            {paste && (
              <div className="paste-box">
                <textarea
                  rows={5}
                  cols={40}
                  value={text}
                  onChange={(e) => setText(e.target.value)}
                  placeholder="depth_along_m, east_m, north_m (header with units, one station a line)"
                />
                <button
                  onClick={() => {
                    const problem = loadDeviation(hole.id, `${hole.id}-deviation.csv`, text);
                    setErr(problem ? problem.message : null);
                    if (!problem) setPaste(false);
                  }}
                >
                  Use this table
                </button>
              </div>
            )}
            {err && <p className="error">{err}</p>}
          </td>
        </tr>
      )}
    </>
  );
}

function SoilTable({ units }: { units: UnitSystem }) {
  const soil = useApp((s) => s.survey.soil);
  const setLayers = (layers: SoilLayer[]) => updateSurvey((s) => ({ ...s, soil: { ...s.soil, layers } }));
  const setLayer = (i: number, patch: Partial<SoilLayer>) =>
    setLayers(soil.layers.map((l, j) => (j === i ? { ...l, ...patch } : l)));
  const dep = label('depth', units);
  // Rows where the user chose to type n (its field shows; otherwise the menu says it all).
  const [ownN, setOwnN] = useState<ReadonlySet<number>>(new Set());
  return (
    <>
      <div className="table-wrap">
        <table className="num soil">
          <thead>
            <tr>
              <th>Top ({dep})</th>
              <th>Bottom ({dep})</th>
              <th className="text">Name</th>
              <th>Unit weight ({label('unitWeight', units)})</th>
              <th className="text">n for Vs1</th>
              <th>Poisson's ratio</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {soil.layers.map((l, i) => (
              <tr key={i}>
                <td>
                  <QtyField kind="depth" units={units} si={l.topM} onCommit={(v) => setLayer(i, { topM: v ?? 0 })} />
                </td>
                <td>
                  <QtyField
                    kind="depth"
                    units={units}
                    si={l.bottomM}
                    onCommit={(v) => setLayer(i, { bottomM: v ?? l.bottomM })}
                  />
                </td>
                <td className="name">
                  <Field
                    value={l.name}
                    width={14}
                    onCommit={(t) => setLayer(i, { name: t })}
                    ariaLabel={`Name of layer ${i + 1}`}
                  />
                </td>
                <td>
                  <QtyField
                    kind="unitWeight"
                    units={units}
                    si={l.unitWeightKnM3}
                    onCommit={(v) => v !== null && setLayer(i, { unitWeightKnM3: v })}
                  />
                </td>
                <td className="text">
                  {(() => {
                    const listed = STRESS_EXPONENT_CHOICES.some((c) => c.n === l.stressExponent);
                    const typed = !listed || ownN.has(i);
                    return (
                      <>
                        <select
                          aria-label={`n for Vs1, layer ${i + 1}`}
                          value={typed ? 'other' : String(l.stressExponent)}
                          onChange={(e) => {
                            const other = e.target.value === 'other';
                            setOwnN((o) => {
                              const next = new Set(o);
                              if (other) next.add(i);
                              else next.delete(i);
                              return next;
                            });
                            if (!other) setLayer(i, { stressExponent: Number(e.target.value) });
                          }}
                          title={STRESS_EXPONENT_CHOICES.find((c) => c.n === l.stressExponent)?.source}
                        >
                          {STRESS_EXPONENT_CHOICES.map((c) => (
                            <option key={c.label} value={String(c.n)}>
                              {c.n} {c.label}
                            </option>
                          ))}
                          <option value="other">other n…</option>
                        </select>
                        {typed && (
                          <>
                            {' '}
                            <NumField
                              value={l.stressExponent}
                              onCommit={(v) => setLayer(i, { stressExponent: v })}
                              ariaLabel="n"
                            />
                          </>
                        )}
                      </>
                    );
                  })()}
                </td>
                <td>
                  <NumField
                    value={l.poissonRatio}
                    onCommit={(v) => setLayer(i, { poissonRatio: v })}
                    ariaLabel="Poisson's ratio"
                  />
                </td>
                <td>
                  <button className="link" onClick={() => setLayers(soil.layers.filter((_, j) => j !== i))}>
                    remove
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <button
        onClick={() => {
          const last = soil.layers[soil.layers.length - 1];
          const top = last ? last.bottomM : 0;
          setLayers([
            ...soil.layers,
            {
              topM: top,
              bottomM: top + 5,
              name: `Layer ${soil.layers.length + 1}`,
              unitWeightKnM3: 19,
              stressExponent: 0.25,
              poissonRatio: 0.3,
            },
          ]);
        }}
      >
        Add layer
      </button>{' '}
      <DepthField
        text="Water table depth"
        units={units}
        si={soil.waterTableM}
        allowEmpty
        onCommit={(v) => updateSurvey((s) => ({ ...s, soil: { ...s.soil, waterTableM: v } }))}
        ariaLabel="Water table depth"
      />{' '}
      <span className="small muted">(empty = none). Without layers a default column is used for stresses.</span>
    </>
  );
}

function BandField({
  title,
  value,
  onChange,
}: {
  title: string;
  value: BandpassSetting | null;
  onChange: (v: BandpassSetting | null) => void;
}) {
  return (
    <label>
      {title}{' '}
      <input
        type="checkbox"
        checked={!!value}
        onChange={(e) => onChange(e.target.checked ? { lowHz: 10, highHz: 400, order: 2 } : null)}
      />
      {value && (
        <>
          {' '}
          <NumField
            value={value.lowHz}
            onCommit={(v) => onChange({ ...value, lowHz: v })}
            ariaLabel={`${title} low Hz`}
          />
          –
          <NumField
            value={value.highHz}
            onCommit={(v) => onChange({ ...value, highHz: v })}
            ariaLabel={`${title} high Hz`}
          />{' '}
          Hz
        </>
      )}
    </label>
  );
}

/** Depths of the layers for the travel-time fits; a bad entry is refused with the reason shown. */
function LayerBoundariesField({ settings, units }: { settings: Settings; units: UnitSystem }) {
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <label>
      Layer boundaries for the travel-time fits ({label('depth', units)}, comma separated; empty = soil layers){' '}
      <Field
        width={24}
        ariaLabel="Layer boundaries"
        placeholder="soil layers"
        value={userBoundariesM(settings)
          .map((z) => fmt('depth', units, z, 2))
          .join(', ')}
        onCommit={(t) => {
          const words = t.split(/[,;\s]+/).filter(Boolean);
          const parts = words.map((x) => parseDisplay('depth', units, x));
          const bad = words.find((_, i) => parts[i] === null || parts[i]! < 0);
          if (bad !== undefined) {
            setProblem(`"${bad}" is not a depth of zero or more; the boundaries were not changed.`);
            return;
          }
          setProblem(null);
          const boundariesM = [...new Set(parts as number[])].sort((a, b) => a - b);
          updateSettings({ layering: { mode: boundariesM.length ? 'user' : 'auto', boundariesM } });
        }}
      />
      {problem && (
        <span className="field-error" role="alert">
          {' '}
          {problem}
        </span>
      )}
    </label>
  );
}

/** The layered model's boundaries: chosen from the travel times, or the ones entered above (the fit follows). */
function LayeringModeField({ settings, units }: { settings: Settings; units: UnitSystem }) {
  const d = useDerived();
  const fit = d?.layering.fit;
  const auto = fit ? fit.layers.slice(1).map((l) => l.topM) : [];
  return (
    <label>
      Layered model:{' '}
      <select
        aria-label="Layered model boundaries"
        value={settings.layering.mode}
        onChange={(e) => updateSettings({ layering: { mode: e.target.value as Settings['layering']['mode'] } })}
      >
        <option value="auto">boundaries from the travel times</option>
        <option value="user">the layer boundaries entered</option>
      </select>{' '}
      {settings.layering.mode === 'auto' && auto.length > 0 && (
        <button
          type="button"
          onClick={() =>
            updateSettings({
              layering: { mode: 'user', boundariesM: auto.map((z) => Math.round(z * 100) / 100) },
            })
          }
        >
          Edit these boundaries ({auto.map((z) => fmt('depth', units, z, 2)).join(', ')} {label('depth', units)})
        </button>
      )}
      {d?.layering.reason && <span className="field-error"> No layered model: {d.layering.reason}.</span>}
    </label>
  );
}

function ProcessingFields({ settings, units }: { settings: Settings; units: UnitSystem }) {
  const v = label('velocity', units);
  const range = (which: 'vsRangeMps' | 'vpRangeMps', i: 0 | 1) => (
    <QtyField
      kind="velocity"
      units={units}
      si={settings.picking[which][i]}
      onCommit={(x) => {
        if (x === null) return;
        const r: [number, number] = [...settings.picking[which]] as [number, number];
        r[i] = x;
        updateSettings({ picking: { [which]: r } });
      }}
    />
  );
  return (
    <div className="form-grid">
      <BandField
        title="Band-pass for S"
        value={settings.conditioning.bandpassS}
        onChange={(b) => updateSettings({ conditioning: { bandpassS: b } })}
      />
      <BandField
        title="Band-pass for P"
        value={settings.conditioning.bandpassP}
        onChange={(b) => updateSettings({ conditioning: { bandpassP: b } })}
      />
      <label>
        <input
          type="checkbox"
          checked={settings.conditioning.useReversedHits}
          onChange={(e) => updateSettings({ conditioning: { useReversedHits: e.target.checked } })}
        />{' '}
        Use reversed hits (difference for S, sum for P)
      </label>
      <label>
        Onset picker{' '}
        <select
          value={settings.picking.onsetMethod}
          onChange={(e) => updateSettings({ picking: { onsetMethod: e.target.value as OnsetPicker } })}
        >
          <option value="aic">AIC (Maeda 1985)</option>
          <option value="stalta">STA/LTA (Allen 1978)</option>
        </select>
      </label>
      <label>
        Plausible Vs ({v}) {range('vsRangeMps', 0)}–{range('vsRangeMps', 1)}
      </label>
      <label>
        Plausible Vp ({v}) {range('vpRangeMps', 0)}–{range('vpRangeMps', 1)}
      </label>
      <label>
        <input
          type="checkbox"
          checked={settings.intervals.rayFit}
          onChange={(e) => updateSettings({ intervals: { rayFit: e.target.checked } })}
        />{' '}
        Refracted-ray layer fit (downhole)
      </label>
      <label>
        Trigger delay t0 for crosshole direct velocities, V = D / (t − t0) (ms){' '}
        <NumField
          value={settings.intervals.triggerDelayS * 1000}
          onCommit={(x) => updateSettings({ intervals: { triggerDelayS: x / 1000 } })}
          ariaLabel="Trigger delay"
        />
      </label>
      <LayerBoundariesField settings={settings} units={units} />
      <LayeringModeField settings={settings} units={units} />
      <label>
        Flag when methods differ by more than{' '}
        <NumField
          value={Math.round(settings.intervals.methodDisagreementShare * 100)}
          onCommit={(x) => updateSettings({ intervals: { methodDisagreementShare: x / 100 } })}
        />{' '}
        %
      </label>
    </div>
  );
}

export function GeometryPane() {
  const survey = useApp((s) => s.survey);
  const settings = useApp((s) => s.settings);
  const pattern = useApp((s) => s.namePattern);
  const units = useUnits();
  const holeIds = survey.boreholes.map((h) => h.id);
  return (
    <section className="geometry-pane" aria-label="Geometry">
      <h2>Geometry</h2>
      <OrientationTable />
      <div className="form-grid">
        <label>
          Survey name{' '}
          <Field
            value={survey.name}
            width={28}
            onCommit={(t) => updateSurvey((s) => ({ ...s, name: t }))}
            ariaLabel="Survey name"
          />
        </label>
        <label>
          Test{' '}
          <select value={survey.kind} onChange={(e) => changeKindTo(e.target.value as TestKind)} aria-label="Test kind">
            {TEST_KIND_CATALOGUE.map((k) => (
              <option key={k.id} value={k.id}>
                {k.label}
              </option>
            ))}
          </select>
        </label>
        {surfaceSource(survey.kind) ? (
          <>
            <MainHoleSelect text="Receiver hole" holeIds={holeIds} value={survey.mainHoleId} />
            <DepthField
              text="Source offset"
              units={units}
              si={survey.sourceOffsetM}
              onCommit={(v) => updateSurvey((s) => ({ ...s, sourceOffsetM: v ?? 0 }))}
              ariaLabel="Source offset"
            />
            <DepthField
              text="Source depth"
              units={units}
              si={survey.sourceDepthM}
              onCommit={(v) => updateSurvey((s) => ({ ...s, sourceDepthM: v ?? 0 }))}
              ariaLabel="Source depth"
            />
            {kindInfo(survey.kind).receiverCounts.length > 1 && (
              <label>
                Receivers{' '}
                <select
                  value={receiverCountOf(survey)}
                  onChange={(e) => updateSurvey((s) => ({ ...s, receiverCount: Number(e.target.value) }))}
                  aria-label="Receivers"
                >
                  {kindInfo(survey.kind).receiverCounts.map((n) => (
                    <option key={n} value={n}>
                      {n}
                    </option>
                  ))}
                </select>
              </label>
            )}
            {kindInfo(survey.kind).tipLogged && (
              <DepthField
                text="Receiver above tip"
                units={units}
                si={survey.coneOffsetM}
                onCommit={(v) => v !== null && v >= 0 && updateSurvey((s) => ({ ...s, coneOffsetM: v }))}
                ariaLabel="Cone receiver offset"
              />
            )}
            {receiverCountOf(survey) === 2 && (
              <DepthField
                text="Receiver spacing"
                units={units}
                si={survey.receiverSpacingM}
                onCommit={(v) => v && updateSurvey((s) => ({ ...s, receiverSpacingM: v }))}
                ariaLabel="Receiver spacing"
              />
            )}
          </>
        ) : (
          <>
            <MainHoleSelect text="Source hole" holeIds={holeIds} value={survey.mainHoleId} />
            {[0, 1].map((i) => (
              <label key={i}>
                {i === 0 ? 'Near' : 'Far'} receiver hole{' '}
                <select
                  value={survey.receiverHoleIds[i] ?? ''}
                  onChange={(e) =>
                    updateSurvey((s) => {
                      const ids = [...s.receiverHoleIds];
                      ids[i] = e.target.value;
                      return { ...s, receiverHoleIds: ids };
                    })
                  }
                >
                  <option value="">–</option>
                  {holeIds.map((h) => (
                    <option key={h}>{h}</option>
                  ))}
                </select>
              </label>
            ))}
          </>
        )}
      </div>
      <h3>Records</h3>
      <div className="form-grid">
        <label title="{depth} number in metres, {depth_ft} in feet, {hit} L R U D or left right up down, * anything">
          File-name pattern{' '}
          <Field
            value={pattern}
            width={22}
            onCommit={(t) => setNamePattern(t || DEFAULT_NAME_PATTERN)}
            ariaLabel="File-name pattern"
          />
        </label>
        <button onClick={() => reassignAll()}>Place all records again (headers, then pattern)</button>
        <span className="small muted">
          {'{depth}'} metres · {'{depth_ft}'} feet · {'{hit}'} L/R/U/D · * anything · default {DEFAULT_NAME_PATTERN}
        </span>
      </div>
      <RecordsTable units={units} />
      <h3>Boreholes</h3>
      <table className="num boreholes">
        <thead>
          <tr>
            <th>Hole</th>
            <th>Collar east ({label('depth', units)})</th>
            <th>Collar north ({label('depth', units)})</th>
            <th className="text">Deviation survey</th>
          </tr>
        </thead>
        <tbody>
          {survey.boreholes.map((h) => (
            <BoreholeRow key={h.id} hole={h} units={units} />
          ))}
        </tbody>
      </table>
      <button
        onClick={() =>
          updateSurvey((s) => {
            let n = s.boreholes.length + 1;
            while (s.boreholes.some((h) => h.id === `BH${n}`)) n++;
            return {
              ...s,
              boreholes: [...s.boreholes, { id: `BH${n}`, collarEastM: 0, collarNorthM: 0, deviation: [] }],
            };
          })
        }
      >
        Add borehole
      </button>
      <h3>Soil column</h3>
      <SoilTable units={units} />
      <SoilDesignTable />
      <h4>Shaking and curves</h4>
      <DesignFields />
      <h3>Processing</h3>
      <ProcessingFields settings={settings} units={units} />
    </section>
  );
}
