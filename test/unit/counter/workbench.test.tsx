// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import TicketWorkbench from '@/features/counter/components/TicketWorkbench';
import type { WorkbenchData } from '@/features/counter/workbench.server';
import { priceQuote } from '@/features/pricing/pricing';

function initial(overrides: Partial<WorkbenchData['ticket']> = {}): WorkbenchData {
  return {
    role: 'clerk',
    ticket: {
      id: 't1',
      reference: 'TST-000001',
      state: 'draft',
      stateLabel: 'Grading',
      currency: 'USD',
      ticketRaisePoints: '0.00',
      meltValueMinor: 0,
      payoutMinor: 0,
      marginMinor: 0,
      holdUntil: null,
      voidReason: null,
      clerkName: 'Test Clerk',
      lines: [],
      approvals: [],
      payments: [],
      ...overrides,
    },
    seller: { id: "s1", legalName: "Pat Example", idSummary: "Driver's license •••1234", doNotBuy: false, problems: [], recentTickets: [], email: null, payoutAccount: { onboarded: false, destination: null, instantAvailable: false, onboardingUrl: null, onboardingQrSvg: null } },
    spot: {
      gold: { pricePerTroyOunce: '2400.0000', enteredAt: new Date().toISOString(), stale: false, enteredByName: 'M' },
      silver: { pricePerTroyOunce: '30.0000', enteredAt: new Date().toISOString(), stale: false, enteredByName: 'M' },
    },
    staleAfterMinutes: 30,
    settings: { rates: {}, assumedFineness: {}, clerkRaiseLimitPoints: '3.00', cashLimit: '2500.00', ownershipStatement: 'I own these items.', holdDays: 10 },
    drawer: null,
  } as unknown as WorkbenchData;
}

