/**
 * Set-up views: the set-up problems list (above the results it blocks) and the hits-and-rotation
 * table (per depth: hits, where they came from, confidence, azimuth of each receiver), with the bulk
 * actions (hits by data, alternate by file order, one global swap) and the azimuth fix per row.
 */
import type { ReceiverSlot } from '../core';
import type { HitDirection } from '../core';
import { azimuthEditKey } from '../core';
import type { SetupProblem } from '../core';
import { updateSurvey } from '../state/edits';
import { useDerived } from '../state/derived';
import { commit, useApp, useResults } from '../state/store';

export function SetupProblemsList({ problems }: { problems: readonly SetupProblem[] }) {
  if (!problems.length) return null;
  const blocking = problems.filter((p) => p.blocking);
  const warnings = problems.filter((p) => !p.blocking);
  return (
    <div className="setup-problems" data-testid="setup-problems" role={blocking.length ? 'alert' : undefined}>
      {blocking.length ? (
        <strong>Set-up incomplete: Vs30 and the site classes are withheld until these are fixed.</strong>
      ) : null}
      <ul>
        {[...blocking, ...warnings].map((p) => (
          <li key={p.code} className={p.blocking ? 'blocking' : 'warning'} data-code={p.code}>
            <span className="flag">{p.blocking ? 'blocking' : 'warning'}</span> {p.message}{' '}
            <span className="muted">Fix: {p.fix}</span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Problems of the current derived result (nothing until the first result). */
export function CurrentSetupProblems() {
  const d = useDerived();
  return <SetupProblemsList problems={d?.setupProblems ?? []} />;
}

function hitsByData(): void {
  updateSurvey((s) => ({
    ...s,
    records: s.records.map((r) => ({ ...r, hit: 'none' as HitDirection, hitSource: 'data' as const })),
  }));
}

/** First record at each depth the first direction, the next the second, and so on (file order). */
function alternateByFileOrder(): void {
  updateSurvey((s) => {
    const [a, b]: HitDirection[] = s.kind === 'crosshole' ? ['down', 'up'] : ['left', 'right'];
    const seen = new Map<number, number>();
    const records = s.records.map((r) => {
      if (r.depthM === null) return r;
      const k = Math.round(r.depthM * 1000);
      const n = seen.get(k) ?? 0;
      seen.set(k, n + 1);
      return { ...r, hit: n % 2 === 0 ? a : b, hitSource: 'user' as const };
    });
    return { ...s, records };
  });
}

function swapHits(): void {
  updateSurvey((s) => ({ ...s, hitSwap: !s.hitSwap }));
}

function setAzimuth(receiver: string, depthM: number, text: string): void {
  const key = azimuthEditKey(receiver as ReceiverSlot, depthM);
  const value = text.trim() === '' ? null : Number(text);
  if (value !== null && !Number.isFinite(value)) return;
  commit((s) => {
    const next = { ...(s.edits.azimuthDeg ?? {}) };
    if (value === null) delete next[key];
    else next[key] = ((value % 360) + 360) % 360;
    return { edits: { ...s.edits, azimuthDeg: next } };
  });
}

const LETTER: Record<HitDirection, string> = { left: 'L', right: 'R', up: 'U', down: 'D', none: '–' };

export function OrientationTable() {
  const prepared = useResults((s) => s.prepared);
  const hitSwap = useApp((s) => !!s.survey.hitSwap);
  const depths = prepared?.orientation ?? [];
  return (
    <section className="orientation" aria-label="Hits and rotation">
      <h3>Hits and rotation</h3>
      <div className="row-actions">
        <button onClick={hitsByData} title="Clear given hits: every hit is inferred from the data">
          Hits by data
        </button>
        <button onClick={alternateByFileOrder}>Alternate by file order</button>
        <button onClick={swapHits} aria-pressed={hitSwap} title="One global left/right swap of the inferred hits">
          Swap all hits
        </button>
      </div>
      {depths.length ? (
        <div className="table-scroll">
          <table className="num" data-testid="orientation-table">
            <thead>
              <tr>
                <th>depth m</th>
                <th className="text">hits</th>
                <th className="text">from</th>
                <th>confidence</th>
                <th className="text">azimuth deg (receiver frame: 0 = H1, 90 = H2)</th>
              </tr>
            </thead>
            <tbody>
              {depths.map((d) => (
                <tr key={d.depthM}>
                  <td>{d.depthM.toFixed(2)}</td>
                  <td className="text">{d.recordIds.map((id) => LETTER[d.hits[id] ?? 'none']).join(' ')}</td>
                  <td className="text">{d.hitSource}</td>
                  <td>{d.confidence.toFixed(2)}</td>
                  <td className="text">
                    {d.receivers.map((r) =>
                      r.azimuthDeg === null ? (
                        <span key={r.receiver}>{r.receiver}: V </span>
                      ) : (
                        <label key={r.receiver} className="azimuth">
                          {r.receiver}{' '}
                          <input
                            aria-label={`Azimuth ${r.receiver} at ${d.depthM} m`}
                            size={5}
                            defaultValue={r.azimuthDeg.toFixed(0)}
                            key={`${r.azimuthDeg.toFixed(0)}|${r.azimuthSource}`}
                            onBlur={(e) => {
                              if (e.target.value !== r.azimuthDeg!.toFixed(0))
                                setAzimuth(r.receiver, d.depthM, e.target.value);
                            }}
                          />
                          {r.azimuthSource === 'user' ? ' (yours)' : ''}
                        </label>
                      ),
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="muted">Hits and azimuths appear here once the records are processed.</p>
      )}
    </section>
  );
}
