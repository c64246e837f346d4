import { useState } from 'react';
import useSWR from 'swr';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { ID_TYPE_LABELS, maskIdNumber } from '@/features/sellers/sellers';
import { sellerInputSchema } from '../counter.schema';

interface SellerHit {
  id: string;
  legalName: string;
  phone: string | null;
  email: string | null;
  idType: string;
  idNumber: string;
  idExpiry: string;
  doNotBuy: boolean;
  city: string;
}

type SellerForm = z.input<typeof sellerInputSchema>;

const FIELDS: { name: keyof SellerForm; label: string; type?: string; span?: boolean }[] = [
  { name: 'legalName', label: 'Legal name (as on the ID)', span: true },
  { name: 'dateOfBirth', label: 'Date of birth', type: 'date' },
  { name: 'phone', label: 'Phone' },
  { name: 'email', label: 'E-mail', type: 'email' },
  { name: 'idNumber', label: 'ID number' },
  { name: 'idIssuingRegion', label: 'ID issued by (state, province or country)' },
  { name: 'idExpiry', label: 'ID expiry', type: 'date' },
  { name: 'addressLine1', label: 'Address', span: true },
  { name: 'addressLine2', label: 'Address line 2', span: true },
  { name: 'city', label: 'City' },
  { name: 'region', label: 'State or region' },
  { name: 'postalCode', label: 'Postal code' },
  { name: 'country', label: 'Country (2 letters)' },
];

/** Find the seller (name, phone or ID number) or record a new one, then start a ticket. */
export default function SellerDesk({ role, acceptedIdTypes }: { role: string; acceptedIdTypes: string[] }) {
  const [query, setQuery] = useState('');
  const [creating, setCreating] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const [overrideFor, setOverrideFor] = useState<string | null>(null);
  const [overrideReason, setOverrideReason] = useState('');
  const { data } = useSWR(query.trim().length >= 2 ? `/api/sellers?q=${encodeURIComponent(query.trim())}` : null, (u: string) => fetchJson<{ sellers: SellerHit[] }>(u), {
    keepPreviousData: true,
  });
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<SellerForm>({ resolver: zodResolver(sellerInputSchema), defaultValues: { idType: 'drivers-license', country: 'US' } });

  async function startTicket(sellerId: string, reason?: string) {
    setMessage(null);
    try {
      const { ticket } = await fetchJson<{ ticket: { id: string } }>('/api/tickets', {
        method: 'POST',
        body: JSON.stringify({ sellerId, doNotBuyOverrideReason: reason ?? null }),
      });
      window.location.href = `/counter/tickets/${ticket.id}`;
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  }

  async function create(values: SellerForm) {
    setMessage(null);
    try {
      const { seller } = await fetchJson<{ seller: { id: string } }>('/api/sellers', { method: 'POST', body: JSON.stringify(values) });
      await startTicket(seller.id);
    } catch (err) {
      if (err instanceof ApiError && err.issues.length) {
        for (const issue of err.issues) setError(issue.path as keyof SellerForm, { message: issue.message });
      }
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  }

  return (
    <section className="card" aria-labelledby="seller-desk-heading">
      <h2 id="seller-desk-heading" className="text-lg font-bold">
        Serve a seller
      </h2>
      <p className="text-sm text-ink-600">Check the seller's government photo ID before buying. Local law decides which IDs and ages are accepted; this store's rules apply.</p>
      {message && (
        <p role="alert" className="mt-2 rounded-md border border-red-300 bg-red-50 px-3 py-2 text-sm font-semibold text-red-900">
          {message}
        </p>
      )}
      <div className="mt-3">
        <label className="field-label" htmlFor="seller-search">
          Find a seller by name, phone or ID number
        </label>
        <input id="seller-search" className="field-input" autoComplete="off" value={query} onChange={(e) => setQuery(e.target.value)} />
      </div>
      {data && query.trim().length >= 2 && (
        <ul className="mt-2 divide-y divide-ink-100" aria-label="Matching sellers">
          {data.sellers.length === 0 && <li className="py-2 text-sm text-ink-600">No seller on file matches.</li>}
          {data.sellers.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
              <div>
                <span className="font-semibold">{s.legalName}</span>
                <span className="text-sm text-ink-600">
                  {' '}
                  · {ID_TYPE_LABELS[s.idType]} {maskIdNumber(s.idNumber)} · {s.city}
                </span>
                {s.doNotBuy && <span className="ml-2 rounded bg-red-100 px-1.5 text-sm font-bold text-red-900">Do not buy</span>}
              </div>
              {s.doNotBuy && role !== 'clerk' ? (
                overrideFor === s.id ? (
                  <form
                    className="flex gap-1"
                    onSubmit={(e) => {
                      e.preventDefault();
                      void startTicket(s.id, overrideReason);
                    }}
                  >
                    <label className="sr-only" htmlFor={`override-${s.id}`}>
                      Reason for overriding do not buy
                    </label>
                    <input id={`override-${s.id}`} className="field-input mt-0 py-1" placeholder="reason for override" value={overrideReason} onChange={(e) => setOverrideReason(e.target.value)} />
                    <button type="submit" className="btn-primary px-2 py-1">
                      Override
                    </button>
                  </form>
                ) : (
                  <button type="button" className="btn-quiet px-2 py-1" onClick={() => setOverrideFor(s.id)}>
                    Override as manager…
                  </button>
                )
              ) : (
                <button type="button" className="btn-primary px-3 py-1" onClick={() => void startTicket(s.id)}>
                  Start ticket
                </button>
              )}
            </li>
          ))}
        </ul>
      )}
      <div className="mt-4">
        {!creating ? (
          <button type="button" className="btn-quiet" onClick={() => setCreating(true)}>
            New seller…
          </button>
        ) : (
          <form onSubmit={handleSubmit(create)} noValidate className="grid gap-3 sm:grid-cols-2" aria-label="New seller">
            <div className="sm:col-span-2">
              <label className="field-label" htmlFor="seller-idType">
                ID document
              </label>
              <select id="seller-idType" className="field-input" {...register('idType')}>
                {Object.entries(ID_TYPE_LABELS).map(([value, label]) => (
                  <option key={value} value={value}>
                    {label}
                    {acceptedIdTypes.includes(value) ? '' : ' (not accepted by this store)'}
                  </option>
                ))}
              </select>
            </div>
            {FIELDS.map((f) => (
              <div key={f.name} className={f.span ? 'sm:col-span-2' : ''}>
                <label className="field-label" htmlFor={`seller-${f.name}`}>
                  {f.label}
                </label>
                <input id={`seller-${f.name}`} type={f.type ?? 'text'} className="field-input" aria-invalid={!!errors[f.name]} {...register(f.name)} />
                {errors[f.name] && <p className="field-error">{String(errors[f.name]?.message)}</p>}
              </div>
            ))}
            <div className="flex gap-2 sm:col-span-2">
              <button type="submit" className="btn-primary" disabled={isSubmitting}>
                Save seller and start ticket
              </button>
              <button type="button" className="btn-quiet" onClick={() => setCreating(false)}>
                Cancel
              </button>
            </div>
          </form>
        )}
      </div>
    </section>
  );
}
