import { priceQuoteUnchecked, safePriceQuote, validateQuoteInput, type PricedLine, type QuoteLine } from '@/features/pricing/pricing';
import type { ValidQuoteLine } from '@/features/pricing/pricing.schema';
import type { Metal } from '@/features/pricing/metals';
import type { CurrencyCode } from '@/features/pricing/money';
import type { RateRule } from '@/features/pricing/rates';
import { Dec, ratioToFixedHalfUp } from '@/features/pricing/decimal';
import { raiseRule } from './counter';

/**
 * Prices a ticket's lines with the shared engine, one line at a time so that a line the engine
 * cannot price yet (no spot for its metal, a mark that needs a test) is kept with its reason
 * instead of failing the whole ticket. Each line is rounded once, so pricing lines one by one
 * gives the same figures as pricing them together, and the ticket total is the sum of its lines.
 */
export interface TicketPricingInput {
  currency: CurrencyCode;
  spot: Partial<Record<Metal, string>>;
  rates: unknown;
  assumedFineness: unknown;
  ticketRaisePoints: string;
  lines: { item: ValidQuoteLine | Record<string, unknown>; raisePoints: string }[];
}

export interface PricedTicketLine {
  result: QuoteLine | null;
  /** Why the line carries no price: a missing spot, a mark that needs a test, plated goods. */
  problem: string | null;
  /** Field errors in the line itself; the caller answers 422 with them. */
  inputIssues: { path: string; message: string }[];
  raiseError: string | null;
}

export interface PricedTicket {
  lines: PricedTicketLine[];
  meltValueMinor: number;
  payoutMinor: number;
  marginMinor: number;
  metalsUsed: Metal[];
  /** The largest raise asked for on any line, ticket raise included. */
  maxRaisePoints: string;
}

export function priceTicket(input: TicketPricingInput): PricedTicket {
  return priceTicketAtOnce(input) ?? priceTicketLineByLine(input);
}

/**
 * The usual case, and the fast one the island runs on each keystroke: every line is valid and
 * has its spot, so the quote is validated once and priced once (raised lines priced again with
 * their raised rule). Returns null when any line needs the line-by-line path to say what is wrong.
 */
function priceTicketAtOnce(input: TicketPricingInput): PricedTicket | null {
  const items = input.lines.map((l) => {
    const { rateOverride: _ignored, ...item } = l.item as Record<string, unknown>;
    return item;
  });
  const valid = validateQuoteInput({ currency: input.currency, spot: input.spot, rates: input.rates, assumedFineness: input.assumedFineness, lines: items });
  if (!valid.ok) return null;
  const first = priceQuoteUnchecked(valid.value);
  const raises = input.lines.map((l) => new Dec(l.raisePoints || '0').plus(input.ticketRaisePoints || '0'));
  const raiseErrors: (string | null)[] = input.lines.map(() => null);
  let results: readonly QuoteLine[] = first.lines;
  if (raises.some((r) => !r.isZero())) {
    const raisedLines = valid.value.lines.map((line, i) => {
      const r = first.lines[i]!;
      if (raises[i]!.isZero() || r.status !== 'priced') return line;
      const raised = raiseRule(ruleOf(r), raises[i]!.toFixed());
      if ('error' in raised) {
        raiseErrors[i] = raised.error;
        return line;
      }
      return { ...line, rateOverride: raised };
    });
    results = priceQuoteUnchecked({ ...valid.value, lines: raisedLines }).lines;
  }
  let meltValueMinor = 0;
  let payoutMinor = 0;
  let maxRaise = new Dec(0);
  const metalsUsed = new Set<Metal>();
  const lines: PricedTicketLine[] = results.map((result, i) => {
    if (result.status !== 'priced') return { result, problem: result.message, inputIssues: [], raiseError: null };
    metalsUsed.add(result.metal);
    if (raises[i]!.gt(maxRaise)) maxRaise = raises[i]!;
    meltValueMinor += result.meltValue.amountMinor;
    payoutMinor += result.payout.amountMinor;
    return { result, problem: null, inputIssues: [], raiseError: raiseErrors[i]! };
  });
  return { lines, meltValueMinor, payoutMinor, marginMinor: meltValueMinor - payoutMinor, metalsUsed: [...metalsUsed], maxRaisePoints: maxRaise.toFixed() };
}

