import { useState } from 'react';

/** Signs out through Auth.js (CSRF token first, then the sign-out post) and returns to the sign-in page. */
export default function SignOutButton() {
  const [busy, setBusy] = useState(false);
  async function signOut() {
    setBusy(true);
    try {
      const { csrfToken } = (await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string };
      await fetch('/api/auth/signout', {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-auth-return-redirect': '1' },
        body: new URLSearchParams({ csrfToken, callbackUrl: '/signin' }),
      });
    } finally {
      window.location.href = '/signin';
    }
  }
  return (
    <button type="button" onClick={signOut} disabled={busy} className="rounded-md border border-ink-600 px-3 py-1 font-semibold text-ink-100 hover:bg-ink-800">
      {busy ? 'Signing out…' : 'Sign out'}
    </button>
  );
}
