import useSWR from 'swr';
import { fetchJson } from '@/lib/client/fetch-json';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';
import { percentOfMelt } from '../ticket-pricing';
import type { WorkbenchData } from '../workbench.server';

/** What the seller sees on the second screen: every line and the margin stated plainly, in large type. */
export default function SellerView({ initial }: { initial: WorkbenchData }) {
  const { data } = useSWR<WorkbenchData>(`/api/tickets/${initial.ticket.id}/workbench`, (u: string) => fetchJson<WorkbenchData>(u), {
    fallbackData: initial,
    refreshInterval: 2000,
  });
  const d = data ?? initial;
  const qr = d.ticket.state === 'accepted' && !d.seller.payoutAccount.onboarded ? d.seller.payoutAccount.onboardingQrSvg : null;
  const fmt = (m: number) => moneyOf(m, d.ticket.currency as CurrencyCode).formatted;
  const pct = percentOfMelt(d.ticket.payoutMinor, d.ticket.meltValueMinor);
  return (
    <div className="mx-auto max-w-4xl text-xl">
      <p className="text-base text-ink-600">
        {d.seller.legalName} · ticket {d.ticket.reference} · {d.ticket.stateLabel}
      </p>
      <table className="mt-4 w-full text-left">
        <thead className="text-base text-ink-600">
          <tr>
            <th className="py-2">Item</th>
            <th className="text-right">Melt value</th>
            <th className="text-right">We pay</th>
          </tr>
        </thead>
        <tbody>
          {d.ticket.lines.map((l, i) => (
            <tr key={i} className="border-t border-ink-200">
              <td className="py-3">{l.description}</td>
              <td className="text-right">{l.pricingProblem ? '—' : fmt(l.meltValueMinor)}</td>
              <td className="text-right font-semibold">{l.pricingProblem ? 'being checked' : fmt(l.payoutMinor)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-8 rounded-lg bg-crucible-50 p-6 text-3xl leading-snug" data-testid="seller-margin-statement">
        Melt value <strong>{fmt(d.ticket.meltValueMinor)}</strong>, we pay <strong>{fmt(d.ticket.payoutMinor)}</strong>
        {pct ? ` (${pct}% of melt)` : ''}.
      </p>
      {qr && (
        <div className="mt-6 flex items-center gap-6 rounded-lg border border-ink-200 p-4" data-testid="onboarding-qr">
          <img src={`data:image/svg+xml;base64,${btoa(qr)}`} alt="QR code: set up your payout account" width={220} height={220} />
          <p className="text-xl">Scan with your phone to set up where we pay you. The same link was e-mailed to you.</p>
        </div>
      )}
      <p className="mt-4 text-base text-ink-700">
        Melt value is the fine metal in your items at today's spot price. The difference, {fmt(d.ticket.marginMinor)}, is the store's margin for testing, holding and refining. Prices follow the
        spot: if it changes before you accept, the offer changes with it.
      </p>
    </div>
  );
}
