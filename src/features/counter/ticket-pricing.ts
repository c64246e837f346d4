import { safePriceQuote, type PricedLine, type QuoteLine } from '@/features/pricing/pricing';
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

/** part / melt x 100 to two places, half-up, exactly; null when there is no melt value. */
export function percentOfMelt(partMinor: number, meltMinor: number): string | null {
  return meltMinor === 0 ? null : ratioToFixedHalfUp(new Dec(partMinor).mul(100), new Dec(meltMinor), 2);
}
