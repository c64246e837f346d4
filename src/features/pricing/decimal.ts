import Decimal from 'decimal.js';

/**
 * The one place where Cupel does exact arithmetic on weights, fineness and money.
 *
 * 80 significant digits: every product the engine forms (weight up to 100 kg with 6 decimals,
 * fineness numerators, spot up to 1e8, percent, 31.1034768) stays well under 80 digits, so
 * multiplication and subtraction are exact. The only inexact operation is the final division
 * by a ratio's denominator, done once, just before rounding to the minor unit.
 */
export const Dec = Decimal.clone({
  precision: 80,
  rounding: Decimal.ROUND_HALF_UP,
  toExpNeg: -60,
  toExpPos: 60,
});
export type Dec = Decimal;

export const ZERO = new Dec(0);
export const ONE = new Dec(1);
export const HUNDRED = new Dec(100);

/** Plain decimal notation: "12", "12.5", "0.001". No exponent, no sign other than '-'. */
export const DECIMAL_PATTERN = /^-?\d+(\.\d+)?$/;

export function isDecimalString(text: string): boolean {
  return DECIMAL_PATTERN.test(text);
}

/** Parses an already validated decimal string (or a Dec). Never parses a float's binary value. */
export function dec(value: string | Dec): Dec {
  return typeof value === 'string' ? new Dec(value) : value;
}

/** A non-negative exact ratio n/d; karat finenesses are kept as k/24 this way. */
export interface Ratio {
  readonly n: Dec;
  readonly d: Dec;
}

export function ratio(n: string | Dec, d: string | Dec = ONE): Ratio {
  return { n: dec(n), d: dec(d) };
}

export function mulRatio(a: Ratio, b: Ratio): Ratio {
  return { n: a.n.mul(b.n), d: a.d.mul(b.d) };
}

const ratioValues = new WeakMap<Ratio, Dec>();

/** n/d to 80 significant digits; for display and comparisons, never for money. */
export function ratioValue(r: Ratio): Dec {
  if (r.d.eq(1)) return r.n;
  let v = ratioValues.get(r);
  if (v === undefined) {
    v = r.n.div(r.d);
    ratioValues.set(r, v);
  }
  return v;
}

export function compareRatio(a: Ratio, b: Ratio): number {
  return a.n.mul(b.d).cmp(b.n.mul(a.d));
}

/** "14/24" or "0.925" */
export function ratioToExactString(r: Ratio): string {
  return r.d.eq(1) ? r.n.toFixed() : `${r.n.toFixed()}/${r.d.toFixed()}`;
}

const finenessCache = new Map<string, Ratio>();

/** Parses "0.925" or "14/24" (both validated upstream). Cached: the same finenesses recur. */
export function parseRatio(text: string): Ratio {
  let found = finenessCache.get(text);
  if (found === undefined) {
    const slash = text.indexOf('/');
    found = slash < 0 ? ratio(text) : ratio(text.slice(0, slash), text.slice(slash + 1));
    if (finenessCache.size > 10_000) finenessCache.clear();
    finenessCache.set(text, found);
  }
  return found;
}

/** Fixed decimal places, half-up. */
export function toFixedHalfUp(value: Dec, places: number): string {
  return value.toFixed(places, Dec.ROUND_HALF_UP);
}

/** Fixed places, trailing zeros removed ("0.583333", "0.925", "1"). */
export function toTrimmed(value: Dec, places: number): string {
  return value.toDecimalPlaces(places, Dec.ROUND_HALF_UP).toFixed();
}

/**
 * Exact n/d rounded half-up to an integer, for n >= 0 and d > 0: integer quotient, exact remainder,
 * then the tie test 2r >= d. No intermediate rounding, so an exact .5 is always seen as .5.
 */
export function roundDivHalfUp(n: Dec, d: Dec): Dec {
  if (d.eq(1)) return n.toDecimalPlaces(0, Dec.ROUND_HALF_UP);
  const q = n.divToInt(d);
  const r = n.minus(q.mul(d));
  return r.mul(2).gte(d) ? q.plus(1) : q;
}

/**
 * THE rounding rule of Cupel money: the exact amount n/d (in minor units) is rounded once,
 * half-up (ties away from zero; amounts are never negative), to a whole minor unit.
 */
export function roundToMinorHalfUp(nMinor: Dec, d: Dec): number {
  return roundDivHalfUp(nMinor, d).toNumber();
}

/** n/d to a fixed number of places, half-up, without an inexact division. */
export function ratioToFixedHalfUp(n: Dec, d: Dec, places: number): string {
  return shiftPoint(roundDivHalfUp(n.mul(POWERS_OF_TEN[places]!), d).toFixed(), places);
}

const POWERS_OF_TEN = Array.from({ length: 13 }, (_, i) => new Dec(10).pow(i));

/** "12345", 2 -> "123.45"; "5", 3 -> "0.005". Integer digits only. */
export function shiftPoint(digits: string, places: number): string {
  if (places === 0) return digits;
  const negative = digits.startsWith('-');
  const body = (negative ? digits.slice(1) : digits).padStart(places + 1, '0');
  return `${negative ? '-' : ''}${body.slice(0, -places)}.${body.slice(-places)}`;
}
