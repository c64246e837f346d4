import { useState } from 'react';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';
import type { PayoutAttention as Attention } from '../review.server';

const fmt = (m: number, c: string) => moneyOf(m, c as CurrencyCode).formatted;

/** The review page's list of electronic money that needs a manager: payouts on closed tickets and reversals not yet confirmed. */
export default function PayoutAttention({ initial, timeZone }: { initial: Attention; timeZone: string }) {
  const when = (iso: string) => new Date(iso).toLocaleString('en-US', { dateStyle: 'medium', timeStyle: 'short', timeZone });
  const [data, setData] = useState(initial);
  const [notes, setNotes] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState<string | null>(null);

  async function act(id: string, url: string, body: unknown, ok: string, drop: 'exception' | 'reversal' | null) {
    setMessage(null);
    setBusy(id);
    try {
      const result = await fetchJson<{ state?: string }>(url, { method: 'POST', body: JSON.stringify(body) });
      setMessage(result.state === 'pending' ? 'The provider has not confirmed yet; the reversal stays pending and is asked again.' : ok);
      if (drop === 'exception') setData((d) => ({ ...d, exceptions: d.exceptions.filter((e) => e.id !== id) }));
      if (drop === 'reversal' || result.state === 'completed') setData((d) => ({ ...d, reversals: d.reversals.filter((r) => r.id !== id) }));
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    } finally {
      setBusy(null);
    }
  }

  const noteField = (id: string, label: string) => (
    <div className="mt-2">
      <label className="field-label" htmlFor={`note-${id}`}>
        {label}
      </label>
      <textarea id={`note-${id}`} className="field-input" rows={2} maxLength={500} value={notes[id] ?? ''} onChange={(e) => setNotes((n) => ({ ...n, [id]: e.target.value }))} />
    </div>
  );

  if (!data.exceptions.length && !data.reversals.length) {
    return <p className="mt-2 text-ink-600">No electronic payout needs a decision.</p>;
  }
  return (
    <div>
      {message && (
        <p role="status" className="mt-2 text-sm font-semibold">
          {message}
        </p>
      )}
      {data.exceptions.map((e) => (
        <article key={e.id} className="mt-3 rounded border border-red-300 bg-red-50 p-3" data-testid="payout-exception">
          <h3 className="font-bold text-red-900">
            Payout on {e.reference} ({e.ticketState}): {fmt(e.amountMinor, e.currency)}
          </h3>
          <p className="text-sm">{e.message}</p>
          <p className="text-xs text-ink-600">Raised {when(e.raisedAt)}</p>
          {noteField(e.id, 'What was done (required)')}
          <div className="mt-2 flex flex-wrap gap-2">
            <button type="button" className="btn-primary" disabled={busy === e.id} onClick={() => void act(e.id, `/api/payment-exceptions/${e.id}`, { action: 'reverse', note: notes[e.id] ?? '' }, 'Reversal asked of the provider.', 'exception')}>
              Take it back through the provider
            </button>
            <button type="button" className="btn-quiet" disabled={busy === e.id} onClick={() => void act(e.id, `/api/payment-exceptions/${e.id}`, { action: 'recovered', note: notes[e.id] ?? '' }, 'Recovery recorded.', 'exception')}>
              Money came back another way
            </button>
            <button type="button" className="btn-quiet" disabled={busy === e.id} onClick={() => void act(e.id, `/api/payment-exceptions/${e.id}`, { action: 'resolve', note: notes[e.id] ?? '' }, 'Exception closed.', 'exception')}>
              Close with this note
            </button>
          </div>
        </article>
      ))}
      {data.reversals.map((r) => (
        <article key={r.id} className="mt-3 rounded border border-amber-300 bg-amber-50 p-3" data-testid="pending-reversal">
          <h3 className="font-bold">
            Reversal pending on {r.reference}: {fmt(r.amountMinor, r.currency)} not yet returned
          </h3>
          <p className="text-sm">
            {r.lastError ? `Last answer: ${r.lastError.replace(/\.+$/, '')}. ` : ''}
            {r.nextSendAt ? `Asked again automatically from ${when(r.nextSendAt)}.` : 'Waiting for a manager.'} Tries: {r.sendAttempts}.
          </p>
          {noteField(r.id, 'How the money came back (for a recovery)')}
          <div className="mt-2 flex flex-wrap gap-2">
            <button type="button" className="btn-quiet" disabled={busy === r.id} onClick={() => void act(r.id, `/api/reversals/${r.id}`, { action: 'retry' }, 'The provider confirmed the reversal.', null)}>
              Ask the provider again
            </button>
            <button type="button" className="btn-primary" disabled={busy === r.id} onClick={() => void act(r.id, `/api/reversals/${r.id}`, { action: 'recovered', note: notes[r.id] ?? '' }, 'Recovery recorded.', 'reversal')}>
              Record money recovered
            </button>
          </div>
        </article>
      ))}
    </div>
  );
}
