import Decimal from 'decimal.js';

/**
 * The one place where Cupel does exact arithmetic on weights, fineness and money.
 *
 * Pricing runs on `Exact` values: a bigint times a power of ten, so every sum, difference and
 * product is exact with no precision limit, and each amount needs one integer division with an
 * exact remainder. `Dec` (decimal.js, 80 significant digits) serves display values that need a
 * real division (a fineness such as 14/24 shown as 0.583333, a per-gram spot) and callers
 * outside the engine.
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

/** An exact decimal m / 10^s (s >= 0). */
export interface Exact {
  readonly m: bigint;
  readonly s: number;
}

const BIG_POWERS_OF_TEN: bigint[] = Array.from({ length: 64 }, (_, i) => 10n ** BigInt(i));

function pow10(k: number): bigint {
  return k < BIG_POWERS_OF_TEN.length ? BIG_POWERS_OF_TEN[k]! : 10n ** BigInt(k);
}

export const EXACT_ZERO: Exact = { m: 0n, s: 0 };
export const EXACT_ONE: Exact = { m: 1n, s: 0 };
export const EXACT_HUNDRED: Exact = { m: 100n, s: 0 };

/** Parses an already validated decimal string ("12.5", "-3", "0.001"). */
export function exact(text: string): Exact {
  const dot = text.indexOf('.');
  return dot < 0 ? { m: BigInt(text), s: 0 } : { m: BigInt(text.slice(0, dot) + text.slice(dot + 1)), s: text.length - dot - 1 };
}

export function exactInt(n: number | bigint): Exact {
  return { m: BigInt(n), s: 0 };
}

/** 10^places as an Exact, for minor units per major unit. */
export function exactPowerOfTen(places: number): Exact {
  return { m: pow10(places), s: 0 };
}

export function mulExact(a: Exact, b: Exact): Exact {
  return { m: a.m * b.m, s: a.s + b.s };
}

export function addExact(a: Exact, b: Exact): Exact {
  if (b.m === 0n) return a;
  if (a.m === 0n) return b;
  if (a.s === b.s) return { m: a.m + b.m, s: a.s };
  return a.s > b.s ? { m: a.m + b.m * pow10(a.s - b.s), s: a.s } : { m: a.m * pow10(b.s - a.s) + b.m, s: b.s };
}

export function subExact(a: Exact, b: Exact): Exact {
  return b.m === 0n ? a : addExact(a, { m: -b.m, s: b.s });
}

/** a x percent / 100 */
export function percentOfExact(a: Exact, percent: Exact): Exact {
  return { m: a.m * percent.m, s: a.s + percent.s + 2 };
}

export function cmpExact(a: Exact, b: Exact): number {
  const x = a.s >= b.s ? a.m : a.m * pow10(b.s - a.s);
  const y = b.s >= a.s ? b.m : b.m * pow10(a.s - b.s);
  return x < y ? -1 : x > y ? 1 : 0;
}

export function maxExact(a: Exact, b: Exact): Exact {
  return cmpExact(a, b) >= 0 ? a : b;
}

export function isOneExact(a: Exact): boolean {
  return a.m === pow10(a.s);
}

/** True when a is a whole multiple of step (step > 0). */
export function isMultipleExact(a: Exact, step: Exact): boolean {
  const s = Math.max(a.s, step.s);
  return (a.m * pow10(s - a.s)) % (step.m * pow10(s - step.s)) === 0n;
}

/** Plain decimal without trailing zeros, as Dec's toFixed() writes it: "12.5", "0.001", "0", "-3". */
export function exactToString(a: Exact): string {
  let { m, s } = a;
  if (m === 0n) return '0';
  while (s > 0 && m % 10n === 0n) {
    m /= 10n;
    s--;
  }
  return shiftPoint(m.toString(), s);
}

export function exactToDec(a: Exact): Dec {
  return new Dec(exactToString(a));
}

/** Fixed decimal places, half-up (ties away from zero), as Dec's toFixed(places, ROUND_HALF_UP). */
export function exactToFixedHalfUp(a: Exact, places: number): string {
  if (a.m === 0n) return places === 0 ? '0' : `0.${'0'.repeat(places)}`;
  if (a.s <= places) return shiftPoint(`${a.m}${'0'.repeat(places - a.s)}`, places);
  const negative = a.m < 0n;
  const digits = divHalfUp(negative ? -a.m : a.m, pow10(a.s - places)).toString();
  return `${negative ? '-' : ''}${shiftPoint(digits, places)}`;
}

