import Credentials from '@auth/core/providers/credentials';
import { CredentialsSignin } from '@auth/core/errors';
import { defineConfig } from 'auth-astro';
import { getDb } from './src/db/client';
import { signInSchema } from './src/features/auth/auth.schema';
import { signInWithPassword } from './src/features/auth/users.server';
import { currentClientAddress } from './src/lib/server/request-context';

class ThrottledSignIn extends CredentialsSignin {
  override code = 'throttled';
}

const authUrl = process.env.AUTH_URL ?? '';

export default defineConfig({
  secret: process.env.AUTH_SECRET,
  trustHost: true,
  // Credentials sign-in needs JWT sessions; the middleware re-reads the user on every request,
  // so a deactivated account or a changed role takes effect at once, not when the token expires.
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  useSecureCookies: authUrl.startsWith('https://'),
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      id: 'credentials',
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      async authorize(raw) {
        const parsed = signInSchema.safeParse(raw);
        if (!parsed.success) return null;
        const result = await signInWithPassword(getDb(), parsed.data.email, parsed.data.password, currentClientAddress());
        if (result.status === 'throttled') throw new ThrottledSignIn();
        if (result.status === 'invalid') return null;
        return { id: result.user.id, name: result.user.name, email: result.user.email };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user?.id) token.uid = user.id;
      return token;
    },
    session({ session, token }) {
      if (token.uid && session.user) (session.user as { id?: string }).id = String(token.uid);
      return session;
    },
  },
});
