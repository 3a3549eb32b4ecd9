/**
 * Words a user sees or exports from the site classification: no note on how a fact was obtained
 * ("from memory") — that provenance lives in docs/site-class-sources.md — and, where a criterion was
 * not checked against the standard's text, a plain request to verify it (RULES: originality section).
 */
import { describe, expect, it } from 'vitest';
import { SITE_CAUTIONS, SITE_STANDARDS, siteClass, siteQuestions } from '../../src/core/site/classes';
import { STRESS_EXPONENT_CHOICES } from '../../src/core/stiffness/normalise';

describe('site-class text a user sees', () => {
  const texts: string[] = [];
  for (const q of siteQuestions()) texts.push(q.text, q.consequence, q.source);
  for (const std of SITE_STANDARDS)
    for (const vs of [100, 200, 400, 900, 1600]) {
      const r = siteClass(std, vs, {});
      texts.push(r.basis, ...r.notes);
    }
  texts.push(...SITE_CAUTIONS, ...STRESS_EXPONENT_CHOICES.map((c) => c.source));

  it('never says "from memory"', () => {
    expect(texts.filter((t) => /from memory/i.test(t))).toEqual([]);
  });

  it('asks to verify the ASCE 7 A/B limit and the ASCE 7-22 estimated-Vs range (not checked: docs/site-class-sources.md)', () => {
    const ab = siteClass('asce7_16', 1600, {}).notes.join(' ');
    expect(ab).toMatch(/verify against the standard’s current edition/);
    const est = siteClass('asce7_22', 300, {}).notes.join(' ');
    expect(est).toMatch(/verify against the standard’s current edition/);
  });
});
