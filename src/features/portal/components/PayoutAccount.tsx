import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';

interface Account {
  sellerId: string;
  storeName: string;
  onboarded: boolean;
  destination: string | null;
  instantAvailable: boolean;
}

/** Where electronic payouts go: set it up at the provider, or see the masked card or bank account. */
export default function PayoutAccount() {
  const { data } = useSWR('/api/portal/payout-account', (u: string) => fetchJson<{ accounts: Account[] }>(u));
  const [message, setMessage] = useState<string | null>(null);
  async function onboard(sellerId: string) {
    setMessage(null);
    try {
      const { url } = await fetchJson<{ url: string }>('/api/portal/payout-account', { method: 'POST', body: JSON.stringify({ sellerId }) });
      window.location.href = url;
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  }
  if (!data) return <p className="text-ink-600">Loading…</p>;
  return (
    <div className="space-y-3">
      {message && (
        <p role="alert" className="field-error">
          {message}
        </p>
      )}
      {data.accounts.map((a) => (
        <div key={a.sellerId} className="rounded-md border border-ink-100 p-3" data-testid="payout-account">
          <p className="font-semibold">{a.storeName}</p>
          {a.onboarded ? (
            <p>
              Payouts go to <strong>{a.destination ?? 'your account'}</strong>
              {a.instantAvailable ? ' (instant payouts available)' : ''}.
            </p>
          ) : (
            <>
              <p className="text-ink-700">No payout account yet. Set one up to be paid electronically instead of cash or check.</p>
              <button type="button" className="btn-primary mt-2" onClick={() => void onboard(a.sellerId)}>
                Set up payout account
              </button>
            </>
          )}
        </div>
      ))}
    </div>
  );
}
