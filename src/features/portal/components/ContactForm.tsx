import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { contactUpdateSchema } from '../portal.schema';

type Contact = z.input<typeof contactUpdateSchema>;
const FIELDS: { name: keyof Contact; label: string; type?: string }[] = [
  { name: 'email', label: 'E-mail', type: 'email' },
  { name: 'phone', label: 'Phone' },
  { name: 'addressLine1', label: 'Address' },
  { name: 'addressLine2', label: 'Address line 2' },
  { name: 'city', label: 'City' },
  { name: 'region', label: 'State or region' },
  { name: 'postalCode', label: 'Postal code' },
];

/** A seller corrects their contact details; name, date of birth and ID are checked at the counter. */
export default function ContactForm({ sellerId, initial }: { sellerId: string; initial: Contact }) {
  const [saved, setSaved] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Contact>({ resolver: zodResolver(contactUpdateSchema), defaultValues: initial });
  async function save(values: Contact) {
    setSaved(null);
    try {
      await fetchJson('/api/portal/contact', { method: 'PUT', body: JSON.stringify({ sellerId, contact: values }) });
      setSaved('Saved.');
    } catch (err) {
      if (err instanceof ApiError) for (const i of err.issues) setError(i.path.replace(/^contact\./, '') as keyof Contact, { message: i.message });
      setSaved(err instanceof ApiError ? err.message : String(err));
    }
  }
  return (
    <form onSubmit={handleSubmit(save)} noValidate className="grid gap-3 sm:grid-cols-2">
      {FIELDS.map((f) => (
        <div key={f.name}>
          <label className="field-label" htmlFor={`contact-${sellerId}-${f.name}`}>
            {f.label}
          </label>
          <input id={`contact-${sellerId}-${f.name}`} type={f.type ?? 'text'} className="field-input" {...register(f.name)} />
          {errors[f.name] && <p className="field-error">{String(errors[f.name]?.message)}</p>}
        </div>
      ))}
      <div className="sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          Save contact details
        </button>
        {saved && (
          <span role="status" className="ml-3 font-semibold">
            {saved}
          </span>
        )}
      </div>
    </form>
  );
}
