import { describe, expect, it } from 'vitest';
import { applyRule, digitRule, reported, reportedText, roundHalfEven } from '../../src/core/report/digits';

// Rounding of a dropped part of exactly one half: ASTM E29 (the rounding method Practice D6026 uses,
// which ASTM D7400 scope 1.4 refers to) keeps the last digit even (from memory). We test that rule.
describe('round half to even (ASTM E29 via D6026)', () => {
  it('a dropped part of exactly one half makes the kept digit even', () => {
    expect(roundHalfEven(2.35, 1)).toBe(2.4); // 3 is odd: up
    expect(roundHalfEven(2.45, 1)).toBe(2.4); // 4 is even: stays
    expect(roundHalfEven(0.5, 0)).toBe(0);
    expect(roundHalfEven(1.5, 0)).toBe(2);
    expect(roundHalfEven(2.5, 0)).toBe(2);
    expect(roundHalfEven(-2.5, 0)).toBe(-2);
    expect(roundHalfEven(-3.5, 0)).toBe(-4);
    expect(roundHalfEven(185, -1)).toBe(180);
    expect(roundHalfEven(175, -1)).toBe(180);
  });
  it('more than one half rounds up, less rounds down', () => {
    expect(roundHalfEven(2.451, 1)).toBe(2.5);
    expect(roundHalfEven(2.4499, 1)).toBe(2.4);
    expect(roundHalfEven(-2.451, 1)).toBe(-2.5);
  });
  it('a tie is judged on the value as written, not its binary neighbour (2.675 is stored as 2.67499...)', () => {
    expect((2.675).toFixed(2)).toBe('2.67'); // JavaScript's own rounding sees the binary value
    expect(roundHalfEven(2.675, 2)).toBe(2.68); // 7 odd: up
    expect(roundHalfEven(2.665, 2)).toBe(2.66); // 6 even: stays
    expect(roundHalfEven(1.005, 2)).toBe(1.0);
    expect(roundHalfEven(0.125, 2)).toBe(0.12);
  });
  it('leaves non-finite values, zero and values already short enough alone', () => {
    expect(roundHalfEven(Number.NaN, 2)).toBeNaN();
    expect(roundHalfEven(0, 2)).toBe(0);
    expect(Object.is(roundHalfEven(-0.001, 2), 0)).toBe(true);
    expect(roundHalfEven(12.5, 3)).toBe(12.5);
  });
});

describe('significant digits (D6026: keep the digits the measurement supports; our rule per quantity)', () => {
  it('three significant digits for velocities, moduli and stresses', () => {
    expect(applyRule(1234.5, { significant: 3 }).value).toBe(1230);
    expect(applyRule(185.5, { significant: 3 }).value).toBe(186); // tie, 5 odd: up
    expect(applyRule(186.5, { significant: 3 }).value).toBe(186); // tie, 6 even: stays
    expect(applyRule(0.0012345, { significant: 3 }).value).toBe(0.00123);
    expect(applyRule(9.996, { significant: 3 })).toEqual({ value: 10, decimals: 1 });
  });
  it('the rule per quantity (docs/significant-digits.md)', () => {
    expect(digitRule('time')).toEqual({ decimals: 2 });
    expect(digitRule('distance', 'SI')).toEqual({ decimals: 2 });
    expect(digitRule('distance', 'US')).toEqual({ decimals: 1 });
    expect(digitRule('velocity')).toEqual({ significant: 3 });
    expect(digitRule('velocitySd')).toEqual({ significant: 2 });
    expect(digitRule('modulus')).toEqual({ significant: 3 });
  });
  it('reported values: ms to 0.01, depths to 0.01 m or 0.1 ft, velocities to 3 digits in the shown unit', () => {
    expect(reported('time', 0.0123456)).toBe(12.35);
    expect(reported('distance', 12.345)).toBe(12.34); // tie, 4 even
    expect(reported('distance', 10, 'US')).toBe(32.8); // 32.808 ft
    expect(reported('velocity', 271.49)).toBe(271);
    expect(reported('velocity', 100, 'US')).toBe(328); // 328.08 ft/s
    expect(reported('modulus', 54321)).toBe(54.3); // kPa -> MPa
    expect(reported('velocity', Number.NaN)).toBeNull();
    expect(reported('velocity', null)).toBeNull();
  });
  it('reported text keeps the trailing zeros the rule asks for', () => {
    expect(reportedText('distance', 12.5)).toBe('12.50');
    expect(reportedText('modulus', 1500)).toBe('1.50');
    expect(reportedText('velocity', 1234.5)).toBe('1230');
    expect(reportedText('velocity', 99.96)).toBe('100');
    expect(reportedText('time', 0.001)).toBe('1.00');
    expect(reportedText('velocity', undefined)).toBe('–');
  });
});
