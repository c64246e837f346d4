import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { signInFailures, users } from '@/db/schema';
import { FACTORY_PASSWORD, makeStore, makeUser, testDb, unique } from '../support/db';
import { BASE_URL, SCREENSHOT_DIR, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

const LANDING = { admin: '/admin', manager: '/review', clerk: '/counter', seller: '/portal' } as const;

describe('signing in, in real chromium', () => {
  for (const role of ['admin', 'manager', 'clerk', 'seller'] as const) {
    it(`a ${role} signs in and lands on their own page`, async () => {
      const store = await makeStore(db, { name: `Store ${role}` });
      const user = await makeUser(db, { role, name: `E2E ${role}`, storeId: role === 'admin' ? null : store.id });
      const page = await newPage();
      await signInThroughForm(page, user.email, FACTORY_PASSWORD);
      await page.waitForURL(`**${LANDING[role]}`);
      expect(new URL(page.url()).pathname).toBe(LANDING[role]);
      expect(await page.getByTestId('signed-in-as').textContent()).toContain(`E2E ${role}`);
      await page.screenshot({ path: `${SCREENSHOT_DIR}/landing-${role}.png`, fullPage: true });
    });
  }

  it('refuses a seller on a staff page and a clerk on the admin page, with a 403 page', async () => {
    const seller = await makeUser(db, { role: 'seller' });
    const page = await newPage();
    await signInThroughForm(page, seller.email, FACTORY_PASSWORD);
    await page.waitForURL('**/portal');
    for (const path of ['/counter', '/review', '/admin']) {
      const response = await page.goto(path);
      expect(response?.status(), path).toBe(403);
      expect(await page.getByTestId('forbidden').isVisible()).toBe(true);
    }
    const api = await page.request.get('/api/admin/users');
    expect(api.status()).toBe(403);
    expect(await api.json()).toMatchObject({ error: expect.any(String) });

    const clerk = await makeUser(db, { role: 'clerk' });
    const clerkPage = await newPage();
    await signInThroughForm(clerkPage, clerk.email, FACTORY_PASSWORD);
    await clerkPage.waitForURL('**/counter');
    expect((await clerkPage.goto('/admin'))?.status()).toBe(403);
    expect((await clerkPage.goto('/review'))?.status()).toBe(403);
    expect((await clerkPage.goto('/portal'))?.status()).toBe(403);
    await clerkPage.screenshot({ path: `${SCREENSHOT_DIR}/forbidden.png` });
  });

  it('sends a visitor who is not signed in to the sign-in page, and answers the API with 401', async () => {
    const page = await newPage();
    await page.goto('/counter');
    expect(new URL(page.url()).pathname).toBe('/signin');
    expect(new URL(page.url()).searchParams.get('callbackUrl')).toBe('/counter');
    const api = await page.request.get('/api/me');
    expect(api.status()).toBe(401);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/signin.png` });
  });

  it('signs out: the staff page is closed again afterwards', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/signin');
    await page.goto('/counter');
    expect(new URL(page.url()).pathname).toBe('/signin');
    expect((await page.request.get('/api/me')).status()).toBe(401);
  });

  it('shows one message for a wrong password, whether or not the e-mail exists', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, 'not-the-password');
    const known = await page.getByRole('alert').textContent();
    await signInThroughForm(page, `${unique('ghost')}@example.test`, 'not-the-password');
    const unknown = await page.getByRole('alert').textContent();
    expect(known).toBe(unknown);
    expect(known).toMatch(/do not match/);
    await db.delete(signInFailures).where(eq(signInFailures.emailKey, clerk.email.toLowerCase()));
  });

  it('a deactivated account loses access at its next request', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    await db.update(users).set({ active: false }).where(eq(users.id, clerk.id));
    await page.goto('/counter');
    expect(new URL(page.url()).pathname).toBe('/signin');
  });

  it('a changed role applies at the next request', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    expect((await page.goto('/review'))?.status()).toBe(403);
    await db.update(users).set({ role: 'manager' }).where(eq(users.id, clerk.id));
    expect((await page.goto('/review'))?.status()).toBe(200);
  });

  it('answers 429 after five failed sign-ins for one e-mail, and the form says so', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    for (let i = 0; i < 5; i++) {
      await signInThroughForm(page, clerk.email, `wrong-${i}-password`);
      await page.getByRole('alert').waitFor();
    }
    const csrf = (await (await page.request.get('/api/auth/csrf')).json()) as { csrfToken: string };
    const res = await page.request.post('/api/auth/callback/credentials', {
      form: { email: clerk.email, password: FACTORY_PASSWORD, csrfToken: csrf.csrfToken, callbackUrl: '/' },
      headers: { 'x-auth-return-redirect': '1', origin: BASE_URL },
    });
    expect(res.status()).toBe(429);
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/Too many failed sign-ins/);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/throttled.png` });
    await db.delete(signInFailures).where(eq(signInFailures.emailKey, clerk.email.toLowerCase()));
  });

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const page = await newPage();
    await signInThroughForm(page, clerk.email, FACTORY_PASSWORD);
    await page.waitForURL('**/counter');
    const cookie = (await page.context().cookies()).find((c) => c.name.includes('session-token'));
    expect(cookie).toBeDefined();
    expect(cookie!.httpOnly).toBe(true);
    expect(cookie!.sameSite).toBe('Lax');
  });

  it('refuses a cross-site form post (origin check)', async () => {
    const page = await newPage();
    const res = await page.request.post('/api/auth/callback/credentials', {
      form: { email: 'x@example.test', password: 'y' },
      headers: { origin: 'http://evil.example' },
    });
    expect(res.status()).toBe(403);
  });
});
