/**
 * Messages and flags written by the core carry SI figures ("profile shorter than 30 m", "top 1 m").
 * On screen in US units they are rewritten with the same conversions as every table (core/units):
 * lengths in ft, velocities in ft/s. Station keys (d12.0) are identifiers, not lengths, and stay as they are.
 */
import { toDisplay, unitSpec, type UnitSystem } from '../core';

const VELOCITY = /(-?\d+(?:\.\d+)?) ?m\/s\b/g;
// A length: a number, a space and "m" not followed by a letter, digit, slash or power (m/s, ms, m², m³).
const LENGTH = /(-?\d+(?:\.\d+)?) m(?![\w/²³])/g;

export function unitText(text: string, u: UnitSystem): string {
  if (u === 'SI') return text;
  const vel = unitSpec('velocity', u);
  const dep = unitSpec('depth', u);
  return text
    .replace(VELOCITY, (_, v: string) => `${toDisplay('velocity', u, Number(v)).toFixed(vel.decimals)} ${vel.label}`)
    .replace(LENGTH, (_, v: string) => `${toDisplay('depth', u, Number(v)).toFixed(dep.decimals)} ${dep.label}`);
}
