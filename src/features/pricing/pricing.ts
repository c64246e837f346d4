import { coinSpec, faceValueClass } from './coins';
import { Dec, HUNDRED, ZERO, parseRatio, ratioToFixedHalfUp, ratioValue, roundToMinorHalfUp, toFixedHalfUp, toTrimmed, type Ratio } from './decimal';
import type { MarkReading } from './marks';
import { METALS, type Metal } from './metals';
import { minorPerMajor, moneyOf, sumMinor, type CurrencyCode, type Money } from './money';
import { quoteInputSchema, type ValidQuoteInput, type ValidQuoteLine } from './pricing.schema';
import type { RateCategory } from './rates';
import { resolveLine, type FinenessSource, type RateSource } from './resolve';
import { GRAMS_PER_PENNYWEIGHT, TROY_OUNCE_GRAMS } from './units';

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
  readonly faceValue?: { readonly coinClass: string; readonly faceValue: string; readonly basis: string; readonly label: string };
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

function percentOf(part: number, whole: number): string | null {
  return whole === 0 ? null : ratioToFixedHalfUp(new Dec(part).mul(HUNDRED), new Dec(whole), 2);
}

function grams(d: Dec | undefined): string | null {
  return d === undefined ? null : toFixedHalfUp(d, GRAMS_PLACES);
}


interface QuoteContext {
  readonly quote: ValidQuoteInput;
  readonly currency: CurrencyCode;
  readonly locale: string;
  readonly scale: Dec;
  readonly spotMinor: ReadonlyMap<Metal, Dec>;
}

type LineBody = DistributiveOmit<QuoteLine, 'index'>;
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

interface LineOutcome {
  readonly body: LineBody;
  readonly metal?: Metal;
  readonly meltMinor: number;
  readonly payoutMinor: number;
  readonly fineOzt?: { readonly n: Dec; readonly d: Dec; readonly dKey: string };
}

const finenessDisplay = new Map<string, string>();

function displayFineness(exact: string | undefined, r: Ratio | undefined): string | null {
  if (exact === undefined || r === undefined) return null;
  let shown = finenessDisplay.get(exact);
  if (shown === undefined) {
    shown = toTrimmed(ratioValue(r), FINENESS_PLACES);
    if (finenessDisplay.size > 10_000) finenessDisplay.clear();
    finenessDisplay.set(exact, shown);
  }
  return shown;
}

