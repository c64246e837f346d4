import { describe, expect, it } from 'vitest';
import { acceptTicket, createTicket, getTicket, quoteTicket } from '@/features/counter/tickets.server';
import { priceQuote } from '@/features/pricing/pricing';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { SIGNATURE, makeCounterWorld, setSpots } from '../support/counter';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

describe('coin by face value at the counter, in real chromium', () => {
  it('prices 40% halves by face value on mint weight, the server saves the same figure and the receipt says how they were counted; 90% coin offers mint weight beside circulated', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { silver: '30.00' });
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });

    const page = await newPage();
    await page.setViewportSize({ width: 1366, height: 900 });
    await signInThroughForm(page, world.clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await page.goto(`/counter/tickets/${t.id}`);
    await islandsReady(page);

    await page.getByRole('button', { name: 'Remove line 1' }).click();
    await page.getByRole('button', { name: 'Add coin by face value' }).click();
    const line = page.getByTestId('line-1');
    await line.getByLabel('Coin class', { exact: true }).selectOption('us-40');
    await line.getByLabel('Face value', { exact: true }).fill('10.00');
    const expected = priceQuote({ currency: 'USD', spot: { silver: '30.00' }, lines: [{ kind: 'face-value', coinClass: 'us-40', faceValue: '10.00', basis: 'mint-weight' }] });
    await expect.poll(() => page.getByTestId('total-payout').textContent()).toBe(expected.totals.payout.formatted);
    expect(await page.getByTestId('line-1-basis').textContent()).toContain('0.2958 ozt per 1.00 face, mint weight');
    expect(await line.getByLabel('Counted at', { exact: true }).count()).toBe(0);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/face-value-40.png`, fullPage: true });

    await page.getByRole('button', { name: 'Save lines' }).click();
    await expect.poll(async () => (await getTicket(db, world.clerk, t.id)).payoutMinor).toBe(expected.totals.payout.amountMinor);

    // 90% coin offers the clerk the mint figure beside the circulated one.
    await page.getByRole('button', { name: 'Add coin by face value' }).click();
    const second = page.getByTestId('line-2');
    await second.getByLabel('Face value', { exact: true }).fill('4.00');
    expect(await page.getByTestId('line-2-basis').textContent()).toContain('circulated, common practice');
    await second.getByLabel('Counted at', { exact: true }).selectOption('mint-weight');
    await expect.poll(() => page.getByTestId('line-2-basis').textContent()).toContain('0.7234 ozt per 1.00 face, mint weight');
    await page.getByTestId('line-2').screenshot({ path: `${SCREENSHOT_DIR}/face-value-90.png` });

    // The saved 40% line, accepted, on the printed receipt.
    await quoteTicket(db, world.clerk, t.id);
    await acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE });
    await page.goto(`/counter/tickets/${t.id}/receipt`);
    expect(await page.getByTestId('receipt-line-basis').textContent()).toBe('Counted 10.00 face at 0.2958 ozt per 1.00 face, mint weight');
    await page.screenshot({ path: `${SCREENSHOT_DIR}/face-value-receipt.png`, fullPage: true });
  });
});
