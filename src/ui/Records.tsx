/**
 * Records pane: drop or pick waveform files (or a project archive), progress while they are read,
 * every file with its status and, for a file that cannot be read, its error in plain words.
 */
import { useRef, useState } from 'react';
import { applySampleInterval, loadFiles, openDemo, removeFile } from '../state/files';
import type { NamedBytes } from '../worker/protocol';
import { setView, useApp, type RecordMeta } from '../state/store';
import { kindInfo } from '../core';
import { DEMO_KINDS } from '../core';
import { Splitter } from './Splitter';
import { fmt, useUnits } from './units';

export async function filesFromList(list: FileList | File[]): Promise<NamedBytes[]> {
  const arr = Array.from(list);
  return Promise.all(
    arr.map(async (f) => {
      // A folder chosen or dropped gives each file its path inside it ("day2/1.sg2").
      const rel = (f as File & { webkitRelativePath?: string }).webkitRelativePath ?? '';
      const folder = rel.includes('/') ? rel.slice(0, rel.lastIndexOf('/')) : '';
      return { name: f.name, folder, bytes: new Uint8Array(await f.arrayBuffer()) };
    }),
  );
}

/** Every file of a drop, walking into dropped folders (their path is kept to tell same-name files apart). */
async function filesFromDrop(dt: DataTransfer): Promise<NamedBytes[]> {
  const entries: FileSystemEntry[] = [];
  for (const it of Array.from(dt.items ?? [])) {
    const e = it.webkitGetAsEntry?.();
    if (e) entries.push(e);
  }
  if (!entries.some((e) => e.isDirectory)) return filesFromList(dt.files);
  const out: NamedBytes[] = [];
  const walk = async (e: FileSystemEntry): Promise<void> => {
    if (e.isFile) {
      const f = await new Promise<File>((ok, bad) => (e as FileSystemFileEntry).file(ok, bad));
      const path = e.fullPath.replace(/^\/+/, '');
      const folder = path.includes('/') ? path.slice(0, path.lastIndexOf('/')) : '';
      out.push({ name: f.name, folder, bytes: new Uint8Array(await f.arrayBuffer()) });
    } else if (e.isDirectory) {
      const reader = (e as FileSystemDirectoryEntry).createReader();
      for (;;) {
        const batch = await new Promise<FileSystemEntry[]>((ok, bad) => reader.readEntries(ok, bad));
        if (!batch.length) break;
        for (const child of batch) await walk(child);
      }
    }
  };
  for (const e of entries) await walk(e);
  return out;
}

const INTERVAL_UNITS: [string, number][] = [
  ['µs', 1e-6],
  ['ms', 1e-3],
  ['s', 1],
];

