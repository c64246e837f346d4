import { add, dinero, toDecimal, toSnapshot, type Dinero } from 'dinero.js';
import { AUD, CAD, CHF, EUR, GBP, JPY, USD } from 'dinero.js/currencies';
import { Dec, shiftPoint } from './decimal';

const CURRENCIES = { USD, EUR, GBP, CAD, AUD, CHF, JPY } as const;
export const CURRENCY_CODES = Object.keys(CURRENCIES) as CurrencyCode[];
export type CurrencyCode = keyof typeof CURRENCIES;
export const DEFAULT_CURRENCY: CurrencyCode = 'USD';

/** JSON shape of every amount: integer minor units, its plain decimal, and a display string. */
export interface Money {
  readonly amountMinor: number;
  readonly currency: CurrencyCode;
  readonly decimal: string;
  readonly formatted: string;
}

export function currencyExponent(code: CurrencyCode): number {
  return CURRENCIES[code].exponent as number;
}

const minorPerMajorCache = new Map<CurrencyCode, Dec>();

export function minorPerMajor(code: CurrencyCode): Dec {
  let found = minorPerMajorCache.get(code);
  if (!found) {
    found = new Dec(10).pow(currencyExponent(code));
    minorPerMajorCache.set(code, found);
  }
  return found;
}

export function toDinero(amountMinor: number, code: CurrencyCode): Dinero<number> {
  return dinero({ amount: amountMinor, currency: CURRENCIES[code] });
}

const formatters = new Map<string, Intl.NumberFormat>();

function formatter(code: CurrencyCode, locale: string): Intl.NumberFormat {
  const id = `${locale}|${code}`;
  let f = formatters.get(id);
  if (!f) {
    const digits = currencyExponent(code);
    f = new Intl.NumberFormat(locale, { style: 'currency', currency: code, minimumFractionDigits: digits, maximumFractionDigits: digits });
    formatters.set(id, f);
  }
  return f;
}

/** The plain decimal of an amount, as dinero's toDecimal gives it (integer digits, no float). */
export function minorToDecimal(amountMinor: number, code: CurrencyCode): string {
  return shiftPoint(String(amountMinor), currencyExponent(code));
}

/** dinero's own toDecimal; minorToDecimal is its fast equivalent for the per-line hot path (tested equal). */
export function dineroDecimal(amountMinor: number, code: CurrencyCode): string {
  return toDecimal(toDinero(amountMinor, code));
}

/** Intl formats the decimal string itself (exact), never a float of the amount. */
export function moneyOf(amountMinor: number, code: CurrencyCode, locale = 'en-US'): Money {
  if (!Number.isSafeInteger(amountMinor)) throw new RangeError(`amount ${amountMinor} is not a whole number of minor units`);
  const decimal = minorToDecimal(amountMinor, code);
  const f = formatter(code, locale) as Intl.NumberFormat & { format(value: string): string };
  return { amountMinor, currency: code, decimal, formatted: f.format(decimal) };
}

/**
 * Sum of integer minor units: the same integer addition dinero's number calculator performs,
 * without allocating a Dinero per line (tested equal to dineroSum). Refuses to leave the safe-integer range.
 */
export function sumMinor(amounts: readonly number[]): number {
  let total = 0;
  for (const a of amounts) total += a;
  if (!Number.isSafeInteger(total)) throw new RangeError('total is beyond exact integer range');
  return total;
}

/** Reference sum through dinero objects. */
export function dineroSum(amounts: readonly number[], code: CurrencyCode): number {
  let total = toDinero(0, code);
  for (const a of amounts) total = add(total, toDinero(a, code));
  return toSnapshot(total).amount;
}

export function formatMinor(amountMinor: number, code: CurrencyCode, locale = 'en-US'): string {
  return moneyOf(amountMinor, code, locale).formatted;
}
