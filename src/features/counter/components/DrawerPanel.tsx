import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';

interface DrawerState {
  mine: { id: string; floatMinor: number; balanceMinor: number; openedAt: string } | null;
  store?: { id: string; clerkName: string | null; floatMinor: number; balanceMinor: number; openedAt: string; closedAt: string | null; countedMinor: number | null; expectedMinor: number | null }[];
}

/** The clerk's cash drawer; managers also see and close the store's drawers. */
export default function DrawerPanel({ currency, role }: { currency: string; role: string }) {
  const { data, mutate } = useSWR<DrawerState>('/api/drawers', (u: string) => fetchJson<DrawerState>(u));
  const [float, setFloat] = useState('');
  const [counts, setCounts] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const fmt = (m: number) => moneyOf(m, currency as CurrencyCode).formatted;

  async function act(fn: () => Promise<unknown>, ok: string) {
    setMessage(null);
    try {
      await fn();
      setMessage(ok);
      await mutate();
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  }

  return (
    <section className="card" aria-labelledby="drawer-heading">
      <h2 id="drawer-heading" className="text-lg font-bold">
        Cash drawer
      </h2>
      {message && (
        <p role="status" className="mt-1 text-sm font-semibold">
          {message}
        </p>
      )}
      {data?.mine ? (
        <p className="mt-2" data-testid="drawer-balance">
          Open since {new Date(data.mine.openedAt).toLocaleTimeString('en-US')} · float {fmt(data.mine.floatMinor)} · holds <strong>{fmt(data.mine.balanceMinor)}</strong>
        </p>
      ) : (
        <form
          className="mt-2 flex items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void act(() => fetchJson('/api/drawers', { method: 'POST', body: JSON.stringify({ float }) }), 'Drawer opened.');
          }}
        >
          <div>
            <label className="field-label" htmlFor="drawer-float">
              Opening float ({currency})
            </label>
            <input id="drawer-float" className="field-input" inputMode="decimal" value={float} onChange={(e) => setFloat(e.target.value)} />
          </div>
          <button type="submit" className="btn-primary">
            Open drawer
          </button>
        </form>
      )}
      {role !== 'clerk' && data?.store && data.store.length > 0 && (
        <table className="mt-3 w-full text-left text-sm">
          <thead className="text-ink-600">
            <tr>
              <th>Clerk</th>
              <th>Float</th>
              <th>Expected</th>
              <th>Closed</th>
            </tr>
          </thead>
          <tbody>
            {data.store.map((dr) => (
              <tr key={dr.id} className="border-t border-ink-100 align-top">
                <td className="py-1">{dr.clerkName}</td>
                <td>{fmt(dr.floatMinor)}</td>
                <td>{fmt(dr.balanceMinor)}</td>
                <td>
                  {dr.closedAt ? (
                    <>counted {fmt(dr.countedMinor!)} ({fmt(dr.countedMinor! - dr.expectedMinor!)} over/short)</>
                  ) : (
                    <form
                      className="flex gap-1"
                      onSubmit={(e) => {
                        e.preventDefault();
                        void act(() => fetchJson(`/api/drawers/${dr.id}/close`, { method: 'POST', body: JSON.stringify({ counted: counts[dr.id] ?? '' }) }), 'Drawer closed.');
                      }}
                    >
                      <label className="sr-only" htmlFor={`count-${dr.id}`}>
                        Counted cash
                      </label>
                      <input id={`count-${dr.id}`} className="field-input mt-0 w-28 py-1" placeholder="counted" value={counts[dr.id] ?? ''} onChange={(e) => setCounts((c) => ({ ...c, [dr.id]: e.target.value }))} />
                      <button type="submit" className="btn-quiet px-2 py-1">
                        Close
                      </button>
                    </form>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
