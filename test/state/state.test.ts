/**
 * The app state (src/state): undo and redo of edit steps, the pick edit semantics (the edited method
 * becomes the chosen one for the station's intervals, one step, a drag amends it), and the worker
 * re-run key (it follows the settings groups prepare and autoPick read, not derive-only settings).
 */
import { beforeEach, describe, expect, it } from 'vitest';
import { intervalKey, patchSettings, pickEditKey, stationKey, defaultSettings, blankSurvey } from '../../src/core';
import { beginPickDrag, movePickDrag, setPick, updateSettings } from '../../src/state/edits';
import { processingKey } from '../../src/state/processing';
import { initialState, redo, undo, useApp, useResults } from '../../src/state/store';

const A = stationKey('r0', 1, 'H1');
const B = stationKey('r0', 2, 'H1');
const AB = intervalKey('S', A, B);

beforeEach(() => {
  useApp.setState(initialState('downhole'), true);
  // A prepared survey with one S interval A-B (only the pairs matter to the edit action).
  useResults.setState({
    prepared: {
      stations: [],
      pairs: [{ key: AB, wave: 'S', kind: 'pseudo', a: { key: A }, b: { key: B }, topM: 1, bottomM: 2 }],
      issues: [],
    } as never,
  });
});

describe('edit steps, undo and redo', () => {
  it("a hand pick is one step that also chooses its method for the station's intervals; undo and redo restore both", () => {
    setPick(A, 'S', 'trough', 0.02);
    let s = useApp.getState();
    expect(s.edits.picks[pickEditKey(A, 'S', 'trough')]).toBe(0.02);
    expect(s.edits.chosenMethod[AB]).toBe('trough');
    expect(s.past.length).toBe(1);
    undo();
    s = useApp.getState();
    expect(s.edits.picks).toEqual({});
    expect(s.edits.chosenMethod).toEqual({});
    redo();
    expect(useApp.getState().edits.chosenMethod[AB]).toBe('trough');
  });
  it('a drag is one step however many moves it has', () => {
    beginPickDrag(B, 'S', 'onset', 0.01, false);
    movePickDrag(B, 'S', 'onset', 0.011, false);
    movePickDrag(B, 'S', 'onset', 0.012, false);
    expect(useApp.getState().past.length).toBe(1);
    expect(useApp.getState().edits.picks[pickEditKey(B, 'S', 'onset')]).toBe(0.012);
    undo();
    expect(useApp.getState().edits.picks).toEqual({});
  });
  it('a new step after undo drops the redo list', () => {
    setPick(A, 'S', 'peak', 0.01);
    undo();
    updateSettings({ intervals: { rayFit: false } });
    redo();
    expect(useApp.getState().edits.picks).toEqual({});
    expect(useApp.getState().settings.intervals.rayFit).toBe(false);
  });
});

describe('the worker re-run key', () => {
  const survey = blankSurvey('downhole');
  const key = (p: Parameters<typeof patchSettings>[1]) =>
    processingKey(survey, patchSettings(defaultSettings(), p), []);
  const base = processingKey(survey, defaultSettings(), []);
  it('changes with every setting of the conditioning and picking groups', () => {
    expect(key({ conditioning: { detrend: false } })).not.toBe(base);
    expect(key({ conditioning: { bandpassS: { lowHz: 10, highHz: 200, order: 4 } } })).not.toBe(base);
    expect(key({ picking: { staS: 0.002 } })).not.toBe(base);
    expect(key({ picking: { vsRangeMps: [60, 1500] } })).not.toBe(base);
  });
  it('stays when only derive-stage settings or the soil column change', () => {
    expect(key({ intervals: { profileMethod: 'onset' } })).toBe(base);
    expect(key({ site: { monteCarloDraws: 2000 } })).toBe(base);
    expect(key({ layering: { mode: 'user', boundariesM: [5] } })).toBe(base);
    const soil = { ...survey, soil: { ...survey.soil, waterTableM: 3 } };
    expect(processingKey(soil, defaultSettings(), [])).toBe(base);
  });
  it('changes with the loaded files and the geometry', () => {
    expect(processingKey(survey, defaultSettings(), ['a.sg2'])).not.toBe(base);
    expect(processingKey({ ...survey, sourceOffsetM: 3 }, defaultSettings(), [])).not.toBe(base);
  });
});
