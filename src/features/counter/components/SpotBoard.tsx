import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { METALS, METAL_LABELS, type Metal } from '@/features/pricing/metals';
import { displaySpot } from '../counter';

interface Board {
  spots: Partial<Record<Metal, { pricePerTroyOunce: string; enteredAt: string; enteredByName: string | null; stale: boolean }>>;
  staleAfterMinutes: number;
  history: { id: string; metal: Metal; pricePerTroyOunce: string; currency: string; enteredAt: string; enteredByName: string | null }[];
}

const time = new Intl.DateTimeFormat('en-US', { dateStyle: 'short', timeStyle: 'short' });

/** Today's spot per troy ounce: entered by hand, each entry kept with who and when. */
export default function SpotBoard({ currency }: { currency: string }) {
  const { data, mutate } = useSWR<Board>('/api/spot', (u: string) => fetchJson<Board>(u), { refreshInterval: 60_000 });
  const [values, setValues] = useState<Partial<Record<Metal, string>>>({});
  const [errors, setErrors] = useState<Partial<Record<Metal, string>>>({});
  const [saved, setSaved] = useState<string | null>(null);

  async function enter(metal: Metal) {
    setErrors((e) => ({ ...e, [metal]: undefined }));
    setSaved(null);
    try {
      const r = await fetchJson<{ repricedTickets: number }>('/api/spot', { method: 'POST', body: JSON.stringify({ metal, pricePerTroyOunce: values[metal] ?? '' }) });
      setValues((v) => ({ ...v, [metal]: '' }));
      setSaved(`${METAL_LABELS[metal]} spot saved; ${r.repricedTickets} open ticket(s) re-priced.`);
      await mutate();
    } catch (err) {
      setErrors((e) => ({ ...e, [metal]: err instanceof ApiError ? err.message : String(err) }));
    }
  }

  return (
    <section className="card" aria-labelledby="spot-heading">
      <h2 id="spot-heading" className="text-lg font-bold">
        Today's spot ({currency} per troy ounce)
      </h2>
      <p className="text-sm text-ink-600">A spot older than {data?.staleAfterMinutes ?? '…'} minutes must be entered again before a quote.</p>
      {saved && (
        <p role="status" className="mt-2 rounded-md bg-emerald-50 px-2 py-1 text-sm font-semibold text-emerald-900">
          {saved}
        </p>
      )}
      <div className="mt-3 grid gap-3 sm:grid-cols-2">
        {METALS.map((metal) => {
          const s = data?.spots[metal];
          return (
            <form
              key={metal}
              className="rounded-md border border-ink-100 p-3"
              onSubmit={(e) => {
                e.preventDefault();
                void enter(metal);
              }}
            >
              <div className="flex items-baseline justify-between">
                <span className="font-semibold">{METAL_LABELS[metal]}</span>
                <span className={s?.stale ? 'text-sm font-semibold text-red-800' : 'text-sm text-ink-600'} data-testid={`spot-${metal}`}>
                  {s ? `${displaySpot(s.pricePerTroyOunce)}${s.stale ? ' · stale' : ''}` : 'not entered'}
                </span>
              </div>
              <div className="mt-2 flex gap-2">
                <label className="sr-only" htmlFor={`spot-input-${metal}`}>
                  {METAL_LABELS[metal]} spot per troy ounce
                </label>
                <input
                  id={`spot-input-${metal}`}
                  className="field-input mt-0"
                  inputMode="decimal"
                  placeholder="per ozt"
                  value={values[metal] ?? ''}
                  onChange={(e) => setValues((v) => ({ ...v, [metal]: e.target.value }))}
                />
                <button type="submit" className="btn-primary">
                  Enter
                </button>
              </div>
              {errors[metal] && <p className="field-error">{errors[metal]}</p>}
              {s && <p className="mt-1 text-xs text-ink-600">by {s.enteredByName ?? 'unknown'}, {time.format(new Date(s.enteredAt))}</p>}
            </form>
          );
        })}
      </div>
      <details className="mt-3">
        <summary className="cursor-pointer text-sm font-semibold">Spot history</summary>
        <table className="mt-2 w-full text-left text-sm">
          <thead className="text-ink-600">
            <tr>
              <th>When</th>
              <th>Metal</th>
              <th>Per ozt</th>
              <th>By</th>
            </tr>
          </thead>
          <tbody>
            {(data?.history ?? []).map((h) => (
              <tr key={h.id} className="border-t border-ink-100">
                <td>{time.format(new Date(h.enteredAt))}</td>
                <td>{METAL_LABELS[h.metal]}</td>
                <td>
                  {displaySpot(h.pricePerTroyOunce)} {h.currency}
                </td>
                <td>{h.enteredByName}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </section>
  );
}
