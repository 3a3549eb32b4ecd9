/**
 * Design outputs from the measured profile: per soil layer, modulus reduction and damping curves with the
 * working-strain G and field damping beside the laboratory Dmin; and the Vs-based liquefaction screen per
 * velocity interval and per soil layer (when the shaking is given).
 */
import type { ErrorInfo } from '../errors';
import type { SoilColumn, SoilLayer } from '../model';
import type { DesignSettings } from '../settings';
import {
  CURVE_MODELS,
  type CurveLayerInput,
  type FieldDamping,
  type FieldQ,
  type LayerCurves,
  fieldDampingForLayer,
  layerCurves,
} from './curves';
import { type LiquefactionInput, type LiquefactionRow, liquefactionScreen } from './liquefaction';
import { densityMgM3, gmaxKpa } from './moduli';
import { verticalStressAt } from './stress';

/** What the design outputs need of a profile row (a StiffnessRow satisfies it). */
export interface DesignProfileRow {
  topM: number;
  bottomM: number;
  midM: number;
  vsMps: number;
  sigmaVKpa: number;
  sigmaVEffKpa: number;
}

export interface LayerDesign extends LayerCurves {
  field: FieldDamping | null;
}

export interface LiquefactionResult {
  pgaG: number;
  magnitude: number;
  byInterval: LiquefactionRow[];
  byLayer: LiquefactionRow[];
}

export interface DesignResults {
  layers: LayerDesign[];
  /** Null when the peak ground acceleration or the magnitude is not given. */
  liquefaction: LiquefactionResult | null;
  /** Whether any field Q was supplied (else the field damping column stays empty). */
  fieldQGiven: boolean;
  /** Curve model and Darendeli loading used (after validation). */
  curveModel: DesignSettings['curveModel'];
  loadingFrequencyHz: number;
  loadingCycles: number;
  issues: ErrorInfo[];
}

/**
 * Travel-time average Vs of the profile over [top, bottom]: sum of overlaps / sum(overlap / Vs).
 * Null when no interval overlaps.
 */
export function travelTimeAverageVs(rows: readonly DesignProfileRow[], topM: number, bottomM: number): number | null {
  let h = 0;
  let t = 0;
  for (const r of rows) {
    const o = Math.min(r.bottomM, bottomM) - Math.max(r.topM, topM);
    if (o > 0 && r.vsMps > 0) {
      h += o;
      t += o / r.vsMps;
    }
  }
  return h > 0 ? h / t : null;
}

function soilFieldsOf(l: SoilLayer) {
  return {
    soilType: l.soilType ?? null,
    plasticityIndexPct: l.plasticityIndexPct ?? null,
    ocr: l.ocr ?? null,
    finesContentPct: l.finesContentPct ?? null,
    k0: l.k0 ?? null,
    workingStrainPct: l.workingStrainPct ?? null,
  };
}

function layerAtDepth(soil: SoilColumn, z: number): SoilLayer | null {
  const sorted = [...soil.layers].sort((a, b) => a.topM - b.topM);
  for (const l of sorted) if (z >= l.topM && z < l.bottomM) return l;
  return sorted.length && z >= sorted[sorted.length - 1].bottomM ? sorted[sorted.length - 1] : null;
}

const isNum = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

function validDesign(d: DesignSettings, issues: ErrorInfo[]): DesignSettings {
  const out = { ...d };
  // A hand-edited project may carry text or other non-numbers: never let them reach the formulas.
  for (const k of ['pgaG', 'magnitude'] as const) {
    if (out[k] !== null && !isNum(out[k])) {
      issues.push({
        code: 'DESIGN_SHAKING',
        message: `design.${k} ${JSON.stringify(out[k])} is not a number: no liquefaction screen.`,
        field: `design.${k}`,
      });
      out[k] = null;
    }
  }
  if (!CURVE_MODELS.includes(out.curveModel)) out.curveModel = 'darendeli';
  if (!(isNum(out.loadingFrequencyHz) && out.loadingFrequencyHz > 0 && out.loadingFrequencyHz <= 1000)) {
    issues.push({
      code: 'DESIGN_FREQUENCY',
      message: `Loading frequency ${d.loadingFrequencyHz} Hz must be above 0 and at most 1000 Hz; 1 Hz used.`,
      field: 'design.loadingFrequencyHz',
    });
    out.loadingFrequencyHz = 1;
  }
  if (!(isNum(out.loadingCycles) && out.loadingCycles >= 1 && out.loadingCycles <= 1000)) {
    issues.push({
      code: 'DESIGN_CYCLES',
      message: `Loading cycles ${d.loadingCycles} must be between 1 and 1000; 10 used.`,
      field: 'design.loadingCycles',
    });
    out.loadingCycles = 10;
  }
  return out;
}

