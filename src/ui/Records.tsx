/**
 * Records pane: drop or pick waveform files (or a project archive), progress while they are read,
 * every file with its status and, for a file that cannot be read, its error in plain words.
 */
import { useRef, useState } from 'react';
import { loadFiles, openDemo, removeFile } from '../state/files';
import { setView, useApp, type RecordMeta } from '../state/store';
import { kindInfo } from '../core/catalogue/testKinds';
import { DEMO_KINDS } from '../core/synth/demo';
import { fmt, useUnits } from './units';

export async function filesFromList(list: FileList | File[]): Promise<{ name: string; bytes: Uint8Array }[]> {
  const arr = Array.from(list);
  return Promise.all(arr.map(async (f) => ({ name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) })));
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
        void filesFromList(e.dataTransfer.files).then(loadFiles);
      }}
    >
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
      {bad > 0 && <div className="error small">Files with errors are listed first; every other file stays loaded.</div>}
      <ul className="file-list" data-testid="file-list">
        {[...records.filter((m) => m.status === 'error'), ...records.filter((m) => m.status !== 'error')].map((m) => {
          const a = byId.get(m.id);
          return (
            <li key={m.fileName} className={`file ${m.status}`} data-status={m.status} data-file={m.fileName}>
              <div className="file-row">
                <span className="status-word">
                  {m.status === 'ok' ? 'ok' : m.status === 'reading' ? 'reading…' : 'error'}
                </span>
                <span className="fname" title={m.fileName}>
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
                </div>
              )}
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
