/**
 * Export tables of the design outputs: curves.csv (modulus reduction and damping per soil layer, with the
 * working-strain G and field damping beside the laboratory Dmin) and liquefaction.csv (the Vs-based
 * screen per velocity interval and per soil layer). Units in column names; method and source columns;
 * cautions as '# CAUTION:' lines (toCsv).
 */
import type { Derived } from '../pipeline';
import type { LayerDesign } from '../stiffness/design';
import type { CurveModel } from '../stiffness/curves';
import { CURVE_CAUTIONS } from '../stiffness/curves';
import { LIQUEFACTION_CAUTIONS, LIQUEFACTION_METHOD } from '../stiffness/liquefaction';
import type { UnitSystem } from '../units';
import { EXPORT_CAUTIONS, num, type Table, tableOf, unitColumn } from './tables';

export const CURVE_MODEL_SOURCES: Record<CurveModel, { label: string; source: string }> = {
  darendeli: {
    label: 'Darendeli (2001)',
    source: 'Darendeli (2001), PhD dissertation, University of Texas at Austin',
  },
  'ishibashi-zhang': {
    label: 'Ishibashi & Zhang (1993)',
    source: 'Ishibashi & Zhang (1993), Soils and Foundations 33(1)',
  },
};

export const LIQUEFACTION_SOURCE =
  'Youd et al. (2001), J. Geotech. Geoenviron. Eng. 127(10); Andrus & Stokoe (2000), J. Geotech. Geoenviron. Eng. 126(11)';

const NO_FIELD_Q = 'Field damping columns are empty: no field attenuation (Q) estimate is available for this survey.';

/** Cautions written under curves.csv. */
export function curvesCautions(d: Derived): string[] {
  return [...EXPORT_CAUTIONS, ...CURVE_CAUTIONS, ...(d.design.fieldQGiven ? [] : [NO_FIELD_Q])];
}

export function liquefactionCautions(): string[] {
  return [...LIQUEFACTION_CAUTIONS, ...EXPORT_CAUTIONS];
}

/** One row of curves.csv: a layer's point on one model's curve, or its working-strain point. */
interface CurveRow {
  l: LayerDesign;
  model: CurveModel;
  point: 'working' | 'curve';
  strainPct: number | null;
  modulusRatio: number | null;
  gKpa: number | null;
  dampingPct: number | null;
}

function curveRows(l: LayerDesign): CurveRow[] {
  const rows: CurveRow[] = [];
  if (l.working) rows.push({ l, model: l.model, point: 'working', ...l.working });
  for (const [model, curve] of [
    [l.model, l.curve],
    [l.alternative.model, l.alternative.curve],
  ] as const) {
    for (const p of curve) {
      const gKpa = l.gmaxKpa === null ? null : l.gmaxKpa * p.modulusRatio;
      rows.push({
        l,
        model,
        point: 'curve',
        strainPct: p.strainPct,
        modulusRatio: p.modulusRatio,
        gKpa,
        dampingPct: p.dampingPct,
      });
    }
  }
  return rows;
}

