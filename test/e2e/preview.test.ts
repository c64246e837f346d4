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

  it('never prices a mark as another metal: AG 990 and S990 are silver, 750 silver, 14K silver and 925 gold are held for a test', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    const marks = ['AG 990', 'S990', '750 silver', '14K silver', '925 gold', 'PT 585'];
    const res = await page.request.post('/api/quotes/preview', {
      data: { spot: { gold: '2400.00', silver: '30.00', platinum: '950.00' }, lines: marks.map((mark) => ({ kind: 'weight', mark, grossWeight: { value: '10', unit: 'g' } })) },
      headers: { origin: BASE_URL },
    });
    expect(res.status()).toBe(200);
    const quote = (await res.json()) as ReturnType<typeof priceQuote>;
    const shown = quote.lines.map((l) => [l.status, l.status === 'priced' ? l.metal : null, l.status === 'priced' ? l.payout.decimal : null]);
    // Before the fix: AG 990 and S990 paid 626.40 as gold, 750 silver 474.55 as 18K, 14K silver 360.09 as gold, 925 gold 6.25 as silver.
    expect(shown).toEqual([
      ['priced', 'silver', '6.68'],
      ['priced', 'silver', '6.68'],
      ['needs-test', null, null],
      ['needs-test', null, null],
      ['needs-test', null, null],
      ['needs-test', null, null],
    ]);
    expect(quote.totals.payout.decimal).toBe('13.36');
    const held = quote.lines[2]!;
    expect(held.status === 'needs-test' && held.message).toBe('The mark names silver, but 750 is a fineness of gold, not of silver. Test it before pricing.');
    expect(held.mark!.candidates.map((c) => c.metal)).toEqual(['gold']);
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
