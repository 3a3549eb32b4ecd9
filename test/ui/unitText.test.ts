/**
 * Core messages shown in US units: the international foot (1959), 1 ft = 0.3048 m exactly (NIST SP 811,
 * appendix B), so 30 m = 98.4 ft and 1 m = 3.3 ft at one decimal; 200 m/s = 656 ft/s (whole ft/s, as the tables show).
 */
import { describe, expect, it } from 'vitest';
import { unitText } from '../../src/ui/unitText';

describe('core messages in the user’s units', () => {
  it('lengths: "profile shorter than 30 m" -> 98.4 ft; "top 1 m" -> 3.3 ft', () => {
    expect(unitText('profile shorter than 30 m', 'US')).toBe('profile shorter than 98.4 ft');
    expect(unitText('top 1 m given the shallowest Vs', 'US')).toBe('top 3.3 ft given the shallowest Vs');
  });
  it('velocities in ft/s; milliseconds, station keys and SI text untouched', () => {
    expect(unitText('Vs 200 m/s at d12.0, 4.5 ms', 'US')).toBe('Vs 656 ft/s at d12.0, 4.5 ms');
    expect(unitText('profile shorter than 30 m', 'SI')).toBe('profile shorter than 30 m');
  });
});
