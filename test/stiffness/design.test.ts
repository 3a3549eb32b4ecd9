import { describe, expect, it } from 'vitest';
import type { SoilColumn } from '../../src/core/model';
import { defaultDesignSettings } from '../../src/core/settings';
import { designResults, travelTimeAverageVs } from '../../src/core/stiffness/design';
import { darendeliReferenceStrainPct } from '../../src/core/stiffness/curves';
import { verticalStressAt } from '../../src/core/stiffness/stress';

// An invented two-layer column for the checks (not site data): clay over sand, water table at 2 m.
const soil: SoilColumn = {
  waterTableM: 2,
  waterUnitWeightKnM3: 9.81,
  layers: [
    {
      topM: 0,
      bottomM: 4,
      name: 'clay',
      unitWeightKnM3: 18,
      stressExponent: 0.5,
      poissonRatio: 0.3,
      soilType: 'clay',
      plasticityIndexPct: 30,
      ocr: 2,
      k0: null,
      finesContentPct: null,
      workingStrainPct: 0.01,
    },
    {
      topM: 4,
      bottomM: 12,
      name: 'sand',
      unitWeightKnM3: 19,
      stressExponent: 0.25,
      poissonRatio: 0.3,
      soilType: 'sand',
      finesContentPct: 5,
    },
  ],
};

function rows(vs: [number, number, number][]) {
  return vs.map(([top, bottom, v]) => {
    const mid = 0.5 * (top + bottom);
    const st = verticalStressAt(soil, mid);
    return { topM: top, bottomM: bottom, midM: mid, vsMps: v, sigmaVKpa: st.totalKpa, sigmaVEffKpa: st.effectiveKpa };
  });
}

describe('travel-time average Vs over a depth range', () => {
  it('2 m at 100 and 2 m at 200 m/s -> 4 / (0.02 + 0.01) = 133.33 m/s (definition)', () => {
    expect(
      travelTimeAverageVs(
        rows([
          [0, 2, 100],
          [2, 4, 200],
        ]),
        0,
        4,
      ),
    ).toBeCloseTo(133.333, 3);
  });
  it('no overlap -> null', () => {
    expect(travelTimeAverageVs(rows([[0, 2, 100]]), 5, 6)).toBeNull();
  });
});

