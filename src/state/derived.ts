/**
 * Derived results: derive() of the core, memoised on the identity of its inputs so every view shares
 * one computation per change (results are never stored twice).
 */
import { derive, type Derived } from '../core/pipeline';
import { toErrorInfo } from '../core/errors';
import type { Survey } from '../core/model';
import type { Settings, UserEdits } from '../core/settings';
import type { Prepared } from '../core/pipeline';
import type { AutoPickResult } from '../core/picking/autopick';
import { useApp, useResults } from './store';

type Inputs = [Survey, Prepared | null, AutoPickResult | null, UserEdits, Settings];

let lastInputs: Inputs | null = null;
let lastOutput: Derived | null = null;
/** Wall time of the last derive() call, ms (shown in the status line; measured in e2e). */
export let lastDeriveMs = 0;

export function derivedFor(...inputs: Inputs): Derived | null {
  if (lastInputs && inputs.every((v, i) => v === lastInputs![i])) return lastOutput;
  const [survey, prepared, auto, edits, settings] = inputs;
  let out: Derived | null = null;
  if (prepared && auto) {
    const t0 = performance.now();
    try {
      out = derive(survey, prepared, auto, edits, settings);
    } catch (e) {
      out = emptyDerived([toErrorInfo(e, survey.name)]);
    }
    lastDeriveMs = performance.now() - t0;
  }
  lastInputs = inputs;
  lastOutput = out;
  return out;
}

function emptyDerived(issues: Derived['issues']): Derived {
  return {
    picks: [],
    delays: [],
    intervals: [],
    profile: [],
    travelTimes: [],
    layerFits: [],
    rayFit: null,
    drift: null,
    comparison: null,
    site: { vs30: null, classes: [], uncertainty: null, cautions: [] },
    issues,
  };
}

/** Current derived results (null until the first auto-pick has finished). */
export function useDerived(): Derived | null {
  const survey = useApp((s) => s.survey);
  const edits = useApp((s) => s.edits);
  const settings = useApp((s) => s.settings);
  const prepared = useResults((s) => s.prepared);
  const auto = useResults((s) => s.auto);
  return derivedFor(survey, prepared, auto, edits, settings);
}

/** Same, outside React (event handlers). */
export function currentDerived(): Derived | null {
  const a = useApp.getState();
  const r = useResults.getState();
  return derivedFor(a.survey, r.prepared, r.auto, a.edits, a.settings);
}
