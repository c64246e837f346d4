import { useState } from 'react';
import useSWR from 'swr';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { PASSWORD_MIN_LENGTH } from '../password';
import { ROLE_LABELS, type Role } from '../roles';

interface UserRow {
  id: string;
  name: string;
  email: string;
  role: Role;
  storeId: string | null;
  storeName: string | null;
  active: boolean;
}
interface StoreOption {
  id: string;
  name: string;
}

const newStaffSchema = z
  .object({
    name: z.string().trim().min(1, 'Enter a name'),
    email: z.string().trim().email('Enter a valid e-mail address'),
    role: z.enum(['admin', 'manager', 'clerk']),
    storeId: z.string(),
    password: z.string().min(PASSWORD_MIN_LENGTH, `At least ${PASSWORD_MIN_LENGTH} characters`),
  })
  .refine((v) => v.role === 'admin' || v.storeId !== '', { path: ['storeId'], message: 'Choose a store' });
type NewStaff = z.infer<typeof newStaffSchema>;

export default function StaffAdmin({ stores, currentUserId }: { stores: StoreOption[]; currentUserId: string }) {
  const { data, mutate, error } = useSWR('/api/admin/users', (u: string) => fetchJson<{ users: UserRow[] }>(u));
  const [message, setMessage] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<NewStaff>({ resolver: zodResolver(newStaffSchema), defaultValues: { role: 'clerk', storeId: stores[0]?.id ?? '' } });

  async function create(values: NewStaff) {
    setMessage(null);
    try {
      await fetchJson('/api/admin/users', { method: 'POST', body: JSON.stringify({ ...values, storeId: values.storeId || null }) });
      reset({ role: 'clerk', storeId: stores[0]?.id ?? '', name: '', email: '', password: '' });
      setMessage(`Account created for ${values.email}.`);
      await mutate();
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) setError('email', { message: 'An account with this e-mail already exists' });
      else setMessage(err instanceof Error ? err.message : String(err));
    }
  }

  async function toggleActive(u: UserRow) {
    setMessage(null);
    try {
      await fetchJson(`/api/admin/users/${u.id}`, { method: 'PATCH', body: JSON.stringify({ active: !u.active }) });
      setMessage(`${u.name} is now ${u.active ? 'deactivated' : 'active'}.`);
      await mutate();
    } catch (err) {
      setMessage(err instanceof Error ? err.message : String(err));
    }
  }

  async function resetPassword(u: UserRow) {
    const password = window.prompt(`New password for ${u.name} (at least ${PASSWORD_MIN_LENGTH} characters)`);
    if (!password) return;
    try {
      await fetchJson(`/api/admin/users/${u.id}/password`, { method: 'POST', body: JSON.stringify({ password }) });
      setMessage(`Password reset for ${u.name}.`);
    } catch (err) {
      setMessage(err instanceof Error ? err.message : String(err));
    }
  }

  return (
    <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
      <section className="card" aria-labelledby="accounts-heading">
        <h2 id="accounts-heading" className="text-lg font-bold">
          Accounts
        </h2>
        {message && (
          <p role="status" className="mt-2 rounded-md bg-crucible-50 px-3 py-2 text-ink-900">
            {message}
          </p>
        )}
        {error && <p className="field-error">Could not load accounts: {String(error.message)}</p>}
        <table className="mt-3 w-full text-left text-sm">
          <thead className="text-ink-600">
            <tr>
              <th className="py-1">Name</th>
              <th>Role</th>
              <th>Store</th>
              <th>State</th>
              <th>
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {(data?.users ?? []).map((u) => (
              <tr key={u.id} className="border-t border-ink-100 align-top">
                <td className="py-2">
                  <div className="font-semibold">{u.name}</div>
                  <div className="text-ink-600">{u.email}</div>
                </td>
                <td className="py-2">{ROLE_LABELS[u.role]}</td>
                <td className="py-2">{u.storeName ?? 'All stores'}</td>
                <td className="py-2">{u.active ? 'Active' : 'Deactivated'}</td>
                <td className="space-x-2 py-2 text-right whitespace-nowrap">
                  {u.role !== 'seller' && (
                    <button type="button" className="btn-quiet px-2 py-1 text-sm" onClick={() => resetPassword(u)}>
                      Reset password
                    </button>
                  )}
                  {u.id !== currentUserId && (
                    <button type="button" className="btn-quiet px-2 py-1 text-sm" onClick={() => toggleActive(u)}>
                      {u.active ? 'Deactivate' : 'Reactivate'}
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section className="card" aria-labelledby="new-staff-heading">
        <h2 id="new-staff-heading" className="text-lg font-bold">
          New staff account
        </h2>
        <form onSubmit={handleSubmit(create)} noValidate className="mt-3 space-y-4">
          <div>
            <label htmlFor="staff-name" className="field-label">
              Name
            </label>
            <input id="staff-name" className="field-input" {...register('name')} />
            {errors.name && <p className="field-error">{errors.name.message}</p>}
          </div>
          <div>
            <label htmlFor="staff-email" className="field-label">
              E-mail
            </label>
            <input id="staff-email" type="email" className="field-input" {...register('email')} />
            {errors.email && <p className="field-error">{errors.email.message}</p>}
          </div>
          <div>
            <label htmlFor="staff-role" className="field-label">
              Role
            </label>
            <select id="staff-role" className="field-input" {...register('role')}>
              <option value="clerk">Counter clerk</option>
              <option value="manager">Manager</option>
              <option value="admin">Administrator</option>
            </select>
          </div>
          <div>
            <label htmlFor="staff-store" className="field-label">
              Store
            </label>
            <select id="staff-store" className="field-input" {...register('storeId')}>
              <option value="">All stores (administrators only)</option>
              {stores.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
            {errors.storeId && <p className="field-error">{errors.storeId.message}</p>}
          </div>
          <div>
            <label htmlFor="staff-password" className="field-label">
              First password
            </label>
            <input id="staff-password" type="password" autoComplete="new-password" className="field-input" {...register('password')} />
            {errors.password && <p className="field-error">{errors.password.message}</p>}
          </div>
          <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>
            Create account
          </button>
        </form>
      </section>
    </div>
  );
}