/** One line at a time, so a line that cannot be priced (no spot, bad input) says why without stopping the others. */
function priceTicketLineByLine(input: TicketPricingInput): PricedTicket {
  const lines: PricedTicketLine[] = [];
  let meltValueMinor = 0;
  let payoutMinor = 0;
  const metalsUsed = new Set<Metal>();
  let maxRaise = new Dec(0);

  for (const line of input.lines) {
    const base = { currency: input.currency, spot: input.spot, rates: input.rates, assumedFineness: input.assumedFineness };
    const { rateOverride: _ignored, ...item } = line.item as Record<string, unknown>;
    const first = safePriceQuote({ ...base, lines: [item] });
    if (!first.ok) {
      const spotIssues = first.issues.filter((i) => i.path.startsWith('spot'));
      const lineIssues = first.issues.filter((i) => !i.path.startsWith('spot'));
      const missingMetal = spotIssues.map((i) => i.path.split('.')[1]).find(Boolean) as Metal | undefined;
      if (missingMetal) metalsUsed.add(missingMetal);
      lines.push({
        result: null,
        problem: spotIssues.length ? `Enter today's ${missingMetal ?? ''} spot price to price this line`.replace('  ', ' ') : null,
        inputIssues: lineIssues.map((i) => ({ path: i.path.replace(/^lines\.0\.?/, ''), message: i.message })),
        raiseError: null,
      });
      continue;
    }
    let result = first.quote.lines[0]!;
    if (result.status !== 'priced') {
      lines.push({ result, problem: result.message, inputIssues: [], raiseError: null });
      continue;
    }
    metalsUsed.add(result.metal);
    const raisePoints = new Dec(line.raisePoints || '0').plus(input.ticketRaisePoints || '0');
    let raiseError: string | null = null;
    if (!raisePoints.isZero()) {
      if (raisePoints.gt(maxRaise)) maxRaise = raisePoints;
      const baseRule = ruleOf(result);
      const raised = raiseRule(baseRule, raisePoints.toFixed());
      if ('error' in raised) raiseError = raised.error;
      else {
        const second = safePriceQuote({ ...base, lines: [{ ...item, rateOverride: raised }] });
        if (second.ok) result = second.quote.lines[0]!;
      }
    }
    const priced = result as PricedLine;
    meltValueMinor += priced.meltValue.amountMinor;
    payoutMinor += priced.payout.amountMinor;
    lines.push({ result: priced, problem: null, inputIssues: [], raiseError });
  }
  return {
    lines,
    meltValueMinor,
    payoutMinor,
    marginMinor: meltValueMinor - payoutMinor,
    metalsUsed: [...metalsUsed],
    maxRaisePoints: maxRaise.toFixed(),
  };
}

function ruleOf(line: PricedLine): RateRule {
  const r = line.payoutRate;
  return r.basis === 'percent-of-melt'
    ? { basis: 'percent-of-melt', percent: r.percent! }
    : { basis: 'under-spot', amountPerTroyOunce: r.amountUnderSpotPerTroyOunce! };
}

/** How a line's rate reads on a receipt: "80% of melt" or "2.50 under spot per ozt". */
export function rateLabel(line: PricedLine): string {
  const r = line.payoutRate;
  return r.basis === 'percent-of-melt' ? `${r.percent}% of melt` : `${r.amountUnderSpotPerTroyOunce} under spot per ozt`;
}

/** How a face-value line was counted, for the line and the receipt: "0.2958 ozt per 1.00 face, mint weight". */
export function faceValueBasisLine(line: PricedLine | null | undefined): string | null {
  const f = line?.faceValue;
  return f ? `${f.troyOuncesPerDollarFace} ozt per 1.00 face, ${f.basisLabel}` : null;
}

/** part / melt x 100 to two places, half-up, exactly; null when there is no melt value. */
export function percentOfMelt(partMinor: number, meltMinor: number): string | null {
  return meltMinor === 0 ? null : ratioToFixedHalfUp(new Dec(partMinor).mul(100), new Dec(meltMinor), 2);
}

/**
 * The offer's two shares of melt value, as every screen, receipt and e-mail states them: the payout
 * share to two places, half-up, and the margin share as 100 minus it, so the pair always adds to 100.
 */
export function offerPercentages(payoutMinor: number, meltMinor: number): { payout: string; margin: string } | null {
  const payout = percentOfMelt(payoutMinor, meltMinor);
  if (payout === null) return null;
  return { payout, margin: new Dec(100).minus(payout).toFixed(2) };
}
