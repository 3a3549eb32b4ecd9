/**
 * A blank survey for a fresh session (plain data; the user fills it in Geometry). Positions follow
 * common practice for each test kind (design.md "Geometry"): downhole source 2 m from the hole on the
 * surface; two-receiver probe 1 m spacing; crosshole holes 3 m apart in line (from memory, domain.md s.2).
 */
import type { Survey, TestKind } from '../core/model';
import { DEFAULT_WATER_UNIT_WEIGHT_KNM3 } from '../core/stiffness/stress';

export function newSurvey(kind: TestKind, name = 'New survey'): Survey {
  const crosshole = kind === 'crosshole';
  return {
    name,
    kind,
    boreholes: crosshole
      ? [
          { id: 'S', collarEastM: 0, collarNorthM: 0, deviation: [] },
          { id: 'near', collarEastM: 3, collarNorthM: 0, deviation: [] },
          { id: 'far', collarEastM: 6, collarNorthM: 0, deviation: [] },
        ]
      : [{ id: 'BH1', collarEastM: 0, collarNorthM: 0, deviation: [] }],
    mainHoleId: crosshole ? 'S' : 'BH1',
    sourceOffsetM: crosshole ? 0 : 2,
    sourceDepthM: 0,
    receiverSpacingM: 1,
    receiverHoleIds: crosshole ? ['near', 'far'] : [],
    records: [],
    soil: { layers: [], waterTableM: null, waterUnitWeightKnM3: DEFAULT_WATER_UNIT_WEIGHT_KNM3 },
  };
}

export const TEST_KIND_NAMES: Record<TestKind, string> = {
  downhole: 'Downhole (one receiver)',
  'downhole-pair': 'Downhole, two receivers',
  crosshole: 'Crosshole',
};
