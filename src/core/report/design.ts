/**
 * Export tables of the design outputs: curves.csv (modulus reduction and damping per soil layer, with the
 * working-strain G and field damping beside the laboratory Dmin) and liquefaction.csv (the Vs-based
 * screen per velocity interval and per soil layer). Units in column names; method and source columns;
 * cautions as '# CAUTION:' lines (toCsv).
 */
import type { Derived } from '../pipeline';
import type { CurveModel } from '../stiffness/curves';
import { CURVE_CAUTIONS } from '../stiffness/curves';
import { LIQUEFACTION_CAUTIONS, LIQUEFACTION_METHOD } from '../stiffness/liquefaction';
import type { UnitSystem } from '../units';
import { type Cell, EXPORT_CAUTIONS, num, type Table, unitColumn } from './tables';

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

/** One row per layer, model and strain (0.0001-1 %, log spaced), plus a 'working' row at the layer's working strain. */
export function curvesTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const columns = [
    'layer',
    u.name('depth_top', 'depth'),
    u.name('depth_bottom', 'depth'),
    'soil_type',
    'plasticity_index_pct',
    'plasticity_index_source',
    'ocr',
    'ocr_source',
    'k0',
    'k0_source',
    u.name('sigma_v_eff', 'stress'),
    u.name('sigma_m_eff', 'stress'),
    u.name('vs', 'velocity'),
    u.name('gmax', 'modulus'),
    'model',
    'source',
    'darendeli_reference_strain_pct',
    'darendeli_dmin_pct',
    'loading_frequency_hz',
    'loading_cycles',
    'point',
    'strain_pct',
    'g_over_gmax',
    u.name('g', 'modulus'),
    'damping_pct',
    'field_damping_pct',
    'field_damping_sd_pct',
    'field_frequency_hz',
    'darendeli_dmin_at_field_frequency_pct',
    'flags',
  ];
  const rows: Cell[][] = [];
  for (const l of d.design.layers) {
    const f = l.field;
    const head = (model: CurveModel): Cell[] => [
      l.name,
      u.value('distance', l.topM),
      u.value('distance', l.bottomM),
      l.soil.soilType,
      num(l.soil.plasticityIndexPct, 2),
      l.soil.piSource,
      num(l.soil.ocr, 3),
      l.soil.ocrSource,
      num(l.soil.k0, 3),
      l.soil.k0Source,
      u.value('stress', l.sigmaVEffKpa),
      u.value('stress', l.meanEffectiveStressKpa),
      u.value('velocity', l.vsMps),
      u.value('modulus', l.gmaxKpa),
      CURVE_MODEL_SOURCES[model].label,
      CURVE_MODEL_SOURCES[model].source,
      num(l.darendeli.referenceStrainPct, 5),
      num(l.darendeli.dminPct, 4),
    ];
    const tail: Cell[] = [
      num(f?.dampingPct, 3),
      num(f?.dampingSdPct, 3),
      num(f?.frequencyHz, 1),
      num(f?.labDminPct, 4),
      l.flags.join('; '),
    ];
    const load = (model: CurveModel): Cell[] =>
      model === 'darendeli' ? [num(d.design.loadingFrequencyHz, 3), num(d.design.loadingCycles, 0)] : [null, null];
    if (l.working) {
      rows.push([
        ...head(l.model),
        ...load(l.model),
        'working',
        num(l.working.strainPct, 6),
        num(l.working.modulusRatio, 5),
        u.value('modulus', l.working.gKpa),
        num(l.working.dampingPct, 4),
        ...tail,
      ]);
    }
    for (const [model, curve] of [
      [l.model, l.curve],
      [l.alternative.model, l.alternative.curve],
    ] as const) {
      for (const p of curve) {
        rows.push([
          ...head(model),
          ...load(model),
          'curve',
          num(p.strainPct, 6),
          num(p.modulusRatio, 5),
          u.value('modulus', l.gmaxKpa === null ? null : l.gmaxKpa * p.modulusRatio),
          num(p.dampingPct, 4),
          ...tail,
        ]);
      }
    }
  }
  return { columns, rows };
}

/** The screen per velocity interval, then per soil layer; null when no shaking was given. */
export function liquefactionTable(d: Derived, system: UnitSystem = 'SI'): Table | null {
  const q = d.design.liquefaction;
  if (!q) return null;
  const u = unitColumn(system);
  const columns = [
    'basis',
    u.name('depth_top', 'depth'),
    u.name('depth_bottom', 'depth'),
    u.name('depth_mid', 'depth'),
    'soil_type',
    'status',
    u.name('vs', 'velocity'),
    u.name('sigma_v', 'stress'),
    u.name('sigma_v_eff', 'stress'),
    `${u.name('vs1', 'velocity')}_n0.25_pa100kpa`,
    'fines_content_pct',
    u.name('vs1_limit', 'velocity'),
    'pga_g',
    'magnitude',
    'rd',
    'csr',
    'crr_m7_5',
    'msf',
    'factor_of_safety',
    'method',
    'source',
    'flags',
  ];
  const rows: Cell[][] = [];
  for (const [basis, list] of [
    ['interval', q.byInterval],
    ['layer', q.byLayer],
  ] as const) {
    for (const r of list) {
      rows.push([
        basis,
        u.value('distance', r.topM),
        u.value('distance', r.bottomM),
        u.value('distance', r.midM),
        r.soilType,
        r.status,
        u.value('velocity', r.vsMps),
        u.value('stress', r.sigmaVKpa),
        u.value('stress', r.sigmaVEffKpa),
        u.value('velocity', r.vs1Mps),
        num(r.finesContentPct, 1),
        u.value('velocity', r.vs1StarMps),
        num(q.pgaG, 3),
        num(q.magnitude, 2),
        num(r.rd, 4),
        num(r.csr, 4),
        num(r.crr75, 4),
        num(r.msf, 4),
        num(r.factorOfSafety, 3),
        `screening: ${LIQUEFACTION_METHOD}`,
        LIQUEFACTION_SOURCE,
        r.flags.join('; '),
      ]);
    }
  }
  return { columns, rows };
}
