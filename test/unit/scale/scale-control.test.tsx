// @vitest-environment jsdom
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import TicketWorkbench from '@/features/counter/components/TicketWorkbench';
import type { WorkbenchData } from '@/features/counter/workbench.server';
import { priceQuote } from '@/features/pricing/pricing';
import { createScaleFake, type ScaleFake } from '../../../fakes/scale/app';

function initial(): WorkbenchData {
  return {
    role: 'clerk',
    ticket: {
      id: 't1', reference: 'TST-000001', state: 'draft', stateLabel: 'Grading', currency: 'USD', ticketRaisePoints: '0.00',
      meltValueMinor: 0, payoutMinor: 0, marginMinor: 0, holdUntil: null, voidReason: null, clerkName: 'Test Clerk',
      lines: [], approvals: [], payments: [],
    },
    seller: { id: 's1', legalName: 'Pat Example', idSummary: 'Card ending 1234', doNotBuy: false, problems: [], recentTickets: [], email: null, payoutAccount: { onboarded: false, destination: null, instantAvailable: false, onboardingUrl: null, onboardingQrSvg: null } },
    spot: {
      gold: { pricePerTroyOunce: '2400.0000', enteredAt: new Date().toISOString(), stale: false, enteredByName: 'M' },
      silver: { pricePerTroyOunce: '30.0000', enteredAt: new Date().toISOString(), stale: false, enteredByName: 'M' },
    },
    staleAfterMinutes: 30,
    settings: { rates: {}, assumedFineness: {}, clerkRaiseLimitPoints: '3.00', cashLimit: '2500.00', ownershipStatement: 'I own these items.', holdDays: 10 },
    drawer: null,
  } as unknown as WorkbenchData;
}