beforeEach(() => {
  // The island revalidates its data from the API; answer with the same data it started with.
  vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify(initial()), { headers: { 'content-type': 'application/json' } })));
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('the grading island', () => {
  it('re-prices on every keystroke with the shared engine', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    const line = within(screen.getByTestId('line-1'));
    expect(screen.getByTestId('total-payout').textContent).toBe('$0.00');
    await user.type(line.getByLabelText('Mark'), '14K');
    expect(screen.getByTestId('line-1-reading').textContent).toMatch(/14/);
    await user.type(line.getByLabelText('Gross weight'), '1');
    const oneGram = priceQuote({ currency: 'USD', spot: { gold: '2400.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '1', unit: 'g' } }] });
    expect(screen.getByTestId('total-payout').textContent).toBe(oneGram.totals.payout.formatted);
    await user.type(line.getByLabelText('Gross weight'), '0');
    const tenGrams = priceQuote({ currency: 'USD', spot: { gold: '2400.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '10', unit: 'g' } }] });
    expect(screen.getByTestId('total-payout').textContent).toBe(tenGrams.totals.payout.formatted);
    expect(screen.getByTestId('total-melt').textContent).toBe(tenGrams.totals.meltValue.formatted);
    const line0 = tenGrams.lines[0]!;
    const payPercent = line0.status === 'priced' ? line0.payoutRate.effectivePercentOfMelt : null;
    expect(payPercent).toBe('80.00');
    expect(screen.getByTestId('margin-statement').textContent).toBe(
      `Melt value ${tenGrams.totals.meltValue.formatted}, we pay ${tenGrams.totals.payout.formatted} (${payPercent}% of melt).`,
    );
  });

  it('adds a line with Alt+N and puts the cursor in it; Tab walks the line in the order of the work', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    await user.click(within(screen.getByTestId('line-1')).getByLabelText('Mark'));
    await user.keyboard('{Alt>}n{/Alt}');
    const line2 = within(screen.getByTestId('line-2'));
    expect(document.activeElement).toBe(line2.getByLabelText('Priced by'));
    await user.tab();
    expect(document.activeElement).toBe(line2.getByLabelText('Category'));
    await user.tab();
    expect(document.activeElement).toBe(line2.getByLabelText('Mark'));
    await user.keyboard('925');
    await user.tab();
    expect(document.activeElement).toBe(line2.getByLabelText('Metal'));
    await user.tab();
    await user.tab();
    expect(document.activeElement).toBe(line2.getByLabelText('Gross weight'));
    await user.keyboard('100');
    const expected = priceQuote({ currency: 'USD', spot: { silver: '30.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: '925', grossWeight: { value: '100', unit: 'g' } }] });
    expect(screen.getByTestId('line-2-figures').textContent).toContain(expected.lines[0]!.status === 'priced' ? expected.totals.payout.formatted : 'x');
    expect(screen.getByTestId('line-1-figures').textContent).toMatch(/Enter the gross weight/);
  });

  it('counts coins and says what is missing', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    await user.click(screen.getByRole('button', { name: 'Remove line 1' }));
    await user.click(screen.getByRole('button', { name: 'Add coins or bullion' }));
    const line = within(screen.getByTestId('line-1'));
    expect(screen.getByTestId('line-1-figures').textContent).toMatch(/how many coins/);
    await user.selectOptions(line.getByLabelText('Coin or bullion type'), 'us-90-dime');
    await user.type(line.getByLabelText('Count'), '10');
    const expected = priceQuote({ currency: 'USD', spot: { silver: '30.0000' }, lines: [{ kind: 'coin', coinType: 'us-90-dime', count: 10 }] });
    expect(screen.getByTestId('total-payout').textContent).toBe(expected.totals.payout.formatted);
  });

  it('prices 40% halves by face value on mint weight and says so on the line', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    await user.click(screen.getByRole('button', { name: 'Remove line 1' }));
    await user.click(screen.getByRole('button', { name: 'Add coin by face value' }));
    const line = within(screen.getByTestId('line-1'));
    await user.selectOptions(line.getByLabelText('Coin class'), 'us-40');
    await user.type(line.getByLabelText('Face value'), '10.00');
    const expected = priceQuote({ currency: 'USD', spot: { silver: '30.0000' }, lines: [{ kind: 'face-value', coinClass: 'us-40', faceValue: '10.00', basis: 'mint-weight' }] });
    expect(screen.getByTestId('line-1-figures').textContent).toContain(expected.totals.payout.formatted);
    expect(screen.getByTestId('total-payout').textContent).toBe(expected.totals.payout.formatted);
    expect(screen.getByTestId('line-1-basis').textContent).toMatch(/mint weight/);
  });

  it('prices 90% coin by face value as circulated by default, and on mint weight when the clerk chooses it', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    await user.click(screen.getByRole('button', { name: 'Remove line 1' }));
    await user.click(screen.getByRole('button', { name: 'Add coin by face value' }));
    const line = within(screen.getByTestId('line-1'));
    await user.type(line.getByLabelText('Face value'), '10.00');
    const price = (basis: string) =>
      priceQuote({ currency: 'USD', spot: { silver: '30.0000' }, lines: [{ kind: 'face-value', coinClass: 'us-90', faceValue: '10.00', basis }] }).totals.payout.formatted;
    expect(screen.getByTestId('total-payout').textContent).toBe(price('common-practice'));
    expect(screen.getByTestId('line-1-basis').textContent).toMatch(/circulated, common practice/);
    await user.selectOptions(line.getByLabelText('Counted at'), 'mint-weight');
    expect(screen.getByTestId('total-payout').textContent).toBe(price('mint-weight'));
    expect(screen.getByTestId('line-1-basis').textContent).toMatch(/mint weight/);
  });

  it('shows a mark that fits two metals as needing a test, never as a price', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    const line = within(screen.getByTestId('line-1'));
    await user.type(line.getByLabelText('Mark'), '950');
    await user.type(line.getByLabelText('Gross weight'), '5');
    expect(screen.getByTestId('line-1-reading').textContent).toMatch(/could be/);
    expect(screen.getByTestId('total-payout').textContent).toBe('$0.00');
  });

  it('prices AG 990 as silver and holds 750 silver for a test, never as gold', async () => {
    const user = userEvent.setup();
    render(<TicketWorkbench initial={initial()} />);
    const line = within(screen.getByTestId('line-1'));
    await user.type(line.getByLabelText('Mark'), 'AG 990');
    await user.type(line.getByLabelText('Gross weight'), '10');
    const silver = priceQuote({ currency: 'USD', spot: { silver: '30.0000' }, lines: [{ kind: 'weight', category: 'jewelry', mark: 'AG 990', grossWeight: { value: '10', unit: 'g' } }] });
    expect(silver.totals.payout.formatted).toBe('$6.68');
    expect(screen.getByTestId('total-payout').textContent).toBe('$6.68');
    await user.clear(line.getByLabelText('Mark'));
    await user.type(line.getByLabelText('Mark'), '750 silver');
    expect(screen.getByTestId('line-1-reading').textContent).toMatch(/needs a test/);
    expect(screen.getByTestId('line-1-reading').textContent).toMatch(/tested fineness/);
    expect(screen.getByTestId('total-payout').textContent).toBe('$0.00');
  });

  it('shows the acid-test cautions and defers to the kit maker and local rules', () => {
    render(<TicketWorkbench initial={initial()} />);
    const caution = screen.getByRole('complementary', { name: 'Testing safely' });
    expect(caution.textContent).toMatch(/eye protection/);
    expect(caution.textContent).toMatch(/kit maker/);
  });
});
