/**
 * Significant digits of reported values (docs/significant-digits.md). ASTM D7400 (scope 1.4) asks that
 * recorded and calculated values follow Practice D6026; D6026 rounds with the method of Practice E29:
 * a dropped part that is exactly one half rounds the kept digit to even ("round half to even").
 * The project keeps full precision; only what the report and the exports show is rounded here.
 *
 * A tie is judged on the value as written in 15 significant decimal digits (the most a double holds
 * for any decimal), so 2.675 (stored as 2.67499999...) is the tie it was written as.
 */
import { toDisplay, type QuantityKind, type UnitSystem } from '../units';

/** How many digits a quantity keeps: a fixed number of decimals, or a number of significant digits. */
export type DigitRule = { decimals: number } | { significant: number };

/** Quantities the report and the CSV exports show, each with its rule. */
export type ReportedQuantity =
  | 'time'
  | 'distance'
  | 'velocity'
  | 'velocitySd'
  | 'modulus'
  | 'modulusSd'
  | 'stress'
  | 'density'
  | 'unitWeight'
  | 'poissonRatio'
  | 'exponent'
  | 'ratio'
  | 'percent';

/**
 * The rule per quantity, in the unit shown (times in ms, distances in m or ft, velocities in m/s or
 * ft/s, moduli in MPa or ksi, stresses in kPa or psf).
 */
export function digitRule(q: ReportedQuantity, system: UnitSystem = 'SI'): DigitRule {
  switch (q) {
    case 'time':
      return { decimals: 2 }; // 0.01 ms
    case 'distance':
      return { decimals: system === 'SI' ? 2 : 1 }; // 0.01 m, 0.1 ft
    case 'velocity':
    case 'modulus':
    case 'stress':
    case 'density':
    case 'unitWeight':
      return { significant: 3 };
    case 'velocitySd':
    case 'modulusSd':
    case 'ratio':
      return { significant: 2 };
    case 'poissonRatio':
    case 'exponent':
      return { decimals: 2 };
    case 'percent':
      return { decimals: 0 };
  }
}

/** Unit kind of a reported quantity (for conversion to the chosen system); null = no unit or ms. */
export function quantityKind(q: ReportedQuantity): QuantityKind | null {
  switch (q) {
    case 'distance':
      return 'depth';
    case 'velocity':
    case 'velocitySd':
      return 'velocity';
    case 'modulus':
    case 'modulusSd':
      return 'modulus';
    case 'stress':
      return 'stress';
    case 'density':
      return 'density';
    case 'unitWeight':
      return 'unitWeight';
    default:
      return null;
  }
}

const SIG = 15;

/** Sign, the 15 significant digits and the decimal exponent of the first digit of |x| (x finite, non-zero). */
function decimalDigits(x: number): { negative: boolean; digits: string; exp: number } {
  const [mant, e] = Math.abs(x)
    .toExponential(SIG - 1)
    .split('e');
  return { negative: x < 0, digits: mant.replace('.', ''), exp: Number(e) };
}

/**
 * x rounded to `decimals` places (negative = tens, hundreds ...), a half rounded to even (ASTM E29,
 * as used by D6026). Non-finite values are returned unchanged.
 */
export function roundHalfEven(x: number, decimals: number): number {
  if (!Number.isFinite(x) || x === 0) return x === 0 ? 0 : x;
  const { negative, digits, exp } = decimalDigits(x);
  const keep = exp + 1 + decimals; // digits kept
  if (keep >= SIG) return x;
  if (keep < 0) return 0;
  const kept = digits.slice(0, keep);
  const rest = digits.slice(keep);
  const first = rest.charCodeAt(0) - 48;
  const tail = /[1-9]/.test(rest.slice(1));
  const lastKept = keep > 0 ? kept.charCodeAt(keep - 1) - 48 : 0;
  const up = first > 5 || (first === 5 && (tail || lastKept % 2 === 1));
  const m = BigInt(kept || '0') + (up ? 1n : 0n);
  if (m === 0n) return 0;
  const v = Number(`${m}e${-decimals}`);
  return negative ? -v : v;
}

/** Decimals that `significant` digits of x leave (may be negative: 12345 to 3 digits keeps -2). */
export function decimalsForSignificant(x: number, significant: number): number {
  if (!Number.isFinite(x) || x === 0) return significant - 1;
  return significant - 1 - decimalDigits(x).exp;
}

/** x rounded by a rule; returns the rounded number and the decimals to print it with. */
export function applyRule(x: number, rule: DigitRule): { value: number; decimals: number } {
  if ('decimals' in rule) return { value: roundHalfEven(x, rule.decimals), decimals: rule.decimals };
  let d = decimalsForSignificant(x, rule.significant);
  let v = roundHalfEven(x, d);
  // 9.996 to 3 digits is 10.0: one digit more before the point, one decimal fewer.
  const d2 = decimalsForSignificant(v, rule.significant);
  if (v !== 0 && d2 < d) {
    d = d2;
    v = roundHalfEven(v, d);
  }
  return { value: v, decimals: d };
}

/** Reported number (for CSV cells): converted from SI to the system, rounded; non-finite -> null. */
export function reported(
  q: ReportedQuantity,
  siValue: number | null | undefined,
  system: UnitSystem = 'SI',
): number | null {
  if (siValue === null || siValue === undefined || !Number.isFinite(siValue)) return null;
  const kind = quantityKind(q);
  const shown = q === 'time' ? siValue * 1000 : kind ? toDisplay(kind, system, siValue) : siValue;
  return applyRule(shown, digitRule(q, system)).value;
}

/** Reported text (for the report): like reported(), with trailing zeros kept ('12.50', '1.50'); '–' for none. */
export function reportedText(
  q: ReportedQuantity,
  siValue: number | null | undefined,
  system: UnitSystem = 'SI',
): string {
  if (siValue === null || siValue === undefined || !Number.isFinite(siValue)) return '–';
  const kind = quantityKind(q);
  const shown = q === 'time' ? siValue * 1000 : kind ? toDisplay(kind, system, siValue) : siValue;
  const { value, decimals } = applyRule(shown, digitRule(q, system));
  return (value === 0 ? 0 : value).toFixed(Math.max(0, decimals));
}

/** The rule in words, for the method notes and the docs. */
export function ruleWords(rule: DigitRule): string {
  if ('significant' in rule) return `${rule.significant} significant digits`;
  return rule.decimals === 0 ? 'whole numbers' : `${rule.decimals} decimal place${rule.decimals === 1 ? '' : 's'}`;
}