describe('design results from a profile', () => {
  const profile = rows([
    [0, 2, 120],
    [2, 4, 140],
    [4, 6, 170],
    [6, 8, 180],
    [8, 10, 230],
    [10, 12, 260],
  ]);
  it('curves per soil layer with Gmax = rho Vs^2 from the layer-average Vs; default K0 for OCR 2 = 0.5 x 2^0.5', () => {
    const d = designResults(profile, soil, defaultDesignSettings());
    expect(d.layers.length).toBe(2);
    const clay = d.layers[0];
    expect(clay.soil.k0).toBeCloseTo(0.5 * Math.SQRT2, 10);
    expect(clay.soil.k0Source).toBe('default');
    const vs = 4 / (2 / 120 + 2 / 140);
    expect(clay.vsMps).toBeCloseTo(vs, 8);
    expect(clay.gmaxKpa).toBeCloseTo((18 / 9.80665) * vs * vs, 6);
    const sm = (verticalStressAt(soil, 2).effectiveKpa * (1 + 2 * clay.soil.k0)) / 3;
    expect(clay.darendeli.referenceStrainPct).toBeCloseTo(darendeliReferenceStrainPct(30, 2, sm), 12);
    expect(clay.working?.gKpa).toBeCloseTo((clay.gmaxKpa as number) * (clay.working?.modulusRatio as number), 6);
    expect(d.liquefaction).toBeNull();
    expect(d.fieldQGiven).toBe(false);
  });
  it('screen only where shaking is given: sand intervals below the water table get FS, clay and Vs1 >= Vs1* do not', () => {
    const d = designResults(profile, soil, { ...defaultDesignSettings(), pgaG: 0.3, magnitude: 7.0 });
    const q = d.liquefaction;
    expect(q).not.toBeNull();
    const statuses = q!.byInterval.map((r) => r.status);
    expect(statuses).toEqual([
      'not-susceptible-type',
      'not-susceptible-type',
      'screened',
      'screened',
      'vs1-above-limit',
      'vs1-above-limit',
    ]);
    for (const r of q!.byInterval) {
      if (r.status === 'screened') expect(r.factorOfSafety).toBeGreaterThan(0);
      else expect(r.factorOfSafety).toBeNull();
    }
    expect(q!.byLayer.map((r) => r.status)).toEqual(['not-susceptible-type', 'screened']);
  });
  it('no water table: nothing screened and an issue says why (never a confident FS)', () => {
    const dry = { ...soil, waterTableM: null };
    const prof = profile.map((r) => ({ ...r, sigmaVEffKpa: r.sigmaVKpa }));
    const d = designResults(prof, dry, { ...defaultDesignSettings(), pgaG: 0.3, magnitude: 7.5 });
    expect(d.liquefaction!.byInterval.every((r) => r.factorOfSafety === null)).toBe(true);
    expect(d.issues.map((i) => i.code)).toContain('LIQ_NO_WATER_TABLE');
  });
  it('soil types not given: nothing screened and an issue says so', () => {
    const plain = { ...soil, layers: soil.layers.map((l) => ({ ...l, soilType: null })) };
    const d = designResults(profile, plain, { ...defaultDesignSettings(), pgaG: 0.3, magnitude: 7.5 });
    expect(d.liquefaction!.byInterval.every((r) => r.status === 'not-susceptible-type')).toBe(true);
    expect(d.issues.map((i) => i.code)).toContain('LIQ_NO_LAYERS');
  });
  it('out-of-range shaking gives an issue and no screen; bad frequency falls back to 1 Hz with an issue', () => {
    const d = designResults(profile, soil, {
      ...defaultDesignSettings(),
      pgaG: 7,
      magnitude: 7.5,
      loadingFrequencyHz: -1,
    });
    expect(d.liquefaction).toBeNull();
    expect(d.issues.map((i) => i.code)).toEqual(['DESIGN_FREQUENCY', 'DESIGN_SHAKING']);
    expect(d.loadingFrequencyHz).toBe(1);
  });
  it('field Q given -> field damping beside the lab Dmin', () => {
    const d = designResults(profile, soil, defaultDesignSettings(), [
      { topM: 4, bottomM: 12, q: 20, qSd: 5, frequencyHz: 40 },
    ]);
    expect(d.fieldQGiven).toBe(true);
    expect(d.layers[0].field).toBeNull();
    expect(d.layers[1].field?.dampingPct).toBeCloseTo(2.5, 12);
    expect(d.layers[1].field?.labDminPct).toBeLessThan(d.layers[1].field!.dampingPct);
  });
  it('a hand-edited project: text shaking, unknown soil type, negative working strain -> issues and defaults, no NaN', () => {
    const odd = {
      ...soil,
      layers: soil.layers.map((l) => ({ ...l, soilType: 'loam' as never, workingStrainPct: -1 })),
    };
    const d = designResults(profile, odd, {
      ...defaultDesignSettings(),
      pgaG: '0.3' as unknown as number,
      magnitude: 7.5,
      loadingCycles: 'ten' as unknown as number,
    });
    expect(d.liquefaction).toBeNull();
    expect(d.issues.map((i) => i.code)).toEqual(['DESIGN_SHAKING', 'DESIGN_CYCLES']);
    for (const l of d.layers) {
      expect(l.soil.soilType).toBe('other');
      expect(l.working).toBeNull();
      for (const p of l.curve) {
        expect(Number.isFinite(p.modulusRatio)).toBe(true);
        expect(Number.isFinite(p.dampingPct)).toBe(true);
      }
    }
  });
});
