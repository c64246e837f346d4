import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { paymentExceptions, payments, tickets } from '@/db/schema';
import { voidTicket } from '@/features/counter/tickets.server';
import { paymentProvider } from '@/features/settlement/provider.server';
import { payElectronically, refreshPayoutAccount, startOnboarding } from '@/features/settlement/settlement.server';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { acceptedTicket } from '../support/tickets';
import { waitFor as waitForBounded } from '../support/wait';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();
const FAKE = `http://127.0.0.1:${process.env.STRIPE_API_PORT ?? process.env.FAKE_PAYMENTS_PORT}`;
const waitFor = <T,>(what: string, fn: () => Promise<T | null | undefined | false>) => waitForBounded(what, fn, { timeoutMs: 30_000, everyMs: 200 });
const fault = (body: unknown) => fetch(`${FAKE}/_fake/faults`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

describe('electronic payouts that need a manager, on the review page in real chromium', () => {
  it('shows a payout completed on a voided ticket and a reversal not yet confirmed, and the manager settles both', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const { url } = await startOnboarding(db, world.clerk, world.sellerId);
    await fetch(url, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ method: 'card', card_number: '4000056655665556', card_exp: '12/30', card_name: 'Pat Example' }),
      redirect: 'manual',
    });
    await waitFor('the account to be onboarded', async () => (await refreshPayoutAccount(db, world.sellerId))?.payoutsEnabled);

    // A payout whose confirmation arrives after its ticket was voided behind its back.
    const late = await acceptedTicket(db, world);
    expect((await fault({ next: 'delay-webhook', count: 10, delayMs: 3000 })).status).toBe(200);
    await payElectronically(db, world.clerk, late.id);
    await db.update(tickets).set({ state: 'voided', voidedAt: new Date(), voidedBy: world.manager.id, voidReason: 'voided by hand in the database' }).where(eq(tickets.id, late.id));
    await waitFor('the exception to be raised', async () => (await db.select().from(paymentExceptions).where(eq(paymentExceptions.ticketId, late.id))).length > 0);

    // A paid electronic ticket whose transfer was already taken back in the provider's own dashboard:
    // Cupel's reversal is refused, so it waits for a manager rather than counting money returned twice.
    const paidTicket = await acceptedTicket(db, world);
    const sent = await payElectronically(db, world.clerk, paidTicket.id);
    await waitFor('the second ticket to be paid', async () => (await db.select().from(tickets).where(eq(tickets.id, paidTicket.id)))[0]?.state === 'paid');
    await paymentProvider().transfers.createReversal(sent!.providerTransferId!, {}, { idempotencyKey: `dashboard-${sent!.id}` });
    const voided = await voidTicket(db, world.manager, paidTicket.id, 'items reported stolen');
    expect(voided.payments.find((p) => p.kind === 'reversal')).toMatchObject({ state: 'pending', nextSendAt: null, lastError: expect.stringMatching(/left to reverse/) });

    const page = await newPage();
    await signInThroughForm(page, world.manager.email, FACTORY_PASSWORD);
    await page.waitForURL('**/review');
    await islandsReady(page);
    const section = page.getByTestId('payout-attention');
    await expect.poll(() => section.getByTestId('payout-exception').count()).toBe(1);
    await expect.poll(() => section.getByTestId('pending-reversal').count()).toBe(1);
    expect(await section.getByTestId('payout-exception').textContent()).toMatch(/voided, not accepted/);
    expect(await section.getByTestId('pending-reversal').textContent()).toMatch(/not yet returned/);
    await section.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/review-payout-attention.png`, fullPage: true });

    // A note is required: the answer names the field.
    const exception = section.getByTestId('payout-exception');
    await exception.getByRole('button', { name: 'Money came back another way' }).click();
    await expect.poll(() => section.getByRole('status').textContent()).toMatch(/note/);
    await exception.getByLabel('What was done (required)').fill('Seller told; taking the transfer back');
    await exception.getByRole('button', { name: 'Take it back through the provider' }).click();
    await expect.poll(() => section.getByTestId('payout-exception').count()).toBe(0);

    const reversal = section.getByTestId('pending-reversal');
    expect(await reversal.textContent()).toMatch(/Waiting for a manager/);
    await reversal.getByRole('button', { name: 'Ask the provider again' }).click();
    await expect.poll(() => section.getByRole('status').textContent()).toMatch(/has not confirmed yet/);
    await reversal.getByLabel('How the money came back (for a recovery)').fill("Reversed in the provider's dashboard before the void");
    await reversal.getByRole('button', { name: 'Record money recovered' }).click();
    await expect.poll(() => section.getByTestId('pending-reversal').count()).toBe(0);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/review-payout-attention-settled.png`, fullPage: true });

    const latePayments = await db.select().from(payments).where(eq(payments.ticketId, late.id));
    expect(latePayments.find((p) => p.kind === 'reversal')).toMatchObject({ state: 'completed', providerReversalId: expect.stringMatching(/^trr_/), recoveryNote: null });
    const voidedPayments = await db.select().from(payments).where(eq(payments.ticketId, paidTicket.id));
    expect(voidedPayments.find((p) => p.kind === 'reversal')).toMatchObject({ state: 'completed', providerReversalId: null, recoveryNote: expect.stringMatching(/dashboard/), completedBy: world.manager.id });
  });
});
