/**
 * The one catalogue of test kinds: receivers and their layout (slots r0, r1 ...), components, the
 * reversed hit directions, how stations pair into intervals, defaults and the blank survey. Every
 * other module asks this table; no module compares `survey.kind` with a name.
 *
 * Conventions (docs/test-kinds.md; ASTM D7400 downhole and seismic cone, D4428 crosshole):
 * - downhole: one receiver (r0) in the hole, source at the surface offset from the collar;
 * - downhole-pair: two receivers on one probe, r0 upper, r1 lower by receiverSpacingM;
 * - seismic-cone: one or two receivers in the cone; the logged depth is the TIP depth, the (lower)
 *   receiver sits coneOffsetM above it (r0 alone, or r1 with r0 a spacing higher);
 * - crosshole: source in the main hole, receivers r0 (near hole) and r1 (far hole) at the test depth.
 */
import type { ChannelAssignment, Component, HitDirection, Survey, TestKind, Wave } from '../model';
import { receiverSlot, slotIndex, type ReceiverSlot } from '../keys';

/**
 * How stations pair into intervals:
 * - successive: successive depths of the same receiver (pseudo interval);
 * - same-hit: upper and lower receiver of the same hit (true interval);
 * - same-depth: near and far receiver holes at the same depth (crosshole interval).
 */
export type PairingRule = 'successive' | 'same-hit' | 'same-depth';

export interface TestKindInfo {
  id: TestKind;
  /** Name shown to the user. */
  label: string;
  /** Receiver counts the kind allows (first = default). */
  receiverCounts: readonly number[];
  /** Receiver names by slot for a receiver count. */
  receiverLabels: (count: number) => string[];
  /** Component carrying each wave (common practice: horizontal beam -> SH on the horizontal along the
   * beam, P on the vertical; vertical hits in a crosshole -> SV on the vertical, P on the radial horizontal). */
  components: Readonly<Record<Wave, Component>>;
  /** The two directions that reverse the shear wave: first minus second is the difference trace. */
  reversed: readonly [HitDirection, HitDirection];
  /** The source is in a hole at the test depth (crosshole), not at the surface. */
  sourceInHole: boolean;
  /** The logged depth is the cone tip's; receivers sit coneOffsetM above it. */
  tipLogged: boolean;
  /** Defaults for a blank survey. */
  defaults: { sourceOffsetM: number; receiverSpacingM: number; coneOffsetM: number };
}

/** Cone receiver above the tip, m: about 0.2 m for common cones (common practice). */
export const DEFAULT_CONE_OFFSET_M = 0.2;

const VERTICAL_LINE = (count: number) => (count === 2 ? ['upper', 'lower'] : ['receiver']);

export const TEST_KIND_CATALOGUE: readonly TestKindInfo[] = [
  {
    id: 'downhole',
    label: 'Downhole (one receiver)',
    receiverCounts: [1],
    receiverLabels: VERTICAL_LINE,
    components: { S: 'H1', P: 'V' },
    reversed: ['left', 'right'],
    sourceInHole: false,
    tipLogged: false,
    defaults: { sourceOffsetM: 2, receiverSpacingM: 1, coneOffsetM: DEFAULT_CONE_OFFSET_M },
  },
  {
    id: 'downhole-pair',
    label: 'Downhole, two receivers',
    receiverCounts: [2],
    receiverLabels: VERTICAL_LINE,
    components: { S: 'H1', P: 'V' },
    reversed: ['left', 'right'],
    sourceInHole: false,
    tipLogged: false,
    defaults: { sourceOffsetM: 2, receiverSpacingM: 1, coneOffsetM: DEFAULT_CONE_OFFSET_M },
  },
  {
    id: 'seismic-cone',
    label: 'Seismic cone',
    receiverCounts: [1, 2],
    receiverLabels: VERTICAL_LINE,
    components: { S: 'H1', P: 'V' },
    reversed: ['left', 'right'],
    sourceInHole: false,
    tipLogged: true,
    defaults: { sourceOffsetM: 1, receiverSpacingM: 1, coneOffsetM: DEFAULT_CONE_OFFSET_M },
  },
  {
    id: 'crosshole',
    label: 'Crosshole',
    receiverCounts: [2],
    receiverLabels: (count) => (count === 1 ? ['receiver hole'] : ['near hole', 'far hole']),
    components: { S: 'V', P: 'H1' },
    reversed: ['up', 'down'],
    sourceInHole: true,
    tipLogged: false,
    defaults: { sourceOffsetM: 0, receiverSpacingM: 1, coneOffsetM: DEFAULT_CONE_OFFSET_M },
  },
];

