/**
 * The public entry of the core: what the app (state, ui), the worker and the command line may use.
 * Modules behind it are internals; test/boundaries.test.ts keeps the app from reaching past this file
 * and the core from importing the app.
 */
export * from './model';
export * from './errors';
export * from './flags';
export * from './keys';
export * from './settings';
export * from './units';
export * from './version';
export * from './catalogue/methods';
export * from './catalogue/testKinds';
export * from './pipeline';
export * from './io/project';
export * from './io/readers';
export * from './io/deviation';
export * from './io/record-ids';
export * from './io/text';
export * from './picking/autopick';
export * from './picking/snap';
export * from './picking/edits';
export * from './survey/paste';
export * from './survey/stations';
export * from './velocity/intervals';
export { vsBarMps } from './velocity/sdCalibration';
export * from './report/tables';
export * from './site/classes';
export * from './site/comparison';
export * from './stiffness/normalise';
export * from './synth/demo';
export * from './io/recordlog';
export { decodeUtf8 } from './io/bytes';
export { DEFAULT_NAME_PATTERN } from './setup/depth';
export * from './setup/infer';
export * from './setup/legacy';
export {
  defaultPlacementSettings,
  PLACEMENT_SOURCES,
  SETUP_KINDS,
  type ChannelPlacement,
  type InferenceSummary,
  type PlacedRecord,
  type PlacementSource,
  type RejectedValue,
  type SetupGeometry,
  type SetupKind,
} from './setup/types';
export * from './survey/setup-checks';
export * from './survey/orientation';
export { DEFAULT_WATER_UNIT_WEIGHT_KNM3 } from './stiffness/stress';
export * from './report/adapter';
export * from './report/data';
export * from './report/figures';
export * from './report/html';
export { standaloneSvg } from './report/svg';
export * from './stiffness/curves';
export * from './stiffness/liquefaction';
export * from './stiffness/design';
export * from './report/design';