/** One row per layer, model and strain (0.0001-1 %, log spaced), plus a 'working' row at the layer's working strain. */
export function curvesTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  // The loading frequency and cycles belong to Darendeli's model only.
  const darendeli = (r: CurveRow, x: number | null, digits: number) =>
    r.model === 'darendeli' ? num(x, digits) : null;
  return tableOf(d.design.layers.flatMap(curveRows), [
    ['layer', ({ l }) => l.name],
    [u.name('depth_top', 'depth'), ({ l }) => u.value('distance', l.topM)],
    [u.name('depth_bottom', 'depth'), ({ l }) => u.value('distance', l.bottomM)],
    ['soil_type', ({ l }) => l.soil.soilType],
    ['plasticity_index_pct', ({ l }) => num(l.soil.plasticityIndexPct, 2)],
    ['plasticity_index_source', ({ l }) => l.soil.piSource],
    ['ocr', ({ l }) => num(l.soil.ocr, 3)],
    ['ocr_source', ({ l }) => l.soil.ocrSource],
    ['k0', ({ l }) => num(l.soil.k0, 3)],
    ['k0_source', ({ l }) => l.soil.k0Source],
    [u.name('sigma_v_eff', 'stress'), ({ l }) => u.value('stress', l.sigmaVEffKpa)],
    [u.name('sigma_m_eff', 'stress'), ({ l }) => u.value('stress', l.meanEffectiveStressKpa)],
    [u.name('vs', 'velocity'), ({ l }) => u.value('velocity', l.vsMps)],
    [u.name('gmax', 'modulus'), ({ l }) => u.value('modulus', l.gmaxKpa)],
    ['model', (r) => CURVE_MODEL_SOURCES[r.model].label],
    ['source', (r) => CURVE_MODEL_SOURCES[r.model].source],
    ['darendeli_reference_strain_pct', ({ l }) => num(l.darendeli.referenceStrainPct, 5)],
    ['darendeli_dmin_pct', ({ l }) => num(l.darendeli.dminPct, 4)],
    ['loading_frequency_hz', (r) => darendeli(r, d.design.loadingFrequencyHz, 3)],
    ['loading_cycles', (r) => darendeli(r, d.design.loadingCycles, 0)],
    ['point', (r) => r.point],
    ['strain_pct', (r) => num(r.strainPct, 6)],
    ['g_over_gmax', (r) => num(r.modulusRatio, 5)],
    [u.name('g', 'modulus'), (r) => u.value('modulus', r.gKpa)],
    ['damping_pct', (r) => num(r.dampingPct, 4)],
    ['field_damping_pct', ({ l }) => num(l.field?.dampingPct, 3)],
    ['field_damping_sd_pct', ({ l }) => num(l.field?.dampingSdPct, 3)],
    ['field_frequency_hz', ({ l }) => num(l.field?.frequencyHz, 1)],
    ['darendeli_dmin_at_field_frequency_pct', ({ l }) => num(l.field?.labDminPct, 4)],
    ['flags', ({ l }) => l.flags.join('; ')],
  ]);
}

/** The screen per velocity interval, then per soil layer; null when no shaking was given. */
export function liquefactionTable(d: Derived, system: UnitSystem = 'SI'): Table | null {
  const q = d.design.liquefaction;
  if (!q) return null;
  const u = unitColumn(system);
  const rows = [
    ...q.byInterval.map((r) => ({ basis: 'interval', r })),
    ...q.byLayer.map((r) => ({ basis: 'layer', r })),
  ];
  return tableOf(rows, [
    ['basis', ({ basis }) => basis],
    [u.name('depth_top', 'depth'), ({ r }) => u.value('distance', r.topM)],
    [u.name('depth_bottom', 'depth'), ({ r }) => u.value('distance', r.bottomM)],
    [u.name('depth_mid', 'depth'), ({ r }) => u.value('distance', r.midM)],
    ['soil_type', ({ r }) => r.soilType],
    ['status', ({ r }) => r.status],
    [u.name('vs', 'velocity'), ({ r }) => u.value('velocity', r.vsMps)],
    [u.name('sigma_v', 'stress'), ({ r }) => u.value('stress', r.sigmaVKpa)],
    [u.name('sigma_v_eff', 'stress'), ({ r }) => u.value('stress', r.sigmaVEffKpa)],
    [`${u.name('vs1', 'velocity')}_n0.25_pa100kpa`, ({ r }) => u.value('velocity', r.vs1Mps)],
    ['fines_content_pct', ({ r }) => num(r.finesContentPct, 1)],
    [u.name('vs1_limit', 'velocity'), ({ r }) => u.value('velocity', r.vs1StarMps)],
    ['pga_g', () => num(q.pgaG, 3)],
    ['magnitude', () => num(q.magnitude, 2)],
    ['rd', ({ r }) => num(r.rd, 4)],
    ['csr', ({ r }) => num(r.csr, 4)],
    ['crr_m7_5', ({ r }) => num(r.crr75, 4)],
    ['msf', ({ r }) => num(r.msf, 4)],
    ['factor_of_safety', ({ r }) => num(r.factorOfSafety, 3)],
    ['method', () => `screening: ${LIQUEFACTION_METHOD}`],
    ['source', () => LIQUEFACTION_SOURCE],
    ['flags', ({ r }) => r.flags.join('; ')],
  ]);
}
