import { FACE_VALUE_BASIS_LABELS, coinSpec, faceValueBasisFor, faceValueClass, type FaceValueBasis } from './coins';
import {
  EXACT_HUNDRED,
  EXACT_ZERO,
  ZERO,
  addExact,
  exact,
  exactPowerOfTen,
  exactRatioToFixedHalfUp,
  exactToDec,
  exactToFixedHalfUp,
  exactToString,
  isOneExact,
  maxExact,
  mulExact,
  parseRatio,
  percentOfMinor,
  ratioValue,
  roundToMinorHalfUp,
  subExact,
  toFixedHalfUp,
  toTrimmed,
  type Exact,
  type Ratio,
} from './decimal';
import type { MarkReading } from './marks';
import { METALS, type Metal } from './metals';
import { currencyExponent, moneyOf, sumMinor, type CurrencyCode, type Money } from './money';
import { quoteInputSchema, type ValidQuoteInput, type ValidQuoteLine } from './pricing.schema';
import type { RateCategory } from './rates';
import { resolveLine, type FinenessSource, type RateSource } from './resolve';
import { PENNYWEIGHT_GRAMS_EXACT, TROY_OUNCE_GRAMS, TROY_OUNCE_GRAMS_EXACT } from './units';

export const ROUNDING_RULE =
  "Each line's melt value and payout are rounded once, half-up, to the currency's minor unit; " +
  'margin = rounded melt - rounded payout; totals are sums of the rounded lines.';

/** Display precision of weights and fineness; money is always computed from the exact values. */
export const GRAMS_PLACES = 4;
export const TROY_OUNCE_PLACES = 6;
export const FINENESS_PLACES = 6;

export interface PayoutRate {
  readonly basis: 'percent-of-melt' | 'under-spot';
  readonly percent?: string;
  readonly amountUnderSpotPerTroyOunce?: string;
  readonly source: RateSource;
  readonly rateCategory: RateCategory;
  /** payout / melt x 100, two places; null when the melt value rounds to zero. */
  readonly effectivePercentOfMelt: string | null;
}

interface LineBase {
  readonly index: number;
  readonly kind: ValidQuoteLine['kind'];
  readonly description?: string;
}

export interface PricedLine extends LineBase {
  readonly status: 'priced';
  readonly metal: Metal;
  readonly mark?: MarkReading;
  readonly markedFineness: string | null;
  readonly markedFinenessExact: string | null;
  readonly paidOnFineness: string | null;
  readonly paidOnFinenessExact: string | null;
  readonly finenessSource: FinenessSource;
  readonly grossWeightGrams: string | null;
  readonly tareGrams: string | null;
  readonly deductionsGrams: string | null;
  readonly netWeightGrams: string | null;
  readonly fineWeightGrams: string;
  readonly fineWeightTroyOunces: string;
  readonly spotPerTroyOunce: string;
  readonly meltValue: Money;
  readonly payoutRate: PayoutRate;
  readonly payout: Money;
  readonly margin: Money;
  readonly marginPercentOfMelt: string | null;
  readonly coin?: { readonly coinType: string; readonly count: number; readonly label: string };
  readonly faceValue?: {
    readonly coinClass: string;
    readonly faceValue: string;
    /** The basis that priced the line, and how it reads: "mint weight", "circulated, common practice". */
    readonly basis: FaceValueBasis;
    readonly basisLabel: string;
    readonly troyOuncesPerDollarFace: string;
    readonly label: string;
  };
  readonly notes: readonly string[];
}

export interface UnpricedLine extends LineBase {
  readonly status: 'needs-test' | 'not-buyable';
  readonly mark: MarkReading;
  readonly message: string;
  readonly grossWeightGrams: string | null;
  readonly netWeightGrams: string | null;
}

export type QuoteLine = PricedLine | UnpricedLine;

export interface MetalTotal {
  readonly metal: Metal;
  readonly fineWeightGrams: string;
  readonly fineWeightTroyOunces: string;
  readonly meltValue: Money;
  readonly payout: Money;
  readonly margin: Money;
}

export interface SpotShown {
  readonly perTroyOunce: string;
  readonly perGram: string;
  readonly perPennyweight: string;
}

export interface PricedQuote {
  readonly currency: CurrencyCode;
  readonly roundingRule: string;
  readonly spot: Readonly<Partial<Record<Metal, SpotShown>>>;
  readonly lines: readonly QuoteLine[];
  readonly totals: {
    readonly meltValue: Money;
    readonly payout: Money;
    readonly margin: Money;
    readonly marginPercentOfMelt: string | null;
    readonly pricedLineCount: number;
    readonly unpricedLineCount: number;
    readonly byMetal: readonly MetalTotal[];
  };
}

export interface QuoteIssue {
  readonly path: string;
  readonly message: string;
}

