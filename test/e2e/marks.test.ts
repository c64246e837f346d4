import { describe, expect, it } from 'vitest';
import { createTicket } from '@/features/counter/tickets.server';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

describe('a mark that names another metal than its number, at the counter in real chromium', () => {
  it('holds 750 silver for a test whatever metal is chosen, prices AG 990 as silver, and the offer waits for the test', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });

    const page = await newPage();
    await signInThroughForm(page, world.clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await page.goto(`/counter/tickets/${t.id}`);
    await islandsReady(page);
    const line = page.getByTestId('line-1');
    await line.getByLabel('Mark', { exact: true }).fill('750 silver');
    await line.getByLabel('Gross weight', { exact: true }).fill('10');
    await expect.poll(() => page.getByTestId('line-1-reading').textContent()).toMatch(/needs a test/);
    expect(await page.getByTestId('total-payout').textContent()).toBe('$0.00');
    for (const metal of ['gold', 'silver']) {
      await line.getByLabel('Metal', { exact: true }).selectOption(metal);
      expect(await page.getByTestId('total-payout').textContent()).toBe('$0.00');
    }
    await page.getByRole('button', { name: 'Save lines' }).click();
    await page.getByRole('button', { name: 'Show offer to seller' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/750 is a fineness of gold, not of silver/);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/counter-mark-conflict.png`, fullPage: true });

    await line.getByLabel('Metal', { exact: true }).selectOption('');
    await line.getByLabel('Mark', { exact: true }).fill('AG 990');
    await expect.poll(() => page.getByTestId('total-payout').textContent()).toBe('$6.68');
    await page.screenshot({ path: `${SCREENSHOT_DIR}/counter-mark-silver-990.png`, fullPage: true });
  });
});
