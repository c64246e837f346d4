import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';

const formSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail address').email('Enter a valid e-mail address'),
  password: z.string().min(1, 'Enter your password'),
});
type FormValues = z.infer<typeof formSchema>;

interface Props {
  callbackUrl: string;
}

/** Posts the credentials to Auth.js and shows one message for any failure, so it never tells whether an e-mail exists. */
export default function SignInForm({ callbackUrl }: Props) {
  const [failure, setFailure] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>({ resolver: zodResolver(formSchema) });

  async function onSubmit(values: FormValues) {
    setFailure(null);
    try {
      const { csrfToken } = (await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string };
      const res = await fetch('/api/auth/callback/credentials', {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-auth-return-redirect': '1' },
        body: new URLSearchParams({ ...values, csrfToken, callbackUrl }),
      });
      if (res.status === 429) {
        const body = (await res.json()) as { error: string };
        setFailure(body.error);
        return;
      }
      const body = (await res.json()) as { url?: string };
      const url = new URL(body.url ?? '/signin?error=unknown', window.location.origin);
      if (url.searchParams.has('error')) {
        setFailure('That e-mail and password do not match an active account.');
        return;
      }
      window.location.href = safeRedirect(callbackUrl);
    } catch {
      setFailure('Cupel could not be reached. Check the connection and try again.');
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-5" aria-describedby={failure ? 'signin-failure' : undefined}>
      <div>
        <label htmlFor="email" className="field-label">
          E-mail
        </label>
        <input id="email" type="email" autoComplete="username" className="field-input" aria-invalid={!!errors.email} {...register('email')} />
        {errors.email && <p className="field-error">{errors.email.message}</p>}
      </div>
      <div>
        <label htmlFor="password" className="field-label">
          Password
        </label>
        <input
          id="password"
          type="password"
          autoComplete="current-password"
          className="field-input"
          aria-invalid={!!errors.password}
          {...register('password')}
        />
        {errors.password && <p className="field-error">{errors.password.message}</p>}
      </div>
      {failure && (
        <p id="signin-failure" role="alert" className="rounded-md border border-red-300 bg-red-50 px-3 py-2 font-semibold text-red-900">
          {failure}
        </p>
      )}
      <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </button>
    </form>
  );
}

/** Only same-site paths are followed after sign-in. */
function safeRedirect(target: string): string {
  return target.startsWith('/') && !target.startsWith('//') ? target : '/';
}
