import { useState } from 'react';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { PASSWORD_MIN_LENGTH } from '@/features/auth/password';

/** A seller may set a password, to sign in without waiting for an e-mail link. */
export default function PasswordForm() {
  const [password, setPassword] = useState('');
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  async function save(e: React.FormEvent) {
    e.preventDefault();
    setMessage(null);
    try {
      await fetchJson('/api/portal/password', { method: 'POST', body: JSON.stringify({ password }) });
      setPassword('');
      setMessage({ ok: true, text: 'Password set. You can now sign in with your e-mail and this password.' });
    } catch (err) {
      setMessage({ ok: false, text: err instanceof ApiError ? err.message : String(err) });
    }
  }
  return (
    <form onSubmit={save} noValidate className="flex flex-wrap items-end gap-3">
      <div>
        <label className="field-label" htmlFor="portal-password">
          New password (at least {PASSWORD_MIN_LENGTH} characters)
        </label>
        <input id="portal-password" type="password" autoComplete="new-password" className="field-input" value={password} onChange={(e) => setPassword(e.target.value)} />
      </div>
      <button type="submit" className="btn-primary">
        Set password
      </button>
      {message && (
        <p role={message.ok ? 'status' : 'alert'} className={message.ok ? 'w-full font-semibold text-emerald-900' : 'field-error w-full'}>
          {message.text}
        </p>
      )}
    </form>
  );
}