const BY_ID = new Map(TEST_KIND_CATALOGUE.map((k) => [k.id, k]));

export const TEST_KINDS: readonly TestKind[] = TEST_KIND_CATALOGUE.map((k) => k.id);

export function isTestKind(s: unknown): s is TestKind {
  return typeof s === 'string' && BY_ID.has(s as TestKind);
}

export function kindInfo(kind: TestKind): TestKindInfo {
  const k = BY_ID.get(kind);
  if (!k) throw new Error(`unknown test kind ${kind}`);
  return k;
}

type KindSurvey = Pick<Survey, 'kind' | 'receiverCount'>;

/** Receivers in use: the survey's count when the kind allows it, else the kind's default. */
export function receiverCountOf(survey: KindSurvey): number {
  const info = kindInfo(survey.kind);
  return info.receiverCounts.includes(survey.receiverCount) ? survey.receiverCount : info.receiverCounts[0];
}

export function receiverSlots(survey: KindSurvey): ReceiverSlot[] {
  return Array.from({ length: receiverCountOf(survey) }, (_, i) => receiverSlot(i));
}

/** Name of a receiver slot for the user ("upper", "near hole B2"). */
export function receiverLabel(
  survey: Pick<Survey, 'kind' | 'receiverCount' | 'receiverHoleIds'>,
  slot: ReceiverSlot,
): string {
  const i = slotIndex(slot);
  const word = kindInfo(survey.kind).receiverLabels(receiverCountOf(survey))[i] ?? slot;
  const hole = kindInfo(survey.kind).sourceInHole ? survey.receiverHoleIds[i] : undefined;
  return hole ? `${word} ${hole}` : word;
}

export function pairingRule(survey: KindSurvey): PairingRule {
  if (kindInfo(survey.kind).sourceInHole) return 'same-depth';
  return receiverCountOf(survey) === 2 ? 'same-hit' : 'successive';
}

export function componentFor(kind: TestKind, wave: Wave): Component {
  return kindInfo(kind).components[wave];
}

export function reversedDirections(kind: TestKind): readonly [HitDirection, HitDirection] {
  return kindInfo(kind).reversed;
}

/** The source sits at the surface (or sourceDepthM) offset from the receiver hole's collar. */
export function surfaceSource(kind: TestKind): boolean {
  return !kindInfo(kind).sourceInHole;
}

/** Crosshole-style direct velocities V = D / (t - t0) between source and receiver holes apply. */
export function hasDirectVelocities(kind: TestKind): boolean {
  return kindInfo(kind).sourceInHole;
}

/** Travel-time fits against depth (slant-corrected times, layer fits, the refracted-ray layer model) apply. */
export function hasDepthTimeFits(kind: TestKind): boolean {
  return surfaceSource(kind);
}

/** One-receiver successive-depth surveys: ray fit of the direct times and bridging an excluded depth. */
export function hasSuccessiveDepths(survey: KindSurvey): boolean {
  return pairingRule(survey) === 'successive';
}

/** The slot whose direct times the layer fits use (the upper receiver when there are two). */
export const FIT_SLOT: ReceiverSlot = 'r0';

/**
 * Depth of a receiver below ground, m, from the logged depth of its record (docs/project-format.md):
 * two-receiver probe: logged = upper (r0), r1 lower by the spacing; cone: logged = tip, the lower (or
 * only) receiver coneOffsetM above it, r0 a spacing higher when there are two; crosshole and
 * downhole: the logged depth.
 */
export function receiverDepthM(
  survey: Pick<Survey, 'kind' | 'receiverCount' | 'receiverSpacingM' | 'coneOffsetM'>,
  slot: ReceiverSlot,
  loggedDepthM: number,
): number {
  const info = kindInfo(survey.kind);
  if (info.sourceInHole) return loggedDepthM;
  const count = receiverCountOf(survey);
  const i = slotIndex(slot);
  if (info.tipLogged) {
    const lowest = loggedDepthM - survey.coneOffsetM;
    return count === 2 && i === 0 ? lowest - survey.receiverSpacingM : lowest;
  }
  return count === 2 && i === 1 ? loggedDepthM + survey.receiverSpacingM : loggedDepthM;
}

/** Holes a station of this slot uses (for deviation-table flags). */
export function holesUsed(
  survey: Pick<Survey, 'kind' | 'mainHoleId' | 'receiverHoleIds'>,
  slot: ReceiverSlot,
): string[] {
  return kindInfo(survey.kind).sourceInHole
    ? [survey.receiverHoleIds[slotIndex(slot)] ?? '', survey.mainHoleId]
    : [survey.mainHoleId];
}

