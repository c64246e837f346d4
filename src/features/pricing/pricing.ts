import { coinSpec, faceValueClass } from './coins';
import { Dec, HUNDRED, ZERO, parseRatio, ratioToFixedHalfUp, ratioValue, roundToMinorHalfUp, toFixedHalfUp, toTrimmed } from './decimal';
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


/**
 * Prices input that already passed quoteInputSchema. No zod in here: the counter calls it on every
 * keystroke after validating once. Output is plain JSON (strings and integer minor units).
 */
export function priceQuoteUnchecked(quote: ValidQuoteInput): PricedQuote {
  const currency = quote.currency;
  const locale = quote.locale;
  const scale = minorPerMajor(currency);
  const spotScaled = new Map<Metal, Dec>();
  const spotShown: Partial<Record<Metal, SpotShown>> = {};
  for (const metal of METALS) {
    const s = quote.spot[metal];
    if (s === undefined) continue;
    const spot = new Dec(s);
    spotScaled.set(metal, spot.mul(scale));
    spotShown[metal] = {
      perTroyOunce: s,
      perGram: toFixedHalfUp(spot.div(TROY_OUNCE_GRAMS), 4),
      perPennyweight: toFixedHalfUp(spot.mul(GRAMS_PER_PENNYWEIGHT).div(TROY_OUNCE_GRAMS), 4),
    };
  }

  const lines: QuoteLine[] = [];
  const meltAll: number[] = [];
  const payoutAll: number[] = [];
  // Fine ounces per metal kept exact: numerators summed per distinct denominator.
  const byMetal = new Map<Metal, { fineOztByDenominator: Map<string, { n: Dec; d: Dec }>; melt: number[]; payout: number[] }>();

  quote.lines.forEach((line, index) => {
    const r = resolveLine(line, index, quote);
    const base: LineBase = line.description !== undefined ? { index, kind: line.kind, description: line.description } : { index, kind: line.kind };
    if (r.status === 'invalid') throw new QuoteValidationError([{ path: `lines.${index}`, message: 'line did not pass validation' }]);
    if (r.status !== 'priced') {
      lines.push({
        ...base,
        status: r.status,
        mark: r.reading,
        message: r.message,
        grossWeightGrams: grams(r.weights?.grossGrams),
        netWeightGrams: grams(r.weights?.netGrams),
      });
      return;
    }
    const spot = quote.spot[r.metal];
    const spotMinor = spotScaled.get(r.metal);
    if (spot === undefined || spotMinor === undefined) {
      throw new QuoteValidationError([{ path: `spot.${r.metal}`, message: `a ${r.metal} spot price per troy ounce is needed` }]);
    }
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
    meltAll.push(meltMinor);
    payoutAll.push(payoutMinor);
    let metalTotal = byMetal.get(r.metal);
    if (!metalTotal) {
      metalTotal = { fineOztByDenominator: new Map(), melt: [], payout: [] };
      byMetal.set(r.metal, metalTotal);
    }
    const dKey = d.toFixed();
    const group = metalTotal.fineOztByDenominator.get(dKey);
    if (group) group.n = group.n.plus(n);
    else metalTotal.fineOztByDenominator.set(dKey, { n, d });
    metalTotal.melt.push(meltMinor);
    metalTotal.payout.push(payoutMinor);

    const w = r.weights;
    const priced: PricedLine = {
      ...base,
      status: 'priced',
      metal: r.metal,
      ...(r.reading ? { mark: r.reading } : {}),
      markedFineness: r.marked ? toTrimmed(ratioValue(r.marked), FINENESS_PLACES) : null,
      markedFinenessExact: r.markedExact ?? null,
      paidOnFineness: r.paidOn ? toTrimmed(ratioValue(r.paidOn), FINENESS_PLACES) : null,
      paidOnFinenessExact: r.paidOnExact ?? null,
      finenessSource: r.finenessSource,
      grossWeightGrams: grams(w?.grossGrams ?? r.grossGramsTotal),
      tareGrams: grams(w?.tareGrams),
      deductionsGrams: grams(w?.deductionsGrams),
      netWeightGrams: grams(w?.netGrams),
      fineWeightGrams: ratioToFixedHalfUp(n.mul(TROY_OUNCE_GRAMS), d, GRAMS_PLACES),
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
    lines.push(priced);
  });

  const meltTotal = sumMinor(meltAll, currency);
  const payoutTotal = sumMinor(payoutAll, currency);
  const marginTotal = meltTotal - payoutTotal;
  const metalTotals: MetalTotal[] = [];
  for (const metal of METALS) {
    const t = byMetal.get(metal);
    if (!t) continue;
    const melt = sumMinor(t.melt, currency);
    const payout = sumMinor(t.payout, currency);
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
