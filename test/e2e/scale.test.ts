import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createTicket } from '@/features/counter/tickets.server';
import { priceQuote } from '@/features/pricing/pricing';
import { moneyOf } from '@/features/pricing/money';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();
const SCALE = process.env.FAKE_SCALE_URL ?? 'http://127.0.0.1:12122';

/** Puts a load on the simulated scale's pan (fakes/scale). */
async function pan(update: Record<string, unknown>) {
  const res = await fetch(`${SCALE}/pan`, { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ settleMs: 0, raw: null, ...update }) });
  expect(res.status, await res.clone().text()).toBe(200);
}

async function openTicket(page: Page) {
  const world = await makeCounterWorld(db);
  await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
  const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
  await signInThroughForm(page, world.clerk.email, FACTORY_PASSWORD);
  await page.waitForURL('**/counter');
  await page.goto(`/counter/tickets/${t.id}`);
  await islandsReady(page);
  return t.id;
}

describe('weight from the scale, in real chromium', () => {
  it('a clerk connects the simulated scale, takes a settled weight into a line and sees it priced; a moving reading is refused', async () => {
    await pan({ value: '0.000', unit: 'g', layout: 'coded', motion: false, load: 'in-range' });
    const page = await newPage();
    const ticketId = await openTicket(page);
    const scale = page.getByTestId('scale');
    const reading = page.getByTestId('scale-reading');
    const message = page.getByTestId('scale-message');

    // Chromium offers Web Serial here, so the real balance's button is live (its port chooser is the browser's own dialog).
    expect(await page.evaluate(() => 'serial' in navigator)).toBe(true);
    expect(await scale.getByRole('button', { name: 'Connect scale' }).isEnabled()).toBe(true);
    expect(await page.getByTestId('scale-unavailable').count()).toBe(0);

    await pan({ value: '12.345', unit: 'g', layout: 'coded', settleMs: 800 });
    await scale.getByRole('button', { name: 'Connect simulated scale' }).click();
    await expect.poll(() => reading.textContent()).toMatch(/moving/);
    await expect.poll(() => reading.textContent(), { timeout: 5_000 }).toMatch(/^12\.345 g\s*steady$/);

    const line1 = page.getByTestId('line-1');
    await line1.getByLabel('Mark', { exact: true }).fill('14K');
    await page.keyboard.press('Alt+KeyW');
    await expect.poll(() => line1.getByLabel('Gross weight').inputValue()).toBe('12.345');
    expect(await message.textContent()).toBe('Line 1: gross weight 12.345 g from the scale.');
    const expected = priceQuote({ currency: 'USD', spot: { gold: '2400.00' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '12.345', unit: 'g' } }] });
    expect(await page.getByTestId('line-1-figures').textContent()).toContain(`melt ${expected.totals.meltValue.formatted}`);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/scale-taken.png`, fullPage: true });

    // Sterling flatware weighed while the pan still moves: refused with the reason, nothing written.
    await page.keyboard.press('Alt+N');
    const line2 = page.getByTestId('line-2');
    await line2.getByLabel('Mark', { exact: true }).fill('sterling');
    await pan({ value: '101.20', unit: 'dwt', layout: 'plain', motion: true });
    await expect.poll(() => reading.textContent()).toMatch(/dwt\s*moving/);
    await page.keyboard.press('Alt+KeyW');
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'Not taken' }).textContent()).toMatch(/The scale is not steady yet \(the reading is still moving\)/);
    expect(await line2.getByLabel('Gross weight').inputValue()).toBe('');
    // A full-page capture draws the sticky bar where the window is; start from the top.
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: `${SCREENSHOT_DIR}/scale-refused-moving.png`, fullPage: true });

    // Overload, in the reply layout, refused the same way.
    await pan({ layout: 'reply', load: 'overload', motion: false });
    await expect.poll(() => reading.textContent()).toMatch(/overload/);
    await scale.getByRole('button', { name: 'Take weight into line 2' }).click();
    await expect.poll(() => message.textContent()).toMatch(/overloaded/);

    // Settled in pennyweights: the line takes the balance's unit, exactly as shown.
    await pan({ layout: 'plain', load: 'in-range' });
    await expect.poll(() => reading.textContent()).toMatch(/^101\.20 dwt\s*steady$/);
    await scale.getByRole('button', { name: 'Take weight into line 2' }).click();
    await expect.poll(() => line2.getByLabel('Gross weight').inputValue()).toBe('101.20');
    expect(await line2.getByLabel('Unit', { exact: true }).inputValue()).toBe('dwt');
    expect(await message.textContent()).toBe('Line 2: gross weight 101.20 dwt from the scale (the line now weighs in pennyweights).');

    // Typed entry stays: a third line weighed by hand.
    await page.getByRole('button', { name: 'Add item by weight' }).click();
    const line3 = page.getByTestId('line-3');
    await line3.getByLabel('Mark', { exact: true }).fill('18K');
    await line3.getByLabel('Gross weight').fill('3.5');
    await expect.poll(() => page.getByTestId('line-3-figures').textContent()).toMatch(/pays \$/);

    // Far down the ticket the scale bar stays in view, and a field reached with Tab is not hidden under it.
    await page.evaluate(() => window.scrollTo(0, document.body.scrollHeight));
    expect(await page.evaluate(() => window.scrollY)).toBeGreaterThan(500);
    expect(Math.abs((await scale.boundingBox())!.y)).toBeLessThan(2);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/scale-bar-in-view.png` });
    await line1.getByLabel('Gross weight').evaluate((el: HTMLElement) => el.focus());
    const bar = (await scale.boundingBox())!;
    const field = (await line1.getByLabel('Gross weight').boundingBox())!;
    expect(bar.y).toBeGreaterThanOrEqual(-1);
    expect(field.y).toBeGreaterThanOrEqual(bar.y + bar.height);
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('l0-gross');
    // The scale follows the line being worked on (line 1 was rendered by the server, the others in the browser).
    await expect.poll(() => scale.getByRole('button', { name: /^Take weight into line/ }).textContent()).toBe('Take weight into line 1');
    await line1.getByLabel('Gross weight').fill('');
    await pan({ value: '12.345', unit: 'g', layout: 'coded' });
    await expect.poll(() => reading.textContent()).toMatch(/^12\.345 g\s*steady$/);
    await page.keyboard.press('Alt+KeyW');
    await expect.poll(() => line1.getByLabel('Gross weight').inputValue()).toBe('12.345');
    expect(await message.textContent()).toBe('Line 1: gross weight 12.345 g from the scale.');
    expect(await line2.getByLabel('Gross weight').inputValue()).toBe('101.20');

    // The server prices the same lines to the same figures.
    await page.getByRole('button', { name: 'Save lines' }).click();
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Saved' }).count()).toBe(1);
    const server = (await (await page.request.get(`/api/tickets/${ticketId}`)).json()) as {
      ticket: { payoutMinor: number; lines: { input: { item: { grossWeight: { value: string; unit: string; grams: string } } }; payoutMinor: number }[] };
    };
    expect(server.ticket.lines.map((l) => l.input.item.grossWeight)).toEqual([
      { value: '12.345', unit: 'g', grams: '12.345' },
      // 101.20 dwt x 1.55517384 g/dwt, exact (NIST Handbook 44, Appendix C: 1 dwt = 24 gr = 1.55517384 g)
      { value: '101.20', unit: 'dwt', grams: '157.383592608' },
      { value: '3.5', unit: 'g', grams: '3.5' },
    ]);
    expect(await page.getByTestId('total-payout').textContent()).toBe(moneyOf(server.ticket.payoutMinor, 'USD').formatted);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: `${SCREENSHOT_DIR}/scale-saved.png`, fullPage: true });
  });

  it('says so when the browser has no Web Serial, and typed entry still prices', async () => {
    const page = await newPage();
    await page.addInitScript(() => {
      delete (Navigator.prototype as { serial?: unknown }).serial;
    });
    await openTicket(page);
    await expect.poll(() => page.getByTestId('scale-unavailable').textContent()).toMatch(/no Web Serial, so Cupel cannot read the scale here/);
    expect(await page.getByTestId('scale').getByRole('button', { name: 'Connect scale' }).isDisabled()).toBe(true);
    const line1 = page.getByTestId('line-1');
    await line1.getByLabel('Mark', { exact: true }).fill('14K');
    await line1.getByLabel('Gross weight').fill('2');
    await expect.poll(() => page.getByTestId('line-1-figures').textContent()).toMatch(/pays \$/);
    await page.getByTestId('scale').screenshot({ path: `${SCREENSHOT_DIR}/scale-unavailable.png` });
  });
});