/** One question for a group of text files without a time column: their sample interval. */
function IntervalQuestion({ names }: { names: string[] }) {
  const [value, setValue] = useState('');
  const [unit, setUnit] = useState(1e-3);
  const x = /^\s*(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/.test(value) ? Number(value) * unit : Number.NaN;
  const valid = x >= 1e-7 && x <= 1;
  return (
    <form
      className="interval-question"
      data-testid="interval-question"
      onSubmit={(e) => {
        e.preventDefault();
        if (valid) void applySampleInterval(names, x);
      }}
    >
      <div className="small">
        {names.length} text file{names.length === 1 ? ' has' : 's have'} no time column. Sample interval for{' '}
        {names.length === 1 ? 'it' : 'all of them'}:
      </div>
      <input
        aria-label="Sample interval"
        data-testid="interval-value"
        inputMode="decimal"
        size={8}
        value={value}
        onChange={(e) => setValue(e.target.value)}
      />
      <select aria-label="Unit" value={unit} onChange={(e) => setUnit(Number(e.target.value))}>
        {INTERVAL_UNITS.map(([u, f]) => (
          <option key={u} value={f}>
            {u}
          </option>
        ))}
      </select>
      <button type="submit" disabled={!valid} data-testid="interval-apply">
        Read {names.length === 1 ? 'it' : `all ${names.length}`}
      </button>
      {value && !valid ? <div className="error small">Give a number from 0.1 µs to 1 s.</div> : null}
    </form>
  );
}

function placeText(
  m: RecordMeta,
  depthM: number | null | undefined,
  hit: string | undefined,
  units: 'SI' | 'US',
): string {
  if (m.status !== 'ok') return '';
  if (depthM === undefined) return 'not placed';
  if (depthM === null) return 'no depth: set it in Geometry';
  return `${fmt('depth', units, depthM)} ${units === 'SI' ? 'm' : 'ft'}${hit && hit !== 'none' ? ` · ${hit}` : ''}`;
}

export function RecordsPane() {
  const records = useApp((s) => s.records);
  const open = useApp((s) => s.view.recordsOpen);
  const progress = useApp((s) => s.loadProgress);
  const intervalRequest = useApp((s) => s.intervalRequest);
  const assignments = useApp((s) => s.survey.records);
  const units = useUnits();
  const inputRef = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const ok = records.filter((r) => r.status === 'ok').length;
  const bad = records.filter((r) => r.status === 'error').length;

  if (!open) {
    return (
      <aside className="records closed" aria-label="Records">
        <button className="vertical" onClick={() => setView({ recordsOpen: true })} title="Show the Records pane">
          Records ({ok}
          {bad ? `, ${bad} with errors` : ''}) ›
        </button>
      </aside>
    );
  }

  const byId = new Map(assignments.map((a) => [a.recordId, a]));
  return (
    <aside
      className={`records ${over ? 'over' : ''}`}
      aria-label="Records"
      onDragOver={(e) => {
        e.preventDefault();
        setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={(e) => {
        e.preventDefault();
        setOver(false);
        void filesFromDrop(e.dataTransfer).then(loadFiles);
      }}
    >
      <Splitter cssVar="--left-w" axis="col" sign={1} min={180} max={520} label="Resize the Records pane" />
      <div className="pane-head">
        <h2>Records</h2>
        <span className="spacer" />
        <button className="link" onClick={() => setView({ recordsOpen: false })} title="Hide the Records pane">
          ‹ hide
        </button>
      </div>
      <div className="drop" onClick={() => inputRef.current?.click()} role="button" tabIndex={0}>
        Drop waveform files (SEG-2, text) or a project .zip here, or <u>choose files</u>
        <input
          ref={inputRef}
          type="file"
          multiple
          data-testid="file-input"
          hidden
          onChange={(e) => {
            const files = e.target.files;
            if (files?.length) void filesFromList(files).then(loadFiles);
            e.target.value = '';
          }}
        />
      </div>
      {progress && (
        <div className="progress" aria-label="Reading files">
          <progress max={progress.total} value={progress.done} /> {progress.done} / {progress.total}
        </div>
      )}
      <div className="demo">
        Open the demo survey:{' '}
        {DEMO_KINDS.map((k) => (
          <button key={k} onClick={() => void openDemo(k)} data-demo={k}>
            {kindInfo(k).label}
          </button>
        ))}
      </div>
      <div className="muted small">
        {ok} read{bad ? ` · ${bad} with errors` : ''}
      </div>
      {intervalRequest.length > 0 && <IntervalQuestion key={intervalRequest.join('|')} names={intervalRequest} />}
      {bad > 0 && <div className="error small">Files with errors are listed first; every other file stays loaded.</div>}
      <ul className="file-list" data-testid="file-list">
        {[...records.filter((m) => m.status === 'error'), ...records.filter((m) => m.status !== 'error')].map((m) => {
          const a = byId.get(m.id);
          return (
            <li key={m.id} className={`file ${m.status}`} data-status={m.status} data-file={m.fileName}>
              <div className="file-row">
                <span className="status-word">
                  {m.status === 'ok' ? 'ok' : m.status === 'reading' ? 'reading…' : 'error'}
                </span>
                <span className="fname" title={m.originalName ? `${m.fileName} (file ${m.originalName})` : m.fileName}>
                  {m.fileName}
                </span>
                <button
                  className="link"
                  onClick={() => removeFile(m.fileName)}
                  title="Remove this file"
                  aria-label={`Remove ${m.fileName}`}
                >
                  ✕
                </button>
              </div>
              {m.status === 'ok' && (
                <div className="file-detail">
                  {m.format} · {m.traces} ch · {m.samples} samples ·{' '}
                  {m.sampleIntervalS ? (m.sampleIntervalS * 1000).toFixed(3) : '–'} ms ·{' '}
                  {placeText(m, a ? a.depthM : undefined, a?.hit, units)}
                  {a?.excluded ? ' · left out' : ''}
                  {m.layout ? <div className="muted">{m.layout}</div> : null}
                  {m.originalName ? (
                    <div className="muted">
                      file name {m.originalName}, kept apart as {m.fileName}
                    </div>
                  ) : null}
                </div>
              )}
              {m.warnings?.map((w) => (
                <div key={`${w.code}${w.field ?? ''}`} className="file-warning small" data-code={w.code}>
                  {w.message.replace(/^[^:]+: /, '')}
                </div>
              ))}
              {m.status === 'error' && m.error && (
                <div className="file-error" role="alert">
                  {m.error.message}
                  {m.error.field ? <span className="muted"> (field: {m.error.field})</span> : null}
                </div>
              )}
            </li>
          );
        })}
      </ul>
    </aside>
  );
}
