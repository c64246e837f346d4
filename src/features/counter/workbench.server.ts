import type { DbOrTx } from '@/db/client';
import type { SessionUser } from '@/features/auth/users.server';
import { sellerAtCounter } from '@/features/sellers/sellers.server';
import { ID_TYPE_LABELS, maskIdNumber } from '@/features/sellers/sellers';
import { getStoreSettings } from '@/features/settings/settings.server';
import type { Metal } from '@/features/pricing/metals';
import { spotBoard } from './spot.server';
import { drawerExpectedMinor, getTicket, openDrawerFor } from './tickets.server';
import type { CounterLinePayload } from './grading';
import QRCode from 'qrcode';
import { payoutAccountOf } from '@/features/settlement/settlement.server';

/** Everything the ticket screen needs, as plain JSON (dates as ISO strings) so it can hydrate an island. */
export async function workbenchData(db: DbOrTx, user: SessionUser, ticketId: string) {
  const ticket = await getTicket(db, user, ticketId);
  const [settings, board, seller, drawer, payoutAccount] = await Promise.all([
    getStoreSettings(db, ticket.storeId),
    spotBoard(db, ticket.storeId),
    sellerAtCounter(db, ticket.storeId, ticket.sellerId),
    openDrawerFor(db, user.id),
    payoutAccountOf(db, ticket.sellerId),
  ]);
  const linkLive = !!payoutAccount?.onboardingUrl && !payoutAccount.payoutsEnabled && (payoutAccount.onboardingUrlExpiresAt?.getTime() ?? 0) > Date.now();
  const spot: Partial<Record<Metal, { pricePerTroyOunce: string; enteredAt: string; stale: boolean; enteredByName: string | null }>> = {};
  for (const [metal, s] of Object.entries(board.spots)) {
    spot[metal as Metal] = { pricePerTroyOunce: s!.pricePerTroyOunce, enteredAt: s!.enteredAt.toISOString(), stale: s!.stale, enteredByName: s!.enteredByName };
  }
  return {
    role: user.role,
    ticket: {
      id: ticket.id,
      reference: ticket.reference,
      state: ticket.state,
      stateLabel: ticket.stateLabel,
      currency: ticket.currency,
      ticketRaisePoints: ticket.ticketRaisePoints,
      meltValueMinor: ticket.meltValueMinor,
      payoutMinor: ticket.payoutMinor,
      marginMinor: ticket.marginMinor,
      holdUntil: ticket.holdUntil,
      voidReason: ticket.voidReason,
      clerkName: ticket.clerkName,
      lines: ticket.lines.map((l) => ({
        input: l.input as CounterLinePayload,
        description: l.description,
        payoutMinor: l.payoutMinor,
        meltValueMinor: l.meltValueMinor,
        pricingProblem: l.pricingProblem,
        tagNumber: l.tagNumber,
      })),
      approvals: ticket.approvals.map((a) => ({ id: a.id, state: a.state, raisePoints: a.raisePoints, note: a.note })),
      payments: ticket.payments.map((p) => ({ id: p.id, kind: p.kind, method: p.method, amountMinor: p.amountMinor, state: p.state, checkNumber: p.checkNumber, failureReason: p.failureReason, lastError: p.lastError })),
    },
    seller: {
      id: seller.seller.id,
      legalName: seller.seller.legalName,
      idSummary: `${ID_TYPE_LABELS[seller.seller.idType] ?? seller.seller.idType} ${maskIdNumber(seller.seller.idNumber)}, ${seller.seller.idIssuingRegion}, expires ${seller.seller.idExpiry}`,
      doNotBuy: seller.seller.doNotBuy,
      problems: seller.problems,
      recentTickets: seller.recentTickets.map((t) => ({ ...t, createdAt: t.createdAt.toISOString() })),
      email: seller.seller.email,
      payoutAccount: {
        onboarded: !!payoutAccount?.payoutsEnabled,
        destination: payoutAccount?.externalAccountLast4 ? `${payoutAccount.externalAccountLabel ?? 'Account'} ending ${payoutAccount.externalAccountLast4}` : null,
        instantAvailable: !!payoutAccount?.instantAvailable,
        onboardingUrl: linkLive ? payoutAccount!.onboardingUrl : null,
        onboardingQrSvg: linkLive ? await QRCode.toString(payoutAccount!.onboardingUrl!, { type: 'svg', margin: 1, width: 220 }) : null,
      },
    },
    spot,
    staleAfterMinutes: board.staleAfterMinutes,
    settings: {
      rates: settings['pricing.rates'],
      assumedFineness: settings['pricing.assumed_fineness'],
      clerkRaiseLimitPoints: settings['rates.clerk_raise_limit_points'],
      cashLimit: settings['cash.limit_per_ticket'],
      ownershipStatement: settings['counter.ownership_statement'],
      holdDays: settings['hold.period_days'],
    },
    drawer: drawer ? { id: drawer.id, balanceMinor: await drawerExpectedMinor(db, drawer.id, drawer.floatMinor) } : null,
  };
}
export type WorkbenchData = Awaited<ReturnType<typeof workbenchData>>;
