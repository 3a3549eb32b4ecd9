/**
 * Soil column inputs for the design outputs (Geometry pane): per layer soil type, PI, OCR, fines content,
 * K0 and working strain (empty = the stated default), and the shaking and curve settings.
 */
import { useEffect, useState } from 'react';
import type { SoilLayer, SoilType } from '../core';
import type { DesignSettings } from '../core';
import { defaultDesignSettings } from '../core';
import { DEFAULT_PI_PCT, SOIL_TYPES, defaultK0 } from '../core';
import { updateSettings, updateSurvey } from '../state/edits';
import { useApp } from '../state/store';

const SOIL_WORDS: Record<SoilType, string> = {
  clay: 'clay',
  silt: 'silt',
  sand: 'sand',
  'silty-sand': 'silty sand',
  gravel: 'gravel',
  rock: 'rock',
  other: 'other',
};

/** Number field where empty means "not given" (null); commits on Enter or blur; out-of-range input is refused. */
function OptNum({
  value,
  onCommit,
  min,
  max,
  placeholder,
  ariaLabel,
}: {
  value: number | null | undefined;
  onCommit: (v: number | null) => void;
  min: number;
  max: number;
  placeholder: string;
  ariaLabel: string;
}) {
  const shown = value === null || value === undefined ? '' : String(value);
  const [text, setText] = useState(shown);
  const [bad, setBad] = useState(false);
  useEffect(() => {
    setText(shown);
    setBad(false);
  }, [shown]);
  const commit = () => {
    const t = text.trim().replace(',', '.');
    if (t === '') {
      setBad(false);
      if (shown !== '') onCommit(null);
      return;
    }
    const v = Number(t);
    if (!Number.isFinite(v) || v < min || v > max) {
      setBad(true);
      return;
    }
    setBad(false);
    if (t !== shown) onCommit(v);
  };
  return (
    <input
      className={`field${bad ? ' bad' : ''}`}
      size={5}
      value={text}
      placeholder={placeholder}
      aria-label={ariaLabel}
      aria-invalid={bad}
      title={bad ? `${ariaLabel}: enter a number from ${min} to ${max}, or leave empty for the default` : undefined}
      onChange={(e) => setText(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => {
        if (e.key === 'Enter') (e.target as HTMLInputElement).blur();
        if (e.key === 'Escape') setText(shown);
      }}
    />
  );
}

export function SoilDesignTable() {
  const layers = useApp((s) => s.survey.soil.layers);
  const setLayer = (i: number, patch: Partial<SoilLayer>) =>
    updateSurvey((s) => ({
      ...s,
      soil: { ...s.soil, layers: s.soil.layers.map((l, j) => (j === i ? { ...l, ...patch } : l)) },
    }));
  if (!layers.length) return null;
  return (
    <>
      <h4>Soil for modulus reduction, damping and the liquefaction screen</h4>
      <div className="table-wrap">
        <table className="num soil-design">
          <thead>
            <tr>
              <th>Layer</th>
              <th>Soil type</th>
              <th title="Plasticity index; empty = default for the soil type">PI (%)</th>
              <th title="Overconsolidation ratio; empty = 1 (normally consolidated)">OCR</th>
              <th title="Fines content, for Vs1* of the liquefaction screen; empty = clean sand (lowest resistance)">
                Fines (%)
              </th>
              <th title="At-rest earth pressure coefficient; empty = (1 - sin 30°) OCR^sin 30° (Jaky; Mayne & Kulhawy)">
                K0
              </th>
              <th title="Shear strain at which the working stiffness G is wanted; empty = none">Work. γ (%)</th>
            </tr>
          </thead>
          <tbody>
            {layers.map((l, i) => {
              const type = l.soilType ?? null;
              const ocr = l.ocr ?? 1;
              return (
                <tr key={i}>
                  <td className="text name" title={l.name}>
                    {l.name || `Layer ${i + 1}`}
                  </td>
                  <td>
                    <select
                      aria-label={`Soil type, layer ${i + 1}`}
                      value={type ?? ''}
                      onChange={(e) => setLayer(i, { soilType: (e.target.value || null) as SoilType | null })}
                    >
                      <option value="">not given</option>
                      {SOIL_TYPES.map((t) => (
                        <option key={t} value={t}>
                          {SOIL_WORDS[t]}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td>
                    <OptNum
                      value={l.plasticityIndexPct}
                      min={0}
                      max={200}
                      placeholder={String(DEFAULT_PI_PCT[type ?? 'other'])}
                      ariaLabel={`PI, layer ${i + 1}`}
                      onCommit={(v) => setLayer(i, { plasticityIndexPct: v })}
                    />
                  </td>
                  <td>
                    <OptNum
                      value={l.ocr}
                      min={1}
                      max={50}
                      placeholder="1"
                      ariaLabel={`OCR, layer ${i + 1}`}
                      onCommit={(v) => setLayer(i, { ocr: v })}
                    />
                  </td>
                  <td>
                    <OptNum
                      value={l.finesContentPct}
                      min={0}
                      max={100}
                      placeholder="—"
                      ariaLabel={`Fines content, layer ${i + 1}`}
                      onCommit={(v) => setLayer(i, { finesContentPct: v })}
                    />
                  </td>
                  <td>
                    <OptNum
                      value={l.k0}
                      min={0.1}
                      max={5}
                      placeholder={defaultK0(ocr).toFixed(2)}
                      ariaLabel={`K0, layer ${i + 1}`}
                      onCommit={(v) => setLayer(i, { k0: v })}
                    />
                  </td>
                  <td>
                    <OptNum
                      value={l.workingStrainPct}
                      min={0.00001}
                      max={10}
                      placeholder="—"
                      ariaLabel={`Working strain, layer ${i + 1}`}
                      onCommit={(v) => setLayer(i, { workingStrainPct: v })}
                    />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="small muted">
        Empty cells use the default shown in grey (placeholders to be replaced by site data). Strain in percent: 0.01
        means 0.01 %.
      </p>
    </>
  );
}

export function DesignFields() {
  const design = useApp((s) => s.settings.design) ?? defaultDesignSettings();
  const set = (patch: Partial<DesignSettings>) => updateSettings({ design: { ...design, ...patch } });
  return (
    <div className="form-grid">
      <label>
        Curve model{' '}
        <select
          value={design.curveModel}
          onChange={(e) => set({ curveModel: e.target.value as DesignSettings['curveModel'] })}
        >
          <option value="darendeli">Darendeli (2001)</option>
          <option value="ishibashi-zhang">Ishibashi & Zhang (1993)</option>
        </select>
      </label>
      <span>
        Loading frequency (Hz){' '}
        <OptNum
          value={design.loadingFrequencyHz}
          min={0.01}
          max={1000}
          placeholder="1"
          ariaLabel="Loading frequency"
          onCommit={(v) => set({ loadingFrequencyHz: v ?? 1 })}
        />
      </span>
      <span>
        Loading cycles{' '}
        <OptNum
          value={design.loadingCycles}
          min={1}
          max={1000}
          placeholder="10"
          ariaLabel="Loading cycles"
          onCommit={(v) => set({ loadingCycles: v ?? 10 })}
        />
      </span>
      <span>
        Peak ground acceleration (g){' '}
        <OptNum
          value={design.pgaG}
          min={0.001}
          max={3}
          placeholder="none"
          ariaLabel="Peak ground acceleration"
          onCommit={(v) => set({ pgaG: v })}
        />
      </span>
      <span>
        Magnitude (Mw){' '}
        <OptNum
          value={design.magnitude}
          min={4}
          max={9.5}
          placeholder="none"
          ariaLabel="Magnitude"
          onCommit={(v) => set({ magnitude: v })}
        />
      </span>
      <span className="small muted">Both shaking values are needed for the liquefaction screen.</span>
    </div>
  );
}