let fake: ScaleFake;
const realFetch = globalThis.fetch;
beforeAll(async () => {
  fake = await createScaleFake({ port: 0, intervalMs: 25 });
});
afterAll(() => fake.close());
beforeEach(() => {
  // The island's own API calls answer with its starting data; the simulated scale is reached for real.
  vi.stubGlobal('fetch', vi.fn(async (input: RequestInfo | URL, init?: RequestInit) =>
    String(input).startsWith('/api/') ? new Response(JSON.stringify(initial()), { headers: { 'content-type': 'application/json' } }) : realFetch(input, init)));
  fake.balance.set({ value: '0.000', unit: 'g', layout: 'coded', motion: false, load: 'in-range', raw: null, settleMs: 0 });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const pan = (update: Parameters<ScaleFake['balance']['set']>[0]) => fake.balance.set({ settleMs: 0, ...update });
const reading = () => screen.getByTestId('scale-reading').textContent;
/** The simulated scale prints every 25 ms; a loaded machine may take longer to pass a line through. */
const soon = { timeout: 5_000 };

describe('the scale control on the ticket screen', { timeout: 30_000 }, () => {
  it('says plainly when the browser has no Web Serial, and typed weights still price', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    expect('serial' in navigator).toBe(false);
    expect(screen.getByTestId('scale-unavailable').textContent).toMatch(/no Web Serial.*Chrome or Edge.*Type the weights instead/);
    expect(screen.getByRole('button', { name: 'Connect scale' })).toHaveProperty('disabled', true);
    expect(screen.queryByRole('button', { name: 'Connect simulated scale' })).toBeNull();
    const line = within(screen.getByTestId('line-1'));
    await user.type(line.getByLabelText('Mark'), '14K');
    await user.type(line.getByLabelText('Gross weight'), '10');
    const expected = priceQuote({ currency: 'USD', spot: { gold: '2400.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '10', unit: 'g' } }] });
    expect(screen.getByTestId('total-payout').textContent).toBe(expected.totals.payout.formatted);
  });

  it('takes the settled reading into the focused line with Alt+W, and refuses a moving one with the reason', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} simulatedScaleUrl={fake.url} />);
    pan({ value: '12.345', unit: 'g', layout: 'coded' });
    await user.click(screen.getByRole('button', { name: 'Connect simulated scale' }));
    await waitFor(() => expect(reading()).toMatch(/12\.345 g\s*steady/), soon);

    const line1 = within(screen.getByTestId('line-1'));
    await user.type(line1.getByLabelText('Mark'), '14K');
    await user.keyboard('{Alt>}w{/Alt}');
    expect(line1.getByLabelText('Gross weight')).toHaveProperty('value', '12.345');
    expect(screen.getByTestId('scale-message').textContent).toBe('Line 1: gross weight 12.345 g from the scale.');
    const expected = priceQuote({ currency: 'USD', spot: { gold: '2400.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '12.345', unit: 'g' } }] });
    expect(screen.getByTestId('total-payout').textContent).toBe(expected.totals.payout.formatted);

    // A second line, weighed while the pan is still moving: refused, nothing written.
    await user.click(screen.getByRole('button', { name: 'Add item by weight' }));
    const line2 = within(screen.getByTestId('line-2'));
    await user.type(line2.getByLabelText('Mark'), 'sterling');
    pan({ value: '31.10', unit: 'dwt', layout: 'plain', motion: true });
    await waitFor(() => expect(reading()).toMatch(/dwt\s*moving/), soon);
    await user.keyboard('{Alt>}w{/Alt}');
    expect(screen.getByRole('alert').textContent).toMatch(/Not taken: The scale is not steady yet/);
    expect(line2.getByLabelText('Gross weight')).toHaveProperty('value', '');

    // Settled in pennyweights: the line shows what the balance shows, and the button names the line.
    pan({ motion: false });
    await waitFor(() => expect(reading()).toMatch(/31\.10 dwt\s*steady/), soon);
    await user.click(screen.getByRole('button', { name: 'Take weight into line 2' }));
    expect(line2.getByLabelText('Gross weight')).toHaveProperty('value', '31.10');
    expect(line2.getByLabelText('Unit')).toHaveProperty('value', 'dwt');
    expect(document.activeElement).toBe(line2.getByLabelText('Gross weight'));
    expect(line1.getByLabelText('Gross weight')).toHaveProperty('value', '12.345');

    // Back in line 1: the scale follows the line being worked on, not the last one.
    await user.click(line1.getByLabelText('Description'));
    expect(screen.getByRole('button', { name: 'Take weight into line 1' })).toBeTruthy();
    await user.keyboard('{Alt>}w{/Alt}');
    expect(line1.getByLabelText('Gross weight')).toHaveProperty('value', '31.10');
    expect(line1.getByLabelText('Unit')).toHaveProperty('value', 'dwt');
  });

  it('refuses overload, avoirdupois ounces and an unreadable line, and a line priced by count', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} simulatedScaleUrl={fake.url} />);
    pan({ layout: 'reply', load: 'overload' });
    await user.click(screen.getByRole('button', { name: 'Connect simulated scale' }));
    await waitFor(() => expect(reading()).toMatch(/overload/), soon);
    await user.click(within(screen.getByTestId('line-1')).getByLabelText('Mark'));
    await user.keyboard('{Alt>}w{/Alt}');
    expect(screen.getByRole('alert').textContent).toMatch(/overloaded/);

    pan({ layout: 'coded', load: 'in-range', value: '0.500', unit: 'oz' });
    await waitFor(() => expect(reading()).toMatch(/no usable weight/), soon);
    await user.keyboard('{Alt>}w{/Alt}');
    expect(screen.getByRole('alert').textContent).toMatch(/avoirdupois unit never used for precious metal/);

    pan({ raw: 'ST,GS,+   1,234 g' });
    await waitFor(() => expect(reading()).toMatch(/unreadable line: the balance writes a decimal comma/), soon);
    await user.keyboard('{Alt>}w{/Alt}');
    expect(screen.getByRole('alert').textContent).toMatch(/cannot read what the scale sends/);
    expect(within(screen.getByTestId('line-1')).getByLabelText('Gross weight')).toHaveProperty('value', '');

    pan({ value: '3.000', unit: 'g' });
    await user.click(screen.getByRole('button', { name: 'Add coins or bullion' }));
    await user.click(within(screen.getByTestId('line-2')).getByLabelText('Count'));
    await user.keyboard('{Alt>}w{/Alt}');
    expect(screen.getByRole('alert').textContent).toMatch(/Line 2 is priced by count/);
  });
});
