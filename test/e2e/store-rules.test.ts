import { describe, expect, it } from 'vitest';
import { getStoreSettings } from '@/features/settings/settings.server';
import { FACTORY_PASSWORD, makeStore, makeUser, testDb } from '../support/db';
import { BASE_URL, SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

describe("a manager sets the store's rules and payout rates, in real chromium", () => {
  it('saves a rule, refuses a bad value with the reason, and the clerk\u2019s quotes follow the new rate and paid-on fineness', async () => {
    const store = await makeStore(db, { name: 'Rules Street' });
    const manager = await makeUser(db, { role: 'manager', storeId: store.id });
    const clerk = await makeUser(db, { role: 'clerk', storeId: store.id });
    const page = await newPage();
    await signInThroughForm(page, manager.email, FACTORY_PASSWORD);
    await page.waitForURL('**/review');
    await page.getByRole('link', { name: 'Store rules and payout rates' }).click();
    await page.waitForURL('**/review/settings');
    await islandsReady(page);

    const hold = page.getByLabel('Hold period (days)');
    await hold.waitFor();
    await hold.fill('-3');
    await hold.locator('xpath=ancestor::div[2]').getByRole('button', { name: 'Save' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/hold.period_days/);
    await hold.fill('21');
    await hold.locator('xpath=ancestor::div[2]').getByRole('button', { name: 'Save' }).click();
    await expect.poll(async () => (await getStoreSettings(db, store.id))['hold.period_days']).toBe(21);

    await page.getByLabel('Gold jewelry 14K to 17K: paid as').selectOption('percent-of-melt');
    await page.getByLabel('Gold jewelry 14K to 17K: percent of melt').fill('85');
    await page.getByRole('button', { name: 'Save payout rates' }).click();
    await expect.poll(async () => (await getStoreSettings(db, store.id))['pricing.rates']).toEqual({ 'gold-jewelry-14k-to-17k': { basis: 'percent-of-melt', percent: '85' } });

    await page.getByRole('button', { name: 'Add a mark' }).click();
    await page.getByLabel('Mark', { exact: true }).fill('14k');
    await page.getByLabel('Pay on fineness').fill('0.575');
    await page.getByRole('button', { name: 'Save paid-on finenesses' }).click();
    await expect.poll(async () => (await getStoreSettings(db, store.id))['pricing.assumed_fineness']).toEqual({ '14K': '0.575' });
    await page.screenshot({ path: `${SCREENSHOT_DIR}/store-rules.png`, fullPage: true });

    const clerkPage = await newPage();
    await signInThroughForm(clerkPage, clerk.email, FACTORY_PASSWORD);
    await clerkPage.waitForURL('**/counter');
    const res = await clerkPage.request.post('/api/quotes/preview', {
      data: { spot: { gold: '2400.00' }, lines: [{ kind: 'weight', mark: '14K', grossWeight: { value: '10', unit: 'g' } }] },
      headers: { origin: BASE_URL },
    });
    const quote = (await res.json()) as { lines: { payoutRate: { percent: string }; paidOnFineness: string; markedFineness: string }[] };
    expect(quote.lines[0]).toMatchObject({ payoutRate: { percent: '85' }, paidOnFineness: '0.575', markedFineness: '0.583333' });
  });

  it('keeps clerks off the rules page and out of the settings API', async () => {
    const store = await makeStore(db);
    const clerk = await makeUser(db, { role: 'clerk', storeId: store.id });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    expect((await page.goto('/review/settings'))?.status()).toBe(403);
    const put = await page.request.put(`/api/stores/${store.id}/settings`, { data: { key: 'hold.period_days', value: 1 }, headers: { origin: BASE_URL } });
    expect(put.status()).toBe(403);
    expect((await getStoreSettings(db, store.id))['hold.period_days']).toBe(10);
  });
});