/** Thrown by priceQuote; the endpoint maps it to 422 { error, issues }. */
export class QuoteValidationError extends Error {
  readonly issues: readonly QuoteIssue[];
  constructor(issues: readonly QuoteIssue[]) {
    super(`Quote input is not valid: ${issues.map((i) => `${i.path || '(root)'}: ${i.message}`).join('; ')}`);
    this.name = 'QuoteValidationError';
    this.issues = issues;
  }
}

export type QuoteResult = { ok: true; quote: PricedQuote } | { ok: false; error: 'invalid-quote'; issues: QuoteIssue[] };

function grams(d: Exact | undefined): string | null {
  return d === undefined ? null : exactToFixedHalfUp(d, GRAMS_PLACES);
}


interface QuoteContext {
  readonly quote: ValidQuoteInput;
  readonly currency: CurrencyCode;
  readonly locale: string;
  readonly scale: Exact;
  readonly spotMinor: ReadonlyMap<Metal, Exact>;
}

type LineBody = DistributiveOmit<QuoteLine, 'index'>;
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;
type Writable<T> = { -readonly [K in keyof T]: T[K] };

interface LineOutcome {
  readonly body: LineBody;
  readonly metal?: Metal;
  readonly meltMinor: number;
  readonly payoutMinor: number;
  readonly fineOzt?: { readonly n: Exact; readonly d: Exact; readonly dKey: string };
}

const finenessDisplay = new Map<string, string>();

function displayFineness(text: string | undefined, r: Ratio | undefined): string | null {
  if (text === undefined || r === undefined) return null;
  let shown = finenessDisplay.get(text);
  if (shown === undefined) {
    shown = toTrimmed(ratioValue(r), FINENESS_PLACES);
    if (finenessDisplay.size > 10_000) finenessDisplay.clear();
    finenessDisplay.set(text, shown);
  }
  return shown;
}

const denominatorKeys = new WeakMap<Exact, string>();

function denominatorKey(d: Exact): string {
  let key = denominatorKeys.get(d);
  if (key === undefined) {
    key = exactToString(d);
    denominatorKeys.set(d, key);
  }
  return key;
}

