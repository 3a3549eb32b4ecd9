/**
 * Derived results: derive() of the core, memoised on the identity of its inputs so every view shares
 * one computation per change (results are never stored twice).
 *
 * Two steps so a pick edit shows at once: derive(..., { monteCarlo: false }) runs on every change
 * (profile, tables, deterministic Vs30), and the Monte Carlo spread of Vs30 (the core's siteUncertainty,
 * the same call derive() makes) follows once the user pauses for SPREAD_IDLE_MS. The spread is added to
 * the same result (a shallow copy sharing every array), so nothing is computed twice and the panes that
 * memoise on the arrays (profile, intervals, travel times) do not redraw when it arrives.
 */
import { useDeferredValue, useEffect, useMemo, useRef } from 'react';
import { create } from 'zustand';
import { derive, siteSpread, type Derived } from '../core';
import { toErrorInfo } from '../core';
import type { Survey } from '../core';
import type { Settings, UserEdits } from '../core';
import type { Prepared } from '../core';
import type { AutoPickResult } from '../core';
import type { ComparisonProfile } from '../core';
import { afterDelayWhenIdle } from './idle';
import { useApp, useResults } from './store';

type Inputs = [Survey, Prepared | null, AutoPickResult | null, UserEdits, Settings, ComparisonProfile | null];

/** Pause after the last change before the Monte Carlo spread is computed, ms. */
export const SPREAD_IDLE_MS = 250;

let lastInputs: Inputs | null = null;
/** derive() without the Monte Carlo (every change). */
let lastFast: Derived | null = null;
/** The same result with the spread, once computed for lastFast. */
let lastFull: Derived | null = null;
let lastSettings: Settings | null = null;
let cancelSpread: (() => void) | null = null;

/** Wall time of the last derive() call and of the last spread, ms (status line; measured in e2e). */
export let lastDeriveMs = 0;
export let lastSpreadMs = 0;

/** Bumped when the spread of the current result arrives (views re-read the result). */
export const useSpread = create<{ revision: number; pending: boolean }>(() => ({ revision: 0, pending: false }));

/**
 * The Vs30 spread for a result computed without it (the core's siteSpread: the same figures as
 * derive() with the Monte Carlo on).
 */
function withSpread(fast: Derived, settings: Settings): Derived {
  if (!fast.site.vs30) return fast;
  const t0 = performance.now();
  try {
    const uncertainty = siteSpread(fast, settings);
    return { ...fast, site: { ...fast.site, uncertainty } };
  } catch (e) {
    return { ...fast, issues: [...fast.issues, toErrorInfo(e, 'site spread')] };
  } finally {
    lastSpreadMs = performance.now() - t0;
  }
}

/** Computes the spread now (exports, print, the idle timer). */
export function settleSpread(): Derived | null {
  cancelSpread?.();
  cancelSpread = null;
  if (!lastFast || !lastSettings) return lastFast;
  if (!lastFull) {
    lastFull = withSpread(lastFast, lastSettings);
    useSpread.setState((s) => ({ revision: s.revision + 1, pending: false }));
  }
  return lastFull;
}

/** The spread once the user has paused and the page is idle (after the plots that show new results). */
function scheduleSpread(): void {
  cancelSpread?.();
  cancelSpread = afterDelayWhenIdle(() => {
    cancelSpread = null;
    settleSpread();
  }, SPREAD_IDLE_MS);
}

export function derivedFor(...inputs: Inputs): Derived | null {
  if (!(lastInputs && inputs.every((v, i) => v === lastInputs![i]))) {
    const [survey, prepared, auto, edits, settings, comparison] = inputs;
    let out: Derived | null = null;
    if (prepared && auto) {
      const t0 = performance.now();
      try {
        out = derive(survey, prepared, auto, edits, settings, { monteCarlo: false, comparison });
      } catch (e) {
        out = emptyDerived([toErrorInfo(e, survey.name)]);
      }
      lastDeriveMs = performance.now() - t0;
    }
    lastInputs = inputs;
    lastFast = out;
    lastFull = null;
    lastSettings = settings;
    if (out) scheduleSpread();
    // A store update inside a render is not allowed: mark pending just after it.
    queueMicrotask(() => {
      const pending = !!lastFast && !lastFull;
      if (useSpread.getState().pending !== pending) useSpread.setState({ pending });
    });
  }
  return lastFull ?? lastFast;
}

function emptyDerived(issues: Derived['issues']): Derived {
  return {
    picks: [],
    delays: [],
    intervals: [],
    profile: [],
    travelTimes: [],
    direct: [],
    layerFits: [],
    rayFit: null,
    layerModel: null,
    layering: { fit: null, reason: null },
    joint: { layers: [], reducedChi2: null, reason: 'no result', notes: [], correlation: null },
    drift: null,
    damping: { intervals: [], layers: [], reason: 'no result', caution: '' },
    comparison: null,
    site: { vs30: null, classes: [], uncertainty: null, cautions: [], setupIncomplete: null, bridged: [] },
    setupProblems: [],
    design: {
      layers: [],
      liquefaction: null,
      fieldQGiven: false,
      curveModel: 'darendeli',
      loadingFrequencyHz: 1,
      loadingCycles: 10,
      issues: [],
    },
    issues,
  };
}

/**
 * Current derived results (null until the first auto-pick has finished), in the render that takes up
 * new worker results or an edit: the Profile draws them first. The Trace board, whose traces cost the
 * most to draw, takes them up in a deferred render (useDeferredResults).
 */
export function useDerived(): Derived | null {
  const survey = useApp((s) => s.survey);
  const edits = useApp((s) => s.edits);
  const settings = useApp((s) => s.settings);
  const comparison = useApp((s) => s.comparison);
  const prepared = useResults((s) => s.prepared);
  const auto = useResults((s) => s.auto);
  useSpread((s) => s.revision);
  return derivedFor(survey, prepared, auto, edits, settings, comparison);
}

/**
 * The prepared traces and derived results together, taken up after the urgent render (useDeferredValue):
 * new results reach the Trace board once the Profile has drawn them, and the board draws its traces
 * once, with their picks (never first without them). Both values come from the same render, so the
 * board never pairs new traces with old picks.
 */
export function useDeferredResults(): { prepared: Prepared | null; derived: Derived | null } {
  const prepared = useResults((s) => s.prepared);
  const derived = useDerived();
  const both = useMemo(() => ({ prepared, derived }), [prepared, derived]);
  const shown = useDeferredValue(both);
  const self = useRef({});
  useEffect(() => {
    const me = self.current;
    if (shown === both) behind.delete(me);
    else behind.add(me);
    return () => void behind.delete(me);
  }, [shown, both]);
  return shown;
}

/** Views still showing older results than the latest (their deferred render is to come). */
const behind = new Set<object>();

/** How many views are still to take up the latest results (0 once every pane shows them; for the tests). */
export function viewsBehind(): number {
  return behind.size;
}

/** True while the Vs30 spread of the current result is still to come. */
export function useSpreadPending(): boolean {
  return useSpread((s) => s.pending);
}

/** Same, outside React (event handlers). */
export function currentDerived(): Derived | null {
  const a = useApp.getState();
  const r = useResults.getState();
  return derivedFor(a.survey, r.prepared, r.auto, a.edits, a.settings, a.comparison);
}

/** The current result with its spread computed now (exports and the printable summary). */
export function settledDerived(): Derived | null {
  currentDerived();
  return settleSpread();
}