/**
 * Curves per soil layer (Vs = travel-time average over the layer, Gmax = rho Vs^2, stresses at the layer
 * mid-depth) and, when both pgaG and magnitude are given, the liquefaction screen.
 */
export function designResults(
  rows: readonly DesignProfileRow[],
  soil: SoilColumn,
  design: DesignSettings,
  fieldQ: readonly FieldQ[] = [],
): DesignResults {
  const issues: ErrorInfo[] = [];
  const d = validDesign(design, issues);
  const sorted = [...soil.layers].sort((a, b) => a.topM - b.topM);
  const inputs: CurveLayerInput[] = sorted.map((l) => {
    const midM = 0.5 * (l.topM + l.bottomM);
    const vs = travelTimeAverageVs(rows, l.topM, l.bottomM);
    return {
      topM: l.topM,
      bottomM: l.bottomM,
      name: l.name,
      sigmaVEffKpa: verticalStressAt(soil, midM).effectiveKpa,
      vsMps: vs,
      gmaxKpa: vs === null ? null : gmaxKpa(densityMgM3(l.unitWeightKnM3), vs),
      ...soilFieldsOf(l),
    };
  });
  const curves = layerCurves(inputs, d);
  const layers: LayerDesign[] = curves.map((c) => ({ ...c, field: fieldDampingForLayer(c, fieldQ) }));

  let liquefaction: LiquefactionResult | null = null;
  const { pgaG, magnitude } = d;
  if (pgaG !== null && magnitude !== null) {
    if (!(pgaG > 0 && pgaG <= 3) || !(magnitude >= 4 && magnitude <= 9.5)) {
      issues.push({
        code: 'DESIGN_SHAKING',
        message: `Shaking out of range (pga ${pgaG} g must be above 0 and at most 3 g; magnitude ${magnitude} between 4 and 9.5): no liquefaction screen.`,
        field: 'design.pgaG/magnitude',
      });
    } else {
      const zw = soil.waterTableM;
      const byIntervalIn: LiquefactionInput[] = rows
        .filter((r) => r.vsMps > 0)
        .map((r) => {
          const l = layerAtDepth(soil, r.midM);
          return {
            topM: r.topM,
            bottomM: r.bottomM,
            midM: r.midM,
            vsMps: r.vsMps,
            sigmaVKpa: r.sigmaVKpa,
            sigmaVEffKpa: r.sigmaVEffKpa,
            soilType: l?.soilType ?? null,
            finesContentPct: l?.finesContentPct ?? null,
            saturated: zw !== null && r.midM > zw,
          };
        });
      // Per layer: the part of the layer below the water table, checked at its mid-depth with the
      // travel-time average Vs over that part.
      const byLayerIn: LiquefactionInput[] = [];
      for (const l of sorted) {
        const top = zw === null ? l.topM : Math.max(l.topM, zw);
        const saturated = zw !== null && top < l.bottomM;
        const from = saturated ? top : l.topM;
        const vs = travelTimeAverageVs(rows, from, l.bottomM);
        if (vs === null) continue;
        const midM = 0.5 * (from + l.bottomM);
        const st = verticalStressAt(soil, midM);
        byLayerIn.push({
          topM: from,
          bottomM: l.bottomM,
          midM,
          vsMps: vs,
          sigmaVKpa: st.totalKpa,
          sigmaVEffKpa: st.effectiveKpa,
          soilType: l.soilType ?? null,
          finesContentPct: l.finesContentPct ?? null,
          saturated,
        });
      }
      const shaking = { pgaG, magnitude };
      liquefaction = {
        pgaG,
        magnitude,
        byInterval: liquefactionScreen(byIntervalIn, shaking),
        byLayer: liquefactionScreen(byLayerIn, shaking),
      };
      const screened = liquefaction.byLayer.some((r) => r.status !== 'not-susceptible-type');
      if (!screened)
        issues.push({
          code: 'LIQ_NO_LAYERS',
          message: 'Liquefaction screen: no soil layer is marked sand or silty sand, so nothing was screened.',
          field: 'soilType',
        });
      if (zw === null)
        issues.push({
          code: 'LIQ_NO_WATER_TABLE',
          message: 'Liquefaction screen: no water table is given, so no layer was screened.',
          field: 'waterTableM',
        });
    }
  }
  return {
    layers,
    liquefaction,
    fieldQGiven: fieldQ.length > 0,
    curveModel: d.curveModel,
    loadingFrequencyHz: d.loadingFrequencyHz,
    loadingCycles: d.loadingCycles,
    issues,
  };
}