/**
 * Exact N/D rounded half-up to an integer, for N >= 0 and D > 0: integer quotient, exact remainder,
 * then the tie test 2r >= D. No intermediate rounding, so an exact .5 is always seen as .5.
 */
function divHalfUp(n: bigint, d: bigint): bigint {
  const q = n / d;
  const r = n % d;
  return r >= d - r ? q + 1n : q;
}

/** Exact n/d (n >= 0, d > 0) x 10^places rounded half-up to an integer; common powers of ten cancel first. */
function roundScaledRatio(n: Exact, d: Exact, places: number): bigint {
  const up = d.s + places;
  const common = up < n.s ? up : n.s;
  return divHalfUp(up === common ? n.m : n.m * pow10(up - common), n.s === common ? d.m : d.m * pow10(n.s - common));
}

/** Exact n/d (n >= 0, d > 0) rounded half-up to an integer. */
export function roundRatioHalfUp(n: Exact, d: Exact): bigint {
  return roundScaledRatio(n, d, 0);
}

/** Exact n/d (n >= 0, d > 0) to a fixed number of places, half-up, without an inexact division. */
export function exactRatioToFixedHalfUp(n: Exact, d: Exact, places: number): string {
  return shiftPoint(roundScaledRatio(n, d, places).toString(), places);
}

/** Integer minor units part x 100 / whole, two places, half-up; null when whole is 0. */
export function percentOfMinor(part: number, whole: number): string | null {
  return whole === 0 ? null : shiftPoint(divHalfUp(BigInt(part) * 10_000n, BigInt(whole)).toString(), 2);
}

/** A non-negative exact ratio n/d; karat finenesses are kept as k/24 this way. */
export interface Ratio {
  readonly n: Exact;
  readonly d: Exact;
}

export function ratio(n: string | Exact, d: string | Exact = EXACT_ONE): Ratio {
  return { n: typeof n === 'string' ? exact(n) : n, d: typeof d === 'string' ? exact(d) : d };
}

export function mulRatio(a: Ratio, b: Ratio): Ratio {
  return { n: mulExact(a.n, b.n), d: mulExact(a.d, b.d) };
}

const ratioValues = new WeakMap<Ratio, Dec>();

/** n/d to 80 significant digits; for display and comparisons, never for money. */
export function ratioValue(r: Ratio): Dec {
  let v = ratioValues.get(r);
  if (v === undefined) {
    v = isOneExact(r.d) ? exactToDec(r.n) : exactToDec(r.n).div(exactToDec(r.d));
    ratioValues.set(r, v);
  }
  return v;
}

const ratioThresholds = new WeakMap<Ratio, { gte(x: string): boolean }>();

/** ratioValue(r).gte(x), remembered per threshold: rate bands test the same few finenesses on every line. */
export function ratioThresholdTest(r: Ratio): { gte(x: string): boolean } {
  let found = ratioThresholds.get(r);
  if (found === undefined) {
    const answers = new Map<string, boolean>();
    found = {
      gte(x: string): boolean {
        let answer = answers.get(x);
        if (answer === undefined) {
          answer = ratioValue(r).gte(x);
          answers.set(x, answer);
        }
        return answer;
      },
    };
    ratioThresholds.set(r, found);
  }
  return found;
}

export function compareRatio(a: Ratio, b: Ratio): number {
  return cmpExact(mulExact(a.n, b.d), mulExact(b.n, a.d));
}

/** "14/24" or "0.925" */
export function ratioToExactString(r: Ratio): string {
  return isOneExact(r.d) ? exactToString(r.n) : `${exactToString(r.n)}/${exactToString(r.d)}`;
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
export function roundToMinorHalfUp(nMinor: Exact, d: Exact): number {
  return Number(roundRatioHalfUp(nMinor, d));
}

/** n/d to a fixed number of places, half-up, without an inexact division. */
export function ratioToFixedHalfUp(n: Dec, d: Dec, places: number): string {
  return shiftPoint(roundDivHalfUp(n.mul(POWERS_OF_TEN[places]!), d).toFixed(), places);
}

const POWERS_OF_TEN = Array.from({ length: 13 }, (_, i) => new Dec(10).pow(i));

/** "12345", 2 -> "123.45"; "5", 3 -> "0.005". Integer digits only. */
export function shiftPoint(digits: string, places: number): string {
  if (places === 0) return digits;
  if (digits.startsWith('-')) return `-${shiftPoint(digits.slice(1), places)}`;
  const cut = digits.length - places;
  return cut > 0 ? `${digits.slice(0, cut)}.${digits.slice(cut)}` : `0.${'0'.repeat(-cut)}${digits}`;
}
