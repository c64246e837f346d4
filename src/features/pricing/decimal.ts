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

export function ratioValue(r: Ratio): Dec {
  return r.d.eq(1) ? r.n : r.n.div(r.d);
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
 * THE rounding rule of Cupel money: the exact amount n/d (in major units) is rounded once,
 * half-up (ties away from zero; amounts are never negative), to the currency's minor unit.
 */
export function roundToMinorHalfUp(n: Dec, d: Dec, minorPerMajor: Dec): number {
  const exact = d.eq(1) ? n.mul(minorPerMajor) : n.mul(minorPerMajor).div(d);
  return exact.toDecimalPlaces(0, Dec.ROUND_HALF_UP).toNumber();
}
