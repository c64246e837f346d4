import { defineMiddleware } from 'astro:middleware';
import { getSession } from 'auth-astro/server';
import { getDb } from '@/db/client';
import { homePathFor, rolesForPage } from '@/features/auth/roles';
import { loadActiveUser } from '@/features/auth/users.server';
import { THROTTLE_WINDOW_MINUTES } from '@/features/auth/throttle.server';
import { json } from '@/lib/http';
import { requestContext } from '@/lib/server/request-context';

const PUBLIC_PREFIXES = ['/_astro/', '/favicon', '/fonts/'];

export const onRequest = defineMiddleware((context, next) => {
  let clientAddress = 'unknown';
  try {
    clientAddress = context.clientAddress;
  } catch {
    // prerendered pages have no client address
  }
  return requestContext.run({ clientAddress }, async () => {
    const { pathname } = context.url;
    context.locals.user = null;

    if (PUBLIC_PREFIXES.some((p) => pathname.startsWith(p))) return next();

    if (pathname.startsWith('/api/auth/')) {
      const response = await next();
      if (pathname === '/api/auth/callback/credentials' && (await wasThrottled(response))) {
        return json(
          { error: `Too many failed sign-ins. Wait ${THROTTLE_WINDOW_MINUTES} minutes and try again.` },
          429,
          { 'retry-after': String(THROTTLE_WINDOW_MINUTES * 60) },
        );
      }
      return response;
    }

    const session = await getSession(context.request);
    const userId = (session?.user as { id?: string } | undefined)?.id;
    if (userId) context.locals.user = await loadActiveUser(getDb(), userId);
    const user = context.locals.user;

    if (pathname.startsWith('/api/')) return next();

    if (pathname === '/') {
      return context.redirect(user ? homePathFor(user.role) : '/signin');
    }
    if (pathname === '/signin' && user) return context.redirect(homePathFor(user.role));

    const roles = rolesForPage(pathname);
    if (roles) {
      if (!user) return context.redirect(`/signin?callbackUrl=${encodeURIComponent(pathname + context.url.search)}`);
      if (!roles.includes(user.role)) return context.rewrite('/403');
    }
    return next();
  });
});

async function wasThrottled(response: Response): Promise<boolean> {
  const location = response.headers.get('location') ?? '';
  if (location.includes('code=throttled')) return true;
  if ((response.headers.get('content-type') ?? '').includes('application/json')) {
    const body = (await response.clone().json().catch(() => null)) as { url?: string } | null;
    return !!body?.url?.includes('code=throttled');
  }
  return false;
}
