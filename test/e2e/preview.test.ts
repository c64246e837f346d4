import { describe, expect, it } from 'vitest';
import { priceQuote } from '@/features/pricing/pricing';
import { FACTORY_PASSWORD, makeUser, testDb } from '../support/db';
import { BASE_URL, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

const body = {
  spot: { gold: '2400.00', silver: '30.00' },
  lines: [
    { kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '5.42', unit: 'g' }, deductions: [{ kind: 'grams', value: '0.31', reason: 'stone' }] },
    { kind: 'coin', coinType: 'us-90-dime', count: 10 },
  ],
};

describe('POST /api/quotes/preview over HTTP', () => {
  it('prices for a clerk exactly as the engine does, saves nothing, and names the field of bad input', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    const res = await page.request.post('/api/quotes/preview', { data: body, headers: { origin: BASE_URL } });
    expect(res.status()).toBe(200);
    const quote = (await res.json()) as ReturnType<typeof priceQuote>;
    const engine = priceQuote({ ...body, currency: 'USD' });
    expect(quote.totals.payout.amountMinor).toBe(engine.totals.payout.amountMinor);
    expect(quote.totals.meltValue.amountMinor).toBe(engine.totals.meltValue.amountMinor);
    expect(quote.lines).toHaveLength(2);

    const bad = await page.request.post('/api/quotes/preview', {
      data: { spot: { gold: '0' }, lines: [{ kind: 'weight', mark: '14K', grossWeight: { value: '2', unit: 'oz' } }] },
      headers: { origin: BASE_URL },
    });
    expect(bad.status()).toBe(422);
    const issues = ((await bad.json()) as { issues: { path: string; message: string }[] }).issues;
    expect(issues.map((i) => i.path)).toEqual(expect.arrayContaining(['spot.gold', 'lines.0.grossWeight.unit']));
    expect(issues.find((i) => i.path === 'lines.0.grossWeight.unit')!.message).toMatch(/troy|avoirdupois/i);
    const notJson = await page.request.post('/api/quotes/preview', { data: Buffer.from('{'), headers: { 'content-type': 'application/json', origin: BASE_URL } });
    expect(notJson.status()).toBe(400);
  });

  it('answers 401 signed out and 403 to a seller', async () => {
    const anonymous = await newPage();
    expect((await anonymous.request.post('/api/quotes/preview', { data: body, headers: { origin: BASE_URL } })).status()).toBe(401);
    const seller = await makeUser(db, { role: 'seller' });
    const page = await newPage();
    await signInThroughForm(page, seller.email, FACTORY_PASSWORD);
    await page.waitForURL('**/portal');
    expect((await page.request.post('/api/quotes/preview', { data: body, headers: { origin: BASE_URL } })).status()).toBe(403);
  });
});
