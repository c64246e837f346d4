import { describe, expect, it } from 'vitest';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import { createTicket, saveLines } from '@/features/counter/tickets.server';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { FLOW_LINES, makeCounterWorld, setSpots } from '../support/counter';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

describe('a raise beyond the clerk limit, approved on the clerk\u2019s own screen, in real chromium', () => {
  it('asks for a manager, refuses a clerk\u2019s own credentials, and lets the offer through once a manager approves', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
    await saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines: [FLOW_LINES[1]] }));

    const page = await newPage();
    await signInThroughForm(page, world.clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await page.goto(`/counter/tickets/${t.id}`);
    await islandsReady(page);
    const before = await page.getByTestId('total-payout').textContent();
    await page.getByTestId('line-1').getByLabel('Raise rate (points)').fill('5');
    expect(await page.getByTestId('total-payout').textContent()).not.toBe(before);
    await page.getByRole('button', { name: 'Save lines' }).click();
    await page.getByRole('heading', { name: 'Manager approval needed' }).waitFor();

    await page.getByRole('button', { name: 'Show offer to seller' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/manager must approve/);

    await page.getByLabel('Manager e-mail').fill(world.clerk.email);
    await page.getByLabel('Manager password').fill(FACTORY_PASSWORD);
    await page.getByRole('button', { name: 'Approve raise' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/not the credentials of an active manager/);

    await page.getByLabel('Manager e-mail').fill(world.manager.email);
    await page.getByLabel('Manager password').fill(FACTORY_PASSWORD);
    await page.getByRole('button', { name: 'Approve raise' }).click();
    await expect.poll(() => page.getByRole('status').first().textContent()).toMatch(/Raise approved/);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/approval.png`, fullPage: true });

    await page.getByRole('button', { name: 'Show offer to seller' }).click();
    await expect.poll(() => page.getByTestId('ticket-state').textContent()).toBe('Offer shown');
    expect(await page.getByTestId('line-1-figures').textContent()).toContain('pays');
  });
});
