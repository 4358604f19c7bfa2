/**
 * Decimal-text helpers. Scaling by powers of ten is done on the text ("1.3" with 10^6 →
 * Number("1.3e6")) rather than by multiplying doubles, so "1.3 MHz" is exactly the double
 * nearest 1.3e6 and format → parse round trips are exact.
 */

/** A JS-style decimal literal: optional sign, digits with optional point, optional exponent. No hex, NaN, Infinity, "_". */
export const NUMBER_PREFIX = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/;

// Exponents beyond this already give 0 or Infinity; clamping keeps huge ones like "1e99999999999999999999" well-formed.
const EXP_LIMIT = 100000;

/** Value of the decimal literal `literal` (matched by NUMBER_PREFIX) times 10^pow10, correctly rounded. */
export function scaleDecimal(literal: string, pow10: number): number {
  const e = literal.search(/[eE]/);
  const mantissa = e < 0 ? literal : literal.slice(0, e);
  const exp = e < 0 ? 0 : Number(literal.slice(e + 1));
  const total = Math.min(EXP_LIMIT, Math.max(-EXP_LIMIT, exp + pow10));
  return Number(`${mantissa}e${total}`);
}

/** True if the literal's digits are not all zero (so a result of 0 means underflow). */
export function hasNonZeroDigit(literal: string): boolean {
  const e = literal.search(/[eE]/);
  return /[1-9]/.test(e < 0 ? literal : literal.slice(0, e));
}

/** |x| as significant digits (no trailing zeros) and the power of ten of the first digit. */
export interface DecimalDigits {
  readonly negative: boolean;
  readonly digits: string;
  readonly exp: number;
}

/** Round finite, non-zero x to `sig` significant digits. */
export function toDecimalDigits(x: number, sig: number): DecimalDigits {
  const [m, e] = Math.abs(x)
    .toExponential(sig - 1)
    .split("e");
  const digits = m.replace(".", "").replace(/0+$/, "") || "0";
  return { negative: x < 0, digits, exp: Number(e) };
}

/** d₁.d₂d₃… × 10^exp written without an exponent ("1.5", "1500", "0.0015"). */
export function plainText(digits: string, exp: number): string {
  if (exp < 0) return "0." + "0".repeat(-exp - 1) + digits;
  const intPart = digits.slice(0, exp + 1).padEnd(exp + 1, "0");
  const frac = digits.slice(exp + 1);
  return frac ? `${intPart}.${frac}` : intPart;
}

/** d₁.d₂d₃… × 10^exp in JS exponent notation ("1.5e+12", "2e-7"). */
export function scientificText(digits: string, exp: number): string {
  const mant = digits.length > 1 ? `${digits[0]}.${digits.slice(1)}` : digits;
  return `${mant}e${exp < 0 ? "-" : "+"}${Math.abs(exp)}`;
}

/** Plain text for moderate exponents, exponent notation otherwise (like toPrecision, but without trailing zeros). */
export function compactText(digits: string, exp: number): string {
  return exp >= -5 && exp < 6 ? plainText(digits, exp) : scientificText(digits, exp);
}