/** The hole a receiver slot sits in. */
export function receiverHole(
  survey: Pick<Survey, 'kind' | 'mainHoleId' | 'receiverHoleIds'>,
  slot: ReceiverSlot,
): string {
  return kindInfo(survey.kind).sourceInHole ? (survey.receiverHoleIds[slotIndex(slot)] ?? '') : survey.mainHoleId;
}

/**
 * Default channel meaning (common practice for our demo layouts; editable in Geometry): surface-source
 * kinds take three channels H1 H2 V per receiver (r0 first); crosshole two channels per receiver hole
 * (near, far): V then H1.
 */
export function defaultChannels(survey: KindSurvey, channels: readonly number[]): ChannelAssignment[] {
  const count = receiverCountOf(survey);
  const comps = ['H1', 'H2', 'V'] as const;
  return channels.map((channel, i) => {
    if (kindInfo(survey.kind).sourceInHole)
      return {
        channel,
        component: i % 2 === 0 ? 'V' : 'H1',
        receiver: receiverSlot(Math.min(Math.floor(i / 2), count - 1)),
      };
    return { channel, component: comps[i % 3], receiver: receiverSlot(Math.min(Math.floor(i / 3), count - 1)) };
  });
}

/**
 * A blank survey for a fresh session (plain data; the user fills it in Geometry). Positions follow
 * common practice for each kind: downhole source 2 m from the hole on the surface; two-receiver probe
 * 1 m spacing; cone source 1 m from the push point, receiver 0.2 m above the tip; crosshole holes 3 m
 * apart in line (from memory, docs/test-kinds.md).
 */
export function blankSurvey(kind: TestKind, name = 'New survey', waterUnitWeightKnM3 = 9.81): Survey {
  const info = kindInfo(kind);
  const crosshole = info.sourceInHole;
  return {
    name,
    kind,
    receiverCount: info.receiverCounts[0],
    boreholes: crosshole
      ? [
          { id: 'S', collarEastM: 0, collarNorthM: 0, deviation: [] },
          { id: 'near', collarEastM: 3, collarNorthM: 0, deviation: [] },
          { id: 'far', collarEastM: 6, collarNorthM: 0, deviation: [] },
        ]
      : [{ id: kind === 'seismic-cone' ? 'CPT1' : 'BH1', collarEastM: 0, collarNorthM: 0, deviation: [] }],
    mainHoleId: crosshole ? 'S' : kind === 'seismic-cone' ? 'CPT1' : 'BH1',
    sourceOffsetM: info.defaults.sourceOffsetM,
    sourceDepthM: 0,
    receiverSpacingM: info.defaults.receiverSpacingM,
    coneOffsetM: info.defaults.coneOffsetM,
    receiverHoleIds: crosshole ? ['near', 'far'] : [],
    records: [],
    soil: { layers: [], waterTableM: null, waterUnitWeightKnM3 },
  };
}

/**
 * The survey after the user switches test kind: holes, source and records are kept where they fit the
 * new kind; a crosshole needs three holes (source, near, far) and otherwise takes the blank layout;
 * channel meanings are reset to the new kind's defaults for every record whose channels are known.
 */
export function changeKind(
  survey: Survey,
  kind: TestKind,
  channelsOf: (recordId: string) => readonly number[] | null,
): Survey {
  if (kind === survey.kind) return survey;
  const blank = blankSurvey(kind, survey.name, survey.soil.waterUnitWeightKnM3);
  const toCrosshole = kindInfo(kind).sourceInHole;
  const holesFit = toCrosshole
    ? survey.boreholes.length >= 3 && survey.receiverHoleIds.length >= 2
    : survey.boreholes.some((h) => h.id === survey.mainHoleId);
  const base: Survey = holesFit
    ? { ...survey, kind, receiverCount: blank.receiverCount }
    : {
        ...survey,
        kind,
        receiverCount: blank.receiverCount,
        boreholes: blank.boreholes,
        mainHoleId: blank.mainHoleId,
        receiverHoleIds: blank.receiverHoleIds,
        sourceOffsetM: blank.sourceOffsetM,
      };
  return {
    ...base,
    records: survey.records.map((r) => {
      const ch = channelsOf(r.recordId);
      return ch ? { ...r, channels: defaultChannels(base, ch) } : r;
    }),
  };
}
