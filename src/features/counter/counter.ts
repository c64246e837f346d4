import type { TicketState } from '@/db/enums';
import { Dec } from '@/features/pricing/decimal';
import { ageOn } from '@/features/sellers/sellers';
import type { Metal } from '@/features/pricing/metals';
import type { RateRule } from '@/features/pricing/rates';

export type { TicketState };

/** Which state each action moves a ticket from, and to. Anything else is an out-of-order call (409). */
export const TICKET_TRANSITIONS = {
  edit: { from: ['draft', 'quoted'], to: 'draft' },
  quote: { from: ['draft'], to: 'quoted' },
  accept: { from: ['quoted'], to: 'accepted' },
  decline: { from: ['draft', 'quoted'], to: 'declined' },
  pay: { from: ['accepted'], to: 'paid' },
  void: { from: ['draft', 'quoted', 'accepted', 'declined', 'paid'], to: 'voided' },
} as const satisfies Record<string, { from: readonly TicketState[]; to: TicketState }>;
export type TicketAction = keyof typeof TICKET_TRANSITIONS;

export function canTransition(state: TicketState, action: TicketAction): boolean {
  return (TICKET_TRANSITIONS[action].from as readonly TicketState[]).includes(state);
}

export const TICKET_STATE_LABELS: Record<TicketState, string> = {
  draft: 'Grading',
  quoted: 'Offer shown',
  accepted: 'Accepted, awaiting payment',
  declined: 'Declined by seller',
  paid: 'Paid',
  voided: 'Voided',
};

/** A ticket's readable number: the store code and a zero-padded sequence, e.g. HBR-000042. */
export function ticketReference(storeCode: string, number: number): string {
  return `${storeCode}-${String(number).padStart(6, '0')}`;
}

/** A hold-bin tag: the ticket reference and the line's position, e.g. HBR-000042-03. */
export function tagNumber(storeCode: string, ticketNumber: number, position: number): string {
  return `${ticketReference(storeCode, ticketNumber)}-${String(position).padStart(2, '0')}`;
}

/** The calendar day in a time zone, as YYYY-MM-DD. */
export function dayInZone(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)!.value;
  return `${get('year')}-${get('month')}-${get('day')}`;
}

/** The release day of a held item: the store's calendar day of purchase plus the hold period. */
export function holdUntil(paidAt: Date, holdDays: number, timeZone: string): string {
  const [y, m, d] = dayInZone(paidAt, timeZone).split('-').map(Number) as [number, number, number];
  const release = new Date(Date.UTC(y, m - 1, d + holdDays));
  return release.toISOString().slice(0, 10);
}

export interface SpotEntry {
  id: string;
  metal: Metal;
  pricePerTroyOunce: string;
  enteredAt: Date;
  enteredByName: string | null;
}

export function isSpotStale(entry: Pick<SpotEntry, 'enteredAt'>, staleAfterMinutes: number, now: Date): boolean {
  return now.getTime() - entry.enteredAt.getTime() > staleAfterMinutes * 60_000;
}

/** The metals among a ticket's lines whose spot is missing or stale: a quote cannot be given on them. */
export function staleSpotMetals(
  metalsUsed: Iterable<Metal>,
  spots: Partial<Record<Metal, SpotEntry>>,
  staleAfterMinutes: number,
  now: Date,
): Metal[] {
  const out: Metal[] = [];
  for (const metal of new Set(metalsUsed)) {
    const spot = spots[metal];
    if (!spot || isSpotStale(spot, staleAfterMinutes, now)) out.push(metal);
  }
  return out;
}

/**
 * A raise adds percentage points of melt to a percent-of-melt rule, never past 100%.
 * Under-spot rules are raised by lowering the amount under spot: not supported by points, so refused.
 */
export function raiseRule(base: RateRule, raisePoints: string): RateRule | { error: string } {
  const points = new Dec(raisePoints);
  if (points.isZero()) return base;
  if (base.basis !== 'percent-of-melt') return { error: 'a rate paid as an amount under spot cannot be raised by points' };
  const raised = Dec.min(new Dec(base.percent).plus(points), 100);
  return { basis: 'percent-of-melt', percent: raised.toFixed() };
}

/** Whether a raise needs a manager: clerks may raise up to the store's limit, managers and admins without one. */
export function raiseNeedsApproval(role: string, raisePoints: string, clerkLimitPoints: string): boolean {
  if (role === 'manager' || role === 'admin') return false;
  return new Dec(raisePoints).gt(clerkLimitPoints);
}

/** Problems that stop a purchase from a seller, from the store's rules. Local law decides what these rules are. */
export interface SellerRules {
  minimumAgeYears: number;
  expiredIdBlocks: boolean;
  acceptedIdTypes: readonly string[];
}

export interface SellerFacts {
  dateOfBirth: string;
  idType: string;
  idExpiry: string;
  doNotBuy: boolean;
  doNotBuyReason: string | null;
}

export type SellerProblem =
  | { code: 'under-age'; message: string }
  | { code: 'id-expired'; message: string }
  | { code: 'id-type-not-accepted'; message: string }
  | { code: 'do-not-buy'; message: string };

export function sellerProblems(seller: SellerFacts, rules: SellerRules, today: string): SellerProblem[] {
  const problems: SellerProblem[] = [];
  const age = ageOn(seller.dateOfBirth, today);
  if (age < rules.minimumAgeYears) {
    problems.push({ code: 'under-age', message: `The seller is ${age}; this store buys only from sellers aged ${rules.minimumAgeYears} or over.` });
  }
  if (rules.expiredIdBlocks && seller.idExpiry < today) {
    problems.push({ code: 'id-expired', message: `The seller's ID expired on ${seller.idExpiry}; this store does not accept an expired ID.` });
  }
  if (!rules.acceptedIdTypes.includes(seller.idType)) {
    problems.push({ code: 'id-type-not-accepted', message: `This store does not accept ${seller.idType} as identification.` });
  }
  if (seller.doNotBuy) {
    problems.push({ code: 'do-not-buy', message: `The seller is flagged do not buy${seller.doNotBuyReason ? `: ${seller.doNotBuyReason}` : ''}. A manager must override, with a reason.` });
  }
  return problems;
}

/** Cash above the store's per-ticket limit is refused; the limit is a decimal amount in the store currency. */
export function cashWithinLimit(amountMinor: number, limitDecimal: string, minorPerMajor: number): boolean {
  return new Dec(amountMinor).lte(new Dec(limitDecimal).mul(minorPerMajor));
}

export const TEST_METHOD_LABELS = {
  none: 'Not tested (marked)',
  acid: 'Acid test',
  electronic: 'Electronic tester',
  xrf: 'XRF analyser',
  'specific-gravity': 'Specific gravity',
  magnet: 'Magnet',
} as const;

export const ACID_TEST_CAUTIONS = [
  'Testing acids (nitric acid and its mixtures) burn skin and eyes and give off toxic fumes.',
  'Wear eye protection and acid-resistant gloves; work with ventilation.',
  'Store acids apart from other chemicals, capped and labelled; keep a neutraliser and water at hand.',
  "Follow the kit maker's instructions and local rules; they govern over this reminder.",
] as const;

/** A stored spot ("2400.0000") as people write it: at least two decimals, no trailing zeros beyond. */
export function displaySpot(pricePerTroyOunce: string): string {
  return pricePerTroyOunce.includes('.') ? pricePerTroyOunce.replace(/(\.\d\d\d*?)0+$/, '$1') : `${pricePerTroyOunce}.00`;
}
