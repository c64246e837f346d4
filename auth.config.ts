import Credentials from '@auth/core/providers/credentials';
import Nodemailer from '@auth/core/providers/nodemailer';
import { CredentialsSignin } from '@auth/core/errors';
import { defineConfig } from 'auth-astro';
import { getDb } from './src/db/client';
import { signInSchema } from './src/features/auth/auth.schema';
import { loadActiveUser, signInWithPassword } from './src/features/auth/users.server';
import { activeSellerByEmail, lazyAdapter, queueSignInLink } from './src/features/auth/portal-sign-in.server';
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
  pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin/check-email' },
  // The adapter holds the e-mail links' verification tokens; sessions stay JWT.
  adapter: lazyAdapter(),
  providers: [
    Nodemailer({
      id: 'nodemailer',
      name: 'E-mail link',
      server: { host: process.env.SMTP_HOST ?? '127.0.0.1', port: Number(process.env.SMTP_PORT ?? 1025) },
      from: process.env.MAIL_FROM ?? 'Cupel <receipts@cupel.invalid>',
      maxAge: 24 * 60 * 60,
      sendVerificationRequest: ({ identifier, url }) => queueSignInLink(identifier, url),
    }),
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
        return { id: result.user.id, name: result.user.name, email: result.user.email, role: result.user.role, storeId: result.user.storeId } as never;
      },
    }),
  ],
  callbacks: {
    async signIn({ user, account, email }) {
      if (account?.provider !== 'nodemailer') return true;
      // Asking for a link: always the same answer; the link itself is only sent to an active seller.
      if (email?.verificationRequest) return true;
      const seller = user.email ? await activeSellerByEmail(getDb(), user.email) : null;
      return !!seller && !!(await loadActiveUser(getDb(), seller.id));
    },
    async jwt({ token, user }) {
      if (user?.id) {
        // The token names the user, their role and store as of sign-in; the middleware reads the user
        // again on every request, so a later change of role, store or activation wins at once.
        const fresh = await loadActiveUser(getDb(), user.id);
        token.uid = user.id;
        token.role = fresh?.role ?? null;
        token.storeId = fresh?.storeId ?? null;
      }
      return token;
    },
    session({ session, token }) {
      if (token.uid && session.user) {
        Object.assign(session.user, { id: String(token.uid), role: token.role ?? null, storeId: token.storeId ?? null });
      }
      return session;
    },
  },
});