function priceLine(line: ValidQuoteLine, index: number, ctx: QuoteContext): LineOutcome {
  const { quote, currency, locale, scale } = ctx;
  const r = resolveLine(line, index, quote);
  const base = line.description !== undefined ? { kind: line.kind, description: line.description } : { kind: line.kind };
  if (r.status === 'invalid') throw new QuoteValidationError([{ path: `lines.${index}`, message: 'line did not pass validation' }]);
  if (r.status !== 'priced') {
    return {
      body: {
        ...base,
        status: r.status,
        mark: r.reading,
        message: r.message,
        grossWeightGrams: grams(r.weights?.grossGrams),
        netWeightGrams: grams(r.weights?.netGrams),
      },
      meltMinor: 0,
      payoutMinor: 0,
    };
  }
  const spot = quote.spot[r.metal];
  const spotMinor = ctx.spotMinor.get(r.metal);
  if (spot === undefined || spotMinor === undefined) {
    throw new QuoteValidationError([{ path: `spot.${r.metal}`, message: `a ${r.metal} spot price per troy ounce is needed` }]);
  }
  // melt = fine ozt x spot; fine ozt = n/d exactly; one rounding per amount (ROUNDING_RULE).
  const { n, d } = r.fineOzt;
  const meltExactN = n.mul(spotMinor);
  const meltMinor = roundToMinorHalfUp(meltExactN, d);
  let payoutMinor: number;
  let payoutRate: Omit<PayoutRate, 'effectivePercentOfMelt'>;
  if (r.rule.basis === 'percent-of-melt') {
    payoutMinor = roundToMinorHalfUp(meltExactN.mul(parseRatio(r.rule.percent).n), d.mul(HUNDRED));
    payoutRate = { basis: 'percent-of-melt', percent: r.rule.percent, source: r.ruleSource, rateCategory: r.rateCategory };
  } else {
    const perOunce = Dec.max(ZERO, new Dec(spot).minus(r.rule.amountPerTroyOunce));
    payoutMinor = roundToMinorHalfUp(n.mul(perOunce).mul(scale), d);
    payoutRate = { basis: 'under-spot', amountUnderSpotPerTroyOunce: r.rule.amountPerTroyOunce, source: r.ruleSource, rateCategory: r.rateCategory };
  }
  const marginMinor = meltMinor - payoutMinor;
  const w = r.weights;
  const body: LineBody = {
    ...base,
    status: 'priced',
    metal: r.metal,
    ...(r.reading ? { mark: r.reading } : {}),
    markedFineness: displayFineness(r.markedExact, r.marked),
    markedFinenessExact: r.markedExact ?? null,
    paidOnFineness: displayFineness(r.paidOnExact, r.paidOn),
    paidOnFinenessExact: r.paidOnExact ?? null,
    finenessSource: r.finenessSource,
    grossWeightGrams: grams(w?.grossGrams ?? r.grossGramsTotal),
    tareGrams: grams(w?.tareGrams),
    deductionsGrams: grams(w?.deductionsGrams),
    netWeightGrams: grams(w?.netGrams),
    fineWeightGrams: r.fineGrams ? ratioToFixedHalfUp(r.fineGrams.n, r.fineGrams.d, GRAMS_PLACES) : ratioToFixedHalfUp(n.mul(TROY_OUNCE_GRAMS), d, GRAMS_PLACES),
    fineWeightTroyOunces: ratioToFixedHalfUp(n, d, TROY_OUNCE_PLACES),
    spotPerTroyOunce: spot,
    meltValue: moneyOf(meltMinor, currency, locale),
    payoutRate: { ...payoutRate, effectivePercentOfMelt: percentOf(payoutMinor, meltMinor) },
    payout: moneyOf(payoutMinor, currency, locale),
    margin: moneyOf(marginMinor, currency, locale),
    marginPercentOfMelt: percentOf(marginMinor, meltMinor),
    ...(line.kind === 'coin' ? { coin: { coinType: line.coinType, count: line.count, label: coinSpec(line.coinType)!.label } } : {}),
    ...(line.kind === 'face-value'
      ? { faceValue: { coinClass: line.coinClass, faceValue: line.faceValue, basis: line.basis, label: faceValueClass(line.coinClass)!.label } }
      : {}),
    notes: r.notes,
  };
  return { body, metal: r.metal, meltMinor, payoutMinor, fineOzt: { n, d, dKey: d.toFixed() } };
}

/**
 * Priced lines keyed by the line's content and everything of the ticket that can change its price.
 * The counter re-prices on each keystroke, when all lines but one are unchanged.
 */
const lineCache = new Map<string, LineOutcome>();
const LINE_CACHE_LIMIT = 4000;

export function clearPricingCaches(): void {
  lineCache.clear();
  finenessDisplay.clear();
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
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
  const scale = minorPerMajor(currency);
  const spotMinor = new Map<Metal, Dec>();
  const spotShown: Partial<Record<Metal, SpotShown>> = {};
  for (const metal of METALS) {
    const s = quote.spot[metal];
    if (s === undefined) continue;
    const spot = new Dec(s);
    spotMinor.set(metal, spot.mul(scale));
    spotShown[metal] = {
      perTroyOunce: s,
      perGram: toFixedHalfUp(spot.div(TROY_OUNCE_GRAMS), 4),
      perPennyweight: toFixedHalfUp(spot.mul(GRAMS_PER_PENNYWEIGHT).div(TROY_OUNCE_GRAMS), 4),
    };
  }
  const ctx: QuoteContext = { quote, currency, locale, scale, spotMinor };
  const ticketKey = JSON.stringify([currency, locale, quote.spot, quote.rates ?? null, quote.rateOverride ?? null, quote.assumedFineness]);

  const lines: QuoteLine[] = [];
  const meltAll: number[] = [];
  const payoutAll: number[] = [];
  // Fine ounces per metal kept exact: numerators summed per distinct denominator.
  const byMetal = new Map<Metal, { fineOztByDenominator: Map<string, { n: Dec; d: Dec }>; melt: number[]; payout: number[] }>();

  quote.lines.forEach((line, index) => {
    const key = `${ticketKey}|${JSON.stringify(line)}`;
    let outcome = lineCache.get(key);
    if (outcome === undefined) {
      outcome = deepFreeze(priceLine(line, index, ctx));
      if (lineCache.size >= LINE_CACHE_LIMIT) lineCache.clear();
      lineCache.set(key, outcome);
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
    if (group) group.n = group.n.plus(n);
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
    for (const g of t.fineOztByDenominator.values()) fineOzt = fineOzt.plus(g.d.eq(1) ? g.n : g.n.div(g.d));
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
      marginPercentOfMelt: percentOf(marginTotal, meltTotal),
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
