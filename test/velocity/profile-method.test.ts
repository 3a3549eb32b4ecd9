/**
 * Which method the profile takes (docs/project-format.md, `intervals.profileMethod`: a method that does
 * not apply to the survey's kind gives way to the kind's default without a fallback flag). The app's
 * method menu, the printed summary, the report and the CLI all name this method, so a crosshole survey
 * under the downhole default never reads "layered model".
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_PROFILE_METHOD, methodApplies, profileMethodFor } from '../../src/core/catalogue/methods';

describe('profileMethodFor', () => {
  it('keeps a method that applies: layer-model on a downhole survey, onset on a crosshole survey', () => {
    expect(profileMethodFor('layer-model', 'downhole')).toBe('layer-model');
    expect(profileMethodFor('onset', 'crosshole')).toBe('onset');
  });

  it('gives the kind default where the method does not apply: layer-model on crosshole -> xcorr', () => {
    expect(methodApplies('layer-model', 'crosshole')).toBe(false);
    expect(profileMethodFor('layer-model', 'crosshole')).toBe(DEFAULT_PROFILE_METHOD.crosshole);
    expect(DEFAULT_PROFILE_METHOD.crosshole).toBe('xcorr');
  });

  it('every kind default applies to its own kind', () => {
    for (const [kind, m] of Object.entries(DEFAULT_PROFILE_METHOD))
      expect(methodApplies(m, kind as keyof typeof DEFAULT_PROFILE_METHOD)).toBe(true);
  });
});