function priceLine(line: ValidQuoteLine, index: number, ctx: QuoteContext): LineOutcome {
  const { quote, currency, locale, scale } = ctx;
  const r = resolveLine(line, index, quote);
  if (r.status === 'invalid') throw new QuoteValidationError([{ path: `lines.${index}`, message: 'line did not pass validation' }]);
  // Bodies are built key by key, in the output's order, and frozen part by part as built: a spread or a
  // generic deep freeze of each line cost more than its arithmetic. The cache freezes the body itself.
  if (r.status !== 'priced') {
    const unpriced = { kind: line.kind } as Writable<Omit<UnpricedLine, 'index'>>;
    if (line.description !== undefined) unpriced.description = line.description;
    unpriced.status = r.status;
    unpriced.mark = deepFreeze(r.reading);
    unpriced.message = r.message;
    unpriced.grossWeightGrams = grams(r.weights?.grossGrams);
    unpriced.netWeightGrams = grams(r.weights?.netGrams);
    return { body: unpriced, meltMinor: 0, payoutMinor: 0 };
  }
  const spot = quote.spot[r.metal];
  const spotMinor = ctx.spotMinor.get(r.metal);
  if (spot === undefined || spotMinor === undefined) {
    throw new QuoteValidationError([{ path: `spot.${r.metal}`, message: `a ${r.metal} spot price per troy ounce is needed` }]);
  }
  // melt = fine ozt x spot; fine ozt = n/d exactly; one rounding per amount (ROUNDING_RULE).
  const { n, d } = r.fineOzt;
  const meltExactN = mulExact(n, spotMinor);
  const meltMinor = roundToMinorHalfUp(meltExactN, d);
  const rule = r.rule;
  const payoutMinor =
    rule.basis === 'percent-of-melt'
      ? roundToMinorHalfUp(mulExact(meltExactN, parseRatio(rule.percent).n), mulExact(d, EXACT_HUNDRED))
      : roundToMinorHalfUp(mulExact(mulExact(n, maxExact(EXACT_ZERO, subExact(exact(spot), exact(rule.amountPerTroyOunce)))), scale), d);
  const marginMinor = meltMinor - payoutMinor;
  const effectivePercentOfMelt = percentOfMinor(payoutMinor, meltMinor);
  const payoutRate: PayoutRate =
    rule.basis === 'percent-of-melt'
      ? { basis: 'percent-of-melt', percent: rule.percent, source: r.ruleSource, rateCategory: r.rateCategory, effectivePercentOfMelt }
      : { basis: 'under-spot', amountUnderSpotPerTroyOunce: rule.amountPerTroyOunce, source: r.ruleSource, rateCategory: r.rateCategory, effectivePercentOfMelt };
  const w = r.weights;
  const body = { kind: line.kind } as Writable<Omit<PricedLine, 'index'>>;
  if (line.description !== undefined) body.description = line.description;
  body.status = 'priced';
  body.metal = r.metal;
  if (r.reading) body.mark = deepFreeze(r.reading);
  body.markedFineness = displayFineness(r.markedExact, r.marked);
  body.markedFinenessExact = r.markedExact ?? null;
  body.paidOnFineness = displayFineness(r.paidOnExact, r.paidOn);
  body.paidOnFinenessExact = r.paidOnExact ?? null;
  body.finenessSource = r.finenessSource;
  body.grossWeightGrams = grams(w?.grossGrams ?? r.grossGramsTotal);
  body.tareGrams = grams(w?.tareGrams);
  body.deductionsGrams = grams(w?.deductionsGrams);
  body.netWeightGrams = grams(w?.netGrams);
  body.fineWeightGrams = r.fineGrams
    ? exactRatioToFixedHalfUp(r.fineGrams.n, r.fineGrams.d, GRAMS_PLACES)
    : exactRatioToFixedHalfUp(mulExact(n, TROY_OUNCE_GRAMS_EXACT), d, GRAMS_PLACES);
  body.fineWeightTroyOunces = exactRatioToFixedHalfUp(n, d, TROY_OUNCE_PLACES);
  body.spotPerTroyOunce = spot;
  body.meltValue = Object.freeze(moneyOf(meltMinor, currency, locale));
  body.payoutRate = Object.freeze(payoutRate);
  body.payout = Object.freeze(moneyOf(payoutMinor, currency, locale));
  body.margin = Object.freeze(moneyOf(marginMinor, currency, locale));
  body.marginPercentOfMelt = percentOfMinor(marginMinor, meltMinor);
  if (line.kind === 'coin') body.coin = Object.freeze({ coinType: line.coinType, count: line.count, label: coinSpec(line.coinType)!.label });
  if (line.kind === 'face-value') {
    const cls = faceValueClass(line.coinClass)!;
    const basis = faceValueBasisFor(cls, line.basis);
    body.faceValue = Object.freeze({
      coinClass: line.coinClass,
      faceValue: line.faceValue,
      basis,
      basisLabel: FACE_VALUE_BASIS_LABELS[basis],
      troyOuncesPerDollarFace: cls.troyOuncesPerDollarFace[basis]!,
      label: cls.label,
    });
  }
  body.notes = Object.freeze(r.notes);
  return { body, metal: r.metal, meltMinor, payoutMinor, fineOzt: { n, d, dKey: denominatorKey(d) } };
}

/**
 * Priced lines keyed by everything of the ticket that can change a price, then by the line's content.
 * The counter re-prices on each keystroke, when all lines but one are unchanged.
 */
const lineCache = new Map<string, Map<string, LineOutcome>>();
let lineCacheSize = 0;
const LINE_CACHE_LIMIT = 4000;

export function clearPricingCaches(): void {
  lineCache.clear();
  lineCacheSize = 0;
  finenessDisplay.clear();
}

function ticketLineCache(ticketKey: string): Map<string, LineOutcome> {
  let found = lineCache.get(ticketKey);
  if (found === undefined) {
    found = new Map();
    lineCache.set(ticketKey, found);
  }
  return found;
}

function deepFreeze<T>(value: T): T {
  if (typeof value === 'object' && value !== null && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const key in value) deepFreeze(value[key]);
  }
  return value;
}

/**
 * Prices input that already passed quoteInputSchema. No zod in here: the counter calls it on every
 * keystroke after validating once. Output is plain JSON (strings and integer minor units) and frozen.
 */
