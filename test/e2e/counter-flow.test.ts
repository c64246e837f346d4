import { describe, expect, it } from 'vitest';
import { gzipSync } from 'node:zlib';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { moneyOf } from '@/features/pricing/money';
import { FACTORY_PASSWORD, makeStore, makeUser, testDb } from '../support/db';
import { SCREENSHOT_DIR, islandsReady, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

async function fillLine(page: Page, n: number, fields: Record<string, string>, selects: Record<string, string> = {}) {
  const line = page.getByTestId(`line-${n}`);
  for (const [label, value] of Object.entries(selects)) await line.getByLabel(label, { exact: true }).selectOption(value);
  for (const [label, value] of Object.entries(fields)) await line.getByLabel(label, { exact: true }).fill(value);
}

describe('a clerk serves a walk-in seller from hello to receipt, in real chromium', () => {
  it('enters spot, records the seller, grades three lines, shows the margin, takes the signature, pays cash and prints', async () => {
    const store = await makeStore(db, { name: 'Flow Street' });
    const clerk = await makeUser(db, { role: 'clerk', storeId: store.id, name: 'Flo Clerk' });
    const page = await newPage();

    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await islandsReady(page);

    for (const [metal, value] of [
      ['gold', '2400.00'],
      ['silver', '30.00'],
    ] as const) {
      await page.locator(`#spot-input-${metal}`).fill(value);
      await page.locator(`#spot-input-${metal}`).press('Enter');
      await expect.poll(() => page.getByTestId(`spot-${metal}`).textContent()).toBe(value);
    }
    await page.getByLabel('Opening float (USD)').fill('1500.00');
    await page.getByRole('button', { name: 'Open drawer' }).click();
    await page.getByTestId('drawer-balance').waitFor();

    await page.getByRole('button', { name: 'New seller…' }).click();
    await page.getByLabel('ID document').selectOption('drivers-license');
    const seller = {
      'Legal name (as on the ID)': 'Imogen Farrow-Test',
      'Date of birth': '1975-04-09',
      Phone: '+1 207 555 0100',
      'ID number': 'E2E-445566',
      'ID issued by (state, province or country)': 'ME',
      'ID expiry': '2031-01-31',
      Address: '3 Quay Road',
      City: 'Port Alder',
      'State or region': 'ME',
      'Postal code': '04999',
    };
    for (const [label, value] of Object.entries(seller)) await page.getByLabel(label, { exact: true }).fill(value);
    await page.getByRole('button', { name: 'Save seller and start ticket' }).click();
    await page.waitForURL('**/counter/tickets/**');
    await islandsReady(page);
    const ticketId = new URL(page.url()).pathname.split('/')[3]!;
    expect(await page.getByTestId('seller-name').textContent()).toBe('Imogen Farrow-Test');

    await fillLine(
      page,
      1,
      { Mark: 'sterling', 'Gross weight': '412.6', 'Deduct (g)': '96.0', 'Deduction for': 'hollow knife handles', 'Test result': 'holds at 925 acid', Description: 'Sterling flatware, 6 pieces' },
      { Category: 'flatware', 'Test done': 'acid' },
    );
    expect(await page.getByTestId('line-1-reading').textContent()).toMatch(/sterling/i);
    await page.keyboard.press('Alt+N');
    await expect.poll(() => page.getByTestId('line-2').count()).toBe(1);
    await fillLine(page, 2, { Mark: '14k', 'Gross weight': '5.42', 'Deduct (g)': '0.31', 'Deduction for': 'centre stone', Description: '14K ring with stone' }, { 'Test done': 'electronic' });
    await page.getByRole('button', { name: 'Add coins or bullion' }).click();
    await fillLine(page, 3, { Count: '10' }, { 'Coin or bullion type': 'us-90-dime' });

    // A photo of the items, through the S3 fake; served back only to staff.
    const png = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64');
    await page.getByLabel('Item photos').setInputFiles({ name: 'items.png', mimeType: 'image/png', buffer: png });
    const thumb = page.getByRole('img', { name: 'Item photo' });
    await thumb.waitFor();
    const photoUrl = (await thumb.getAttribute('src'))!;
    const served = await page.request.get(photoUrl);
    expect(served.status()).toBe(200);
    expect(served.headers()['content-type']).toBe('image/png');
    expect(Buffer.compare(await served.body(), png)).toBe(0);
    const stranger = await (await page.context().browser()!.newContext({ baseURL: page.url() })).newPage();
    expect((await stranger.request.get(new URL(photoUrl, page.url()).toString())).status()).toBe(401);
    await stranger.context().close();

    // Live totals from the shared engine, before the server has seen anything.
    const liveMargin = await page.getByTestId('margin-statement').textContent();
    expect(liveMargin).toMatch(/Melt value \$[\d,]+\.\d\d, we pay \$[\d,]+\.\d\d \(\d+\.\d\d% of melt\)/);
    const livePayout = await page.getByTestId('total-payout').textContent();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/counter-grading.png`, fullPage: true });

    await page.getByRole('button', { name: 'Show offer to seller' }).click();
    await expect.poll(() => page.getByTestId('ticket-state').textContent()).toBe('Offer shown');

    const server = (await (await page.request.get(`/api/tickets/${ticketId}`)).json()) as { ticket: { payoutMinor: number; meltValueMinor: number; marginMinor: number } };
    expect(livePayout).toBe(moneyOf(server.ticket.payoutMinor, 'USD').formatted);

    const sellerView = await page.context().newPage();
    await sellerView.goto(`/counter/tickets/${ticketId}/seller-view`);
    await islandsReady(sellerView);
    const statement = await sellerView.getByTestId('seller-margin-statement').textContent();
    expect(statement).toContain(moneyOf(server.ticket.meltValueMinor, 'USD').formatted);
    expect(statement).toContain(moneyOf(server.ticket.payoutMinor, 'USD').formatted);
    expect(await sellerView.content()).not.toContain('E2E-445566');
    await sellerView.screenshot({ path: `${SCREENSHOT_DIR}/seller-view.png`, fullPage: true });
    await sellerView.close();

    await page.getByRole('button', { name: 'Seller accepts' }).click();
    await page.getByLabel('The seller has read and agrees to the statement above.').check();
    const pad = page.getByTestId('signature-pad');
    await pad.scrollIntoViewIfNeeded();
    const box = (await pad.boundingBox())!;
    await page.mouse.move(box.x + 30, box.y + box.height * 0.7);
    await page.mouse.down();
    for (let i = 1; i <= 12; i++) await page.mouse.move(box.x + 30 + i * 25, box.y + box.height * (0.7 - 0.4 * Math.sin(i / 2)));
    await page.mouse.up();
    await page.getByRole('button', { name: 'Confirm acceptance' }).click();
    await expect.poll(() => page.getByTestId('ticket-state').textContent()).toBe('Accepted, awaiting payment');

    await page.getByRole('button', { name: 'Pay seller' }).click();
    await expect.poll(() => page.getByTestId('ticket-state').textContent()).toBe('Paid');
    await page.screenshot({ path: `${SCREENSHOT_DIR}/counter-paid.png`, fullPage: true });

    const paid = (await (await page.request.get(`/api/tickets/${ticketId}`)).json()) as {
      ticket: { payoutMinor: number; meltValueMinor: number; marginMinor: number; reference: string; lines: { payoutMinor: number; tagNumber: string }[] };
    };
    await page.getByRole('link', { name: 'Receipt' }).click();
    await page.waitForURL('**/receipt');
    const receipt = (await page.locator('main').textContent())!;
    expect(receipt).toContain(paid.ticket.reference);
    expect(receipt).toContain(moneyOf(paid.ticket.payoutMinor, 'USD').formatted);
    expect(receipt).toContain(moneyOf(paid.ticket.meltValueMinor, 'USD').formatted);
    expect(receipt).toContain(moneyOf(paid.ticket.marginMinor, 'USD').formatted);
    for (const line of paid.ticket.lines) {
      expect(receipt).toContain(moneyOf(line.payoutMinor, 'USD').formatted);
      expect(receipt).toContain(line.tagNumber);
    }
    expect(receipt).not.toContain('E2E-445566');
    expect(receipt).toContain('5566');
    await page.screenshot({ path: `${SCREENSHOT_DIR}/receipt.png`, fullPage: true });

    const pdf = await page.request.get(`/api/tickets/${ticketId}/receipt.pdf`);
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()['content-type']).toContain('application/pdf');
    expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');

    // The JavaScript a fresh load of the ticket screen ships, gzip-compressed (README states the figure).
    const fresh = await page.context().newPage();
    const jsBytes = new Map<string, number>();
    fresh.on('response', async (res) => {
      if (res.url().endsWith('.js') && res.ok()) jsBytes.set(res.url(), gzipSync(await res.body()).length);
    });
    await fresh.goto(`/counter/tickets/${ticketId}`, { waitUntil: 'networkidle' });
    const total = [...jsBytes.values()].reduce((a, b) => a + b, 0);
    writeFileSync(join(SCREENSHOT_DIR, 'counter-js-gzip-bytes.txt'), `${total}\n${[...jsBytes].map(([u, b]) => `${b} ${u}`).join('\n')}\n`);
    expect(total).toBeLessThan(150 * 1024);
  });
});
