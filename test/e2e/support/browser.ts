import { afterAll, beforeAll } from 'vitest';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';

export const BASE_URL = process.env.CUPEL_BASE_URL ?? 'http://127.0.0.1:4399';
export const SCREENSHOT_DIR = join(process.cwd(), '.local', 'screenshots');

/** One headless Debian chromium per test file; each test gets its own context (cookies). */
export function useBrowser(): { browser: () => Browser; newPage: () => Promise<Page> } {
  let browser: Browser | undefined;
  const contexts: BrowserContext[] = [];
  beforeAll(async () => {
    mkdirSync(SCREENSHOT_DIR, { recursive: true });
    browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      headless: true,
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
      ],
    });
  });
  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => {});
    await browser?.close();
  });
  return {
    browser: () => browser!,
    newPage: async () => {
      const context = await browser!.newContext({ baseURL: BASE_URL, viewport: { width: 1280, height: 900 } });
      contexts.push(context);
      return context.newPage();
    },
  };
}

export async function signInThroughForm(page: Page, email: string, password: string): Promise<void> {
  await page.goto('/signin');
  await islandsReady(page);
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Waits until every React island on the page has hydrated (Astro drops the ssr attribute then). */
export async function islandsReady(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0, null, { timeout: 15_000 });
}
