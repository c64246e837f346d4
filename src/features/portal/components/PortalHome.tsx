import useSWR from 'swr';
import { fetchJson } from '@/lib/client/fetch-json';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';

interface Settlement {
  id: string;
  reference: string;
  storeName: string;
  state: string;
  stateLabel: string;
  currency: string;
  meltValueMinor: number;
  payoutMinor: number;
  acceptedAt: string | null;
  paidAt: string | null;
  holdUntil: string | null;
  payments: { kind: string; method: string; state: string; amountMinor: number; failureReason: string | null; createdAt: string }[];
}

const METHOD = { cash: 'Cash', check: 'Check', electronic: 'Electronic payout' } as Record<string, string>;
const PAYMENT_STATE = { pending: 'on its way', completed: 'paid', failed: 'failed' } as Record<string, string>;

/** The seller's own settlements, fetched in the browser from Cupel's API. */
export default function PortalHome() {
  const { data, error, isLoading } = useSWR('/api/portal/tickets', (u: string) => fetchJson<{ settlements: Settlement[] }>(u), { refreshInterval: 10_000 });
  if (error) return <p role="alert" className="field-error">Your settlements could not be loaded: {String(error.message)}</p>;
  if (isLoading || !data) return <p className="text-ink-600">Loading your settlements…</p>;
  if (data.settlements.length === 0) return <p className="text-ink-600">No settlements yet. After you accept an offer at the counter, it appears here.</p>;
  return (
    <ul className="divide-y divide-ink-100" data-testid="settlements">
      {data.settlements.map((s) => {
        const fmt = (m: number) => moneyOf(m, s.currency as CurrencyCode).formatted;
        const payout = s.payments.filter((p) => p.kind === 'payout').at(-1);
        return (
          <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 py-3" data-testid={`settlement-${s.reference}`}>
            <div>
              <a className="font-semibold underline" href={`/portal/tickets/${s.id}`}>
                {s.reference}
              </a>{' '}
              <span className="text-ink-600">· {s.storeName}</span>
              <div className="text-sm text-ink-700">
                {s.stateLabel}
                {payout && (
                  <>
                    {' '}
                    · {METHOD[payout.method] ?? payout.method} {PAYMENT_STATE[payout.state] ?? payout.state}
                    {payout.state === 'failed' && payout.failureReason ? `: ${payout.failureReason}` : ''}
                  </>
                )}
                {s.holdUntil && s.state === 'paid' ? ` · items held until ${s.holdUntil}` : ''}
              </div>
            </div>
            <div className="text-right">
              <div className="text-lg font-bold">{fmt(s.payoutMinor)}</div>
              <div className="text-sm text-ink-600">of {fmt(s.meltValueMinor)} melt value</div>
            </div>
          </li>
        );
      })}
    </ul>
  );
}