export function priceQuoteUnchecked(quote: ValidQuoteInput): PricedQuote {
  const currency = quote.currency;
  const locale = quote.locale;
  const scale = exactPowerOfTen(currencyExponent(currency));
  const spotMinor = new Map<Metal, Exact>();
  const spotShown: Partial<Record<Metal, SpotShown>> = {};
  for (const metal of METALS) {
    const s = quote.spot[metal];
    if (s === undefined) continue;
    const spot = exact(s);
    spotMinor.set(metal, mulExact(spot, scale));
    spotShown[metal] = {
      perTroyOunce: s,
      perGram: exactRatioToFixedHalfUp(spot, TROY_OUNCE_GRAMS_EXACT, 4),
      perPennyweight: exactRatioToFixedHalfUp(mulExact(spot, PENNYWEIGHT_GRAMS_EXACT), TROY_OUNCE_GRAMS_EXACT, 4),
    };
  }
  const ctx: QuoteContext = { quote, currency, locale, scale, spotMinor };
  const ticketKey = JSON.stringify([currency, locale, quote.spot, quote.rates ?? null, quote.rateOverride ?? null, quote.assumedFineness]);

  const lines: QuoteLine[] = [];
  const meltAll: number[] = [];
  const payoutAll: number[] = [];
  // Fine ounces per metal kept exact: numerators summed per distinct denominator.
  const byMetal = new Map<Metal, { fineOztByDenominator: Map<string, { n: Exact; d: Exact }>; melt: number[]; payout: number[] }>();

  let cached = ticketLineCache(ticketKey);
  quote.lines.forEach((line, index) => {
    const key = JSON.stringify(line);
    let outcome = cached.get(key);
    if (outcome === undefined) {
      outcome = priceLine(line, index, ctx);
      Object.freeze(outcome.body);
      if (lineCacheSize >= LINE_CACHE_LIMIT) {
        lineCache.clear();
        lineCacheSize = 0;
        cached = ticketLineCache(ticketKey);
      }
      cached.set(key, outcome);
      lineCacheSize++;
    }
    lines.push({ index, ...outcome.body } as QuoteLine);
    if (outcome.metal === undefined || outcome.fineOzt === undefined) return;
    meltAll.push(outcome.meltMinor);
    payoutAll.push(outcome.payoutMinor);
    let metalTotal = byMetal.get(outcome.metal);
    if (!metalTotal) {
      metalTotal = { fineOztByDenominator: new Map(), melt: [], payout: [] };
      byMetal.set(outcome.metal, metalTotal);
    }
    const { n, d, dKey } = outcome.fineOzt;
    const group = metalTotal.fineOztByDenominator.get(dKey);
    if (group) group.n = addExact(group.n, n);
    else metalTotal.fineOztByDenominator.set(dKey, { n, d });
    metalTotal.melt.push(outcome.meltMinor);
    metalTotal.payout.push(outcome.payoutMinor);
  });

  const meltTotal = sumMinor(meltAll);
  const payoutTotal = sumMinor(payoutAll);
  const marginTotal = meltTotal - payoutTotal;
  const metalTotals: MetalTotal[] = [];
  for (const metal of METALS) {
    const t = byMetal.get(metal);
    if (!t) continue;
    const melt = sumMinor(t.melt);
    const payout = sumMinor(t.payout);
    let fineOzt = ZERO;
    for (const g of t.fineOztByDenominator.values()) fineOzt = fineOzt.plus(isOneExact(g.d) ? exactToDec(g.n) : exactToDec(g.n).div(exactToDec(g.d)));
    metalTotals.push({
      metal,
      fineWeightGrams: toFixedHalfUp(fineOzt.mul(TROY_OUNCE_GRAMS), GRAMS_PLACES),
      fineWeightTroyOunces: toFixedHalfUp(fineOzt, TROY_OUNCE_PLACES),
      meltValue: moneyOf(melt, currency, locale),
      payout: moneyOf(payout, currency, locale),
      margin: moneyOf(melt - payout, currency, locale),
    });
  }
  const pricedLineCount = meltAll.length;
  return {
    currency,
    roundingRule: ROUNDING_RULE,
    spot: spotShown,
    lines,
    totals: {
      meltValue: moneyOf(meltTotal, currency, locale),
      payout: moneyOf(payoutTotal, currency, locale),
      margin: moneyOf(marginTotal, currency, locale),
      marginPercentOfMelt: percentOfMinor(marginTotal, meltTotal),
      pricedLineCount,
      unpricedLineCount: lines.length - pricedLineCount,
      byMetal: metalTotals,
    },
  };
}

function toIssues(error: { issues: { path: (string | number)[]; message: string }[] }): QuoteIssue[] {
  return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

/** Validates with quoteInputSchema and prices; throws QuoteValidationError listing field paths. */
export function priceQuote(input: unknown): PricedQuote {
  const parsed = quoteInputSchema.safeParse(input);
  if (!parsed.success) throw new QuoteValidationError(toIssues(parsed.error));
  return priceQuoteUnchecked(parsed.data);
}

/** Same as priceQuote, returning the issues instead of throwing. */
export function safePriceQuote(input: unknown): QuoteResult {
  const parsed = quoteInputSchema.safeParse(input);
  if (!parsed.success) return { ok: false, error: 'invalid-quote', issues: toIssues(parsed.error) };
  return { ok: true, quote: priceQuoteUnchecked(parsed.data) };
}

/** Validates once (for the counter: validate on change of structure, then price unchecked on each keystroke). */
export function validateQuoteInput(input: unknown): { ok: true; value: ValidQuoteInput } | { ok: false; issues: QuoteIssue[] } {
  const parsed = quoteInputSchema.safeParse(input);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, issues: toIssues(parsed.error) };
}
