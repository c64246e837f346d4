import { useState } from 'react';

/** Sellers sign in with a link sent by e-mail. The answer is the same whether or not the address is known. */
export default function EmailLinkForm() {
  const [email, setEmail] = useState('');
  const [state, setState] = useState<'idle' | 'sending' | 'error'>('idle');
  async function send(e: React.FormEvent) {
    e.preventDefault();
    if (!/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(email.trim())) {
      setState('error');
      return;
    }
    setState('sending');
    try {
      const { csrfToken } = (await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string };
      await fetch('/api/auth/signin/nodemailer', {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-auth-return-redirect': '1' },
        body: new URLSearchParams({ email: email.trim(), csrfToken, callbackUrl: '/portal' }),
      });
      window.location.href = '/signin/check-email';
    } catch {
      setState('error');
    }
  }
  return (
    <form onSubmit={send} noValidate className="space-y-3">
      <div>
        <label htmlFor="link-email" className="field-label">
          Your e-mail address
        </label>
        <input id="link-email" type="email" autoComplete="email" className="field-input" value={email} onChange={(e) => setEmail(e.target.value)} />
        {state === 'error' && <p className="field-error">Enter the e-mail address the store has on file.</p>}
      </div>
      <button type="submit" className="btn-quiet w-full" disabled={state === 'sending'}>
        {state === 'sending' ? 'Sending…' : 'E-mail me a sign-in link'}
      </button>
    </form>
  );
}
