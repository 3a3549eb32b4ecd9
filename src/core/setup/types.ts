/**
 * Placement of records in a survey (docs/project-format.md, "Sources of placed values"): every placed
 * value (depth, hit, component, receiver slot) carries the source it came from. This module depends only
 * on the waveform model (WaveRecord) so it stays valid while the survey shapes change.
 */
import type { Component, HitDirection } from '../model';

/** Where a placed value came from, highest precedence first. */
export type PlacementSource = 'user' | 'log' | 'filename' | 'header' | 'data' | 'default';

export const PLACEMENT_SOURCES: readonly PlacementSource[] = ['user', 'log', 'filename', 'header', 'data', 'default'];

/** Lower rank = higher precedence. */
export function sourceRank(source: PlacementSource): number {
  return PLACEMENT_SOURCES.indexOf(source);
}

export interface Placed<T> {
  value: T;
  source: PlacementSource;
}

/** The candidate with the highest precedence (user > log > filename > header > data > default), or null. */
export function choosePlaced<T>(candidates: ReadonlyArray<Placed<T> | null | undefined>): Placed<T> | null {
  let best: Placed<T> | null = null;
  for (const c of candidates) if (c && (!best || sourceRank(c.source) < sourceRank(best.source))) best = c;
  return best;
}

/** Test kinds the set-up knows (the cone: receivers in a cone pushed from the surface; depth = tip depth). */
export type SetupKind = 'downhole' | 'downhole-pair' | 'crosshole' | 'seismic-cone';
export const SETUP_KINDS: readonly SetupKind[] = ['downhole', 'downhole-pair', 'crosshole', 'seismic-cone'];

/** Receiver slot: index in the kind's receiver layout (r0 upper/near, r1 lower/far). Never a hole name. */
export type ReceiverSlot = 'r0' | 'r1';

export interface ChannelPlacement {
  channel: number;
  receiver: ReceiverSlot;
  component: Component;
  source: PlacementSource;
}

/** Geometry the set-up needs to judge header values against the kind's receiver layout. */
export interface SetupGeometry {
  kind: SetupKind;
  /** 1 or 2 (seismic-cone may carry either; downhole 1; downhole-pair and crosshole 2). */
  receiverCount: 1 | 2;
  /** Vertical spacing of two receivers, m. */
  receiverSpacingM: number;
  /** Seismic cone: the (lower) receiver sits this far above the tip, m. */
  coneOffsetM: number;
  /** Crosshole receiver holes, near then far: user names (any text) and collars. */
  receiverHoles: { holeId: string; collarEastM: number; collarNorthM: number }[];
}

export interface PlacementSettings {
  /** A header value deeper than this is not read as a depth, m (default 200). */
  maxHeaderDepthM: number;
  /** File-name pattern; used for depth only when it contains {depth} or {depth_ft} and matches. */
  fileNamePattern: string;
}

export function defaultPlacementSettings(): PlacementSettings {
  return { maxHeaderDepthM: 200, fileNamePattern: '' };
}

/** How one record (file) is placed. depthM is the LOGGED depth: receiver (downhole), upper receiver
 * (two receivers), tip (seismic cone), test depth (crosshole). */
export interface PlacedRecord {
  recordId: string;
  file: string;
  depthM: Placed<number> | null;
  /** null = unknown: no name, header, note or log says (hits from the waveforms come later, source 'data'). */
  hit: Placed<HitDirection> | null;
  channels: ChannelPlacement[];
  excluded: boolean;
}

/** A header value that was not used, with the rule that rejected it. */
export interface RejectedValue {
  file: string;
  field: string;
  value: string;
  rule: RejectionRule;
  message: string;
}

export type RejectionRule =
  | 'not-positive'
  | 'deeper-than-limit'
  | 'traces-differ-spread'
  | 'pair-layout'
  | 'not-at-collar'
  | 'unit-unknown';

/** One inference rule that fired: how often and on which files (for the CLI and the Records pane). */
export interface InferenceSummary {
  what: 'depth' | 'hit' | 'component' | 'receiver';
  source: PlacementSource;
  rule: string;
  count: number;
  examples: string[];
}

export type { Component, HitDirection };
