import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { users } from '@/db/schema';
import { FACTORY_PASSWORD, makeStore, makeUser, testDb, unique } from '../support/db';
import { SCREENSHOT_DIR, signInThroughForm, useBrowser } from './support/browser';

const db = testDb();
const { newPage } = useBrowser();

describe('administration, in real chromium', () => {
  it('an admin creates a clerk, who can then sign in', async () => {
    const store = await makeStore(db, { name: unique('Admin store ') });
    const admin = await makeUser(db, { role: 'admin', name: 'E2E Admin' });
    const page = await newPage();
    await signInThroughForm(page, admin.email, FACTORY_PASSWORD);
    await page.waitForURL('**/admin');
    const email = `${unique('hired')}@example.test`;
    await page.getByLabel('Name').fill('Newly Hired');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Role').selectOption('clerk');
    await page.getByLabel('Store', { exact: true }).selectOption({ label: store.name });
    await page.getByLabel('First password').fill('short');
    await page.getByRole('button', { name: 'Create account' }).click();
    expect(await page.getByText(/At least 12 characters/).isVisible()).toBe(true);
    await page.getByLabel('First password').fill('a-good-long-password');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByRole('status').filter({ hasText: email }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/admin.png`, fullPage: true });
    const [row] = await db.select().from(users).where(sql`lower(${users.email}) = ${email}`);
    expect(row).toMatchObject({ role: 'clerk', storeId: store.id, active: true });

    const clerkPage = await newPage();
    await signInThroughForm(clerkPage, email, 'a-good-long-password');
    await clerkPage.waitForURL('**/counter');
  });

  it('the admin API refuses bad input with 422 naming the field, and a duplicate e-mail with 409', async () => {
    const admin = await makeUser(db, { role: 'admin' });
    const page = await newPage();
    await signInThroughForm(page, admin.email, FACTORY_PASSWORD);
    await page.waitForURL('**/admin');
    const bad = await page.request.post('/api/admin/users', { data: { name: 'X', email: 'not-an-email', role: 'clerk', password: 'short' } });
    expect(bad.status()).toBe(422);
    const body = (await bad.json()) as { issues: { path: string }[] };
    expect(body.issues.map((i) => i.path)).toEqual(expect.arrayContaining(['email', 'password']));
    const notJson = await page.request.post('/api/admin/users', { data: Buffer.from('{not json'), headers: { 'content-type': 'application/json' } });
    expect(notJson.status()).toBe(400);
    const dup = await page.request.post('/api/admin/users', { data: { name: 'Dup', email: admin.email, role: 'admin', password: 'a-good-long-password' } });
    expect(dup.status()).toBe(409);
  });
});
