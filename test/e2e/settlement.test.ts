import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { sellers } from '@/db/schema';
import { payTicket } from '@/features/counter/tickets.server';
import { FACTORY_PASSWORD, makeSeller, makeUser, testDb, unique } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { acceptedTicket } from '../support/tickets';
import { waitFor as waitForBounded } from '../support/wait';

const waitFor = <T,>(what: string, fn: () => Promise<T | null | undefined | false>) => waitForBounded(what, fn, { timeoutMs: 30_000, everyMs: 250 });
import { BASE_URL, SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { browser, newPage } = useBrowser();
const MAILDEV = process.env.MAILDEV_URL!;

async function mailTo(address: string, subject: RegExp) {
  const all = (await (await fetch(`${MAILDEV}/api/email?limit=500`)).json()) as { subject: string; to: { address: string }[]; text: string }[];
  return all.find((m) => m.to.some((t) => t.address === address) && subject.test(m.subject)) ?? null;
}

/** A store with a clerk, a seller who has a portal account, and another seller with a paid ticket of their own. */
async function scenario() {
  const world = await makeCounterWorld(db);
  await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
  const email = `${unique('portal')}@example.test`;
  const sellerUser = await makeUser(db, { role: 'seller', storeId: world.storeId, email, name: 'Portal Seller', passwordHash: null });
  await db.update(sellers).set({ userId: sellerUser.id, email, legalName: 'Portal Seller' }).where(eq(sellers.id, world.sellerId));
  const mine = await acceptedTicket(db, world);

  const otherSeller = await makeSeller(db, world.storeId, { legalName: 'Other Seller' });
  const otherUser = await makeUser(db, { role: 'seller', storeId: world.storeId, name: 'Other Seller' });
  await db.update(sellers).set({ userId: otherUser.id }).where(eq(sellers.id, otherSeller.id));
  const theirs = await acceptedTicket(db, { ...world, sellerId: otherSeller.id });
  await payTicket(db, world.clerk, theirs.id, { method: 'check', checkNumber: '777' });
  return { world, email, mine, theirs, otherUser };
}

describe('settlement in real chromium: electronic payout, e-mail link sign-in, the portal', () => {
  it('a clerk pays electronically for a seller who onboards on the fake\u2019s page; the seller signs in by e-mail link and sees exactly their own settlement', async () => {
    const { world, email, mine, theirs } = await scenario();

    const clerkPage = await newPage();
    await signInThroughForm(clerkPage, world.clerk.email, FACTORY_PASSWORD);
    await clerkPage.waitForURL('**/counter');
    await clerkPage.goto(`/counter/tickets/${mine.id}`);
    await islandsReady(clerkPage);
    await clerkPage.getByLabel('Electronic payout').check();
    await clerkPage.getByRole('button', { name: 'Send payout set-up link' }).click();
    const linkEl = clerkPage.getByTestId('electronic-payout').getByRole('link');
    await linkEl.waitFor();
    const onboardingUrl = (await linkEl.getAttribute('href'))!;
    expect(onboardingUrl).toMatch(/\/onboard\//);
    await waitFor('the onboarding e-mail', () => mailTo(email, /payout account/i));

    // The seller opens the link on their own device and adds a test debit card.
    const phone = await (await browser().newContext({ viewport: { width: 420, height: 900 } })).newPage();
    await phone.goto(onboardingUrl);
    await phone.screenshot({ path: `${SCREENSHOT_DIR}/fake-onboarding.png`, fullPage: true });
    await phone.getByRole('button', { name: /save|finish|submit|add|continue/i }).first().click();
    await phone.waitForURL(`${BASE_URL}/**`);
    await phone.context().close();

    await waitFor('the clerk screen to show the payout account', async () => (await clerkPage.getByTestId('electronic-payout').textContent())?.includes('ending 5556'));
    await clerkPage.getByRole('button', { name: 'Pay seller' }).click();
    await waitFor('the ticket to be paid', async () => (await clerkPage.getByTestId('ticket-state').textContent()) === 'Paid');
    await clerkPage.screenshot({ path: `${SCREENSHOT_DIR}/counter-paid-electronic.png`, fullPage: true });

    const seller = await newPage();
    await seller.goto('/signin');
    await islandsReady(seller);
    await seller.getByLabel('Your e-mail address').fill(email);
    await seller.getByRole('button', { name: 'E-mail me a sign-in link' }).click();
    await seller.waitForURL('**/signin/check-email');
    const mail = await waitFor('the sign-in e-mail', () => mailTo(email, /sign-in link/i));
    const link = mail.text.match(/https?:\/\/\S+/)![0];
    expect(link).toContain('/api/auth/callback/nodemailer');
    await seller.goto(link);
    await seller.waitForURL('**/portal');
    await islandsReady(seller);
    const list = seller.getByTestId('settlements');
    await list.waitFor();
    const text = (await list.textContent())!;
    const myRef = (await (await clerkPage.request.get(`/api/tickets/${mine.id}`)).json()).ticket.reference as string;
    const theirRef = (await (await clerkPage.request.get(`/api/tickets/${theirs.id}`)).json()).ticket.reference as string;
    expect(text).toContain(myRef);
    expect(text).not.toContain(theirRef);
    expect(text).toMatch(/Electronic payout paid/);
    expect(await seller.locator('[data-testid^="settlement-"]').count()).toBe(1);
    await seller.screenshot({ path: `${SCREENSHOT_DIR}/portal.png`, fullPage: true });

    const receipt = await seller.goto(`/portal/tickets/${mine.id}`);
    expect(receipt?.status()).toBe(200);
    expect(await seller.getByTestId('receipt').textContent()).toContain(myRef);
    await seller.screenshot({ path: `${SCREENSHOT_DIR}/portal-receipt.png`, fullPage: true });
    expect((await seller.goto(`/portal/tickets/${theirs.id}`))?.status()).toBe(404);
    expect((await seller.request.get(`/api/portal/tickets/${theirs.id}`)).status()).toBe(404);
    expect((await seller.request.get(`/api/portal/tickets/${theirs.id}/receipt.pdf`)).status()).toBe(404);
    const pdf = await seller.request.get(`/api/portal/tickets/${mine.id}/receipt.pdf`);
    expect(pdf.status()).toBe(200);
    expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');

    await seller.goto('/portal/payout-account');
    await islandsReady(seller);
    expect(await seller.getByTestId('payout-account').textContent()).toContain('ending 5556');
  });

  it('answers every portal API route as it should: signed out 401, staff 403, another seller\u2019s record 404', async () => {
    const { world, theirs, otherUser } = await scenario();
    const me = await makeUser(db, { role: 'seller', storeId: world.storeId });
    await db.update(sellers).set({ userId: me.id }).where(eq(sellers.id, (await makeSeller(db, world.storeId)).id));
    const routes: [string, string, unknown?][] = [
      ['GET', '/api/portal/tickets'],
      ['GET', `/api/portal/tickets/${theirs.id}`],
      ['GET', `/api/portal/tickets/${theirs.id}/receipt.pdf`],
      ['GET', '/api/portal/payout-account'],
      ['POST', '/api/portal/payout-account', { sellerId: 'x' }],
      ['GET', '/api/portal/contact'],
      ['PUT', '/api/portal/contact', { sellerId: 'x', contact: {} }],
      ['POST', '/api/portal/password', { password: 'a-long-enough-password' }],
    ];
    const anonymous = await newPage();
    for (const [method, path, data] of routes) {
      const res = await anonymous.request.fetch(path, { method, data, headers: { origin: BASE_URL } });
      expect(res.status(), `${method} ${path} signed out`).toBe(401);
    }
    const clerk = await newPage();
    await signInThroughForm(clerk, world.clerk.email, FACTORY_PASSWORD);
    await clerk.waitForURL('**/counter');
    for (const [method, path, data] of routes) {
      const res = await clerk.request.fetch(path, { method, data, headers: { origin: BASE_URL } });
      expect(res.status(), `${method} ${path} as a clerk`).toBe(403);
    }
    const other = await newPage();
    await signInThroughForm(other, me.email, FACTORY_PASSWORD);
    await other.waitForURL('**/portal');
    expect((await other.request.get('/api/portal/tickets')).status()).toBe(200);
    expect((await (await other.request.get('/api/portal/tickets')).json()).settlements).toEqual([]);
    expect((await other.request.get(`/api/portal/tickets/${theirs.id}`)).status()).toBe(404);
    expect((await other.request.get(`/api/portal/tickets/${theirs.id}/receipt.pdf`)).status()).toBe(404);
    const [theirRecord] = await db.select().from(sellers).where(eq(sellers.userId, otherUser.id));
    const put = await other.request.put('/api/portal/contact', {
      data: { sellerId: theirRecord!.id, contact: { email: 'hijack@example.test', addressLine1: 'x', city: 'x', region: 'x', postalCode: 'x' } },
      headers: { origin: BASE_URL },
    });
    expect(put.status()).toBe(404);
    const onboard = await other.request.post('/api/portal/payout-account', { data: { sellerId: theirRecord!.id }, headers: { origin: BASE_URL } });
    expect(onboard.status()).toBe(404);
    const [unchanged] = await db.select().from(sellers).where(eq(sellers.id, theirRecord!.id));
    expect(unchanged!.email).not.toBe('hijack@example.test');
    const bad = await other.request.put('/api/portal/contact', { data: { sellerId: 'x', contact: { email: 'nope' } }, headers: { origin: BASE_URL } });
    expect(bad.status()).toBe(422);
  });
});
