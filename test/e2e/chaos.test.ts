/**
 * Chaos: 100 parallel pay requests for one ticket while the app process is killed with SIGKILL and
 * started again mid-run, for cash and for an electronic payout. However the requests and the kill
 * interleave, the ticket is paid once: one payment row, the drawer short by exactly the payout, one
 * transfer and one payout at the provider's fake.
 *
 * The test starts its own copy of the built app (dist/server/entry.mjs, built by the e2e command) on
 * the e2e app's port + 10, and its own worker with a short send lease, both against the test
 * database and the payments fake the test command started. Bounded: each run waits at most 60 s.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { openSync } from 'node:fs';
import net from 'node:net';
import { and, eq } from 'drizzle-orm';
import { auditLog, cashDrawers, payments, tickets } from '@/db/schema';
import { drawerExpectedMinor, openDrawer } from '@/features/counter/tickets.server';
import { refreshPayoutAccount, startOnboarding } from '@/features/settlement/settlement.server';
import { FACTORY_PASSWORD, testDb } from '../support/db';
import { makeCounterWorld, setSpots, type CounterWorld } from '../support/counter';
import { acceptedTicket } from '../support/tickets';
import { waitFor } from '../support/wait';
import { BASE_URL } from './support/browser';

const db = testDb();
const PORT = Number(new URL(BASE_URL).port) + 10;
const APP = `http://127.0.0.1:${PORT}`;
const FAKE = `http://127.0.0.1:${process.env.STRIPE_API_PORT ?? process.env.FAKE_PAYMENTS_PORT}`;
const REQUESTS = 100;
const RUN_DEADLINE_MS = 60_000;

/** Settings of the chaos copy: the test command's environment, its own port, a short send lease so a killed sender's payment is picked up within seconds. */
const env = {
  ...process.env,
  PORT: String(PORT),
  HOST: '127.0.0.1',
  APP_URL: APP,
  AUTH_URL: `${APP}/api/auth`,
  PAYOUT_LEASE_MS: '3000',
  STRIPE_TIMEOUT_MS: '4000',
  OUTBOX_INTERVAL_MS: '300',
  RECONCILE_INTERVAL_MS: '1000',
  RECONCILE_AFTER_MS: '2000',
};

let app: ChildProcess | null = null;
let worker: ChildProcess | null = null;
const log = openSync('.local/chaos-app.log', 'a');

function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect(port, '127.0.0.1');
    s.once('connect', () => (s.destroy(), resolve(true)));
    s.once('error', () => resolve(false));
  });
}

async function startApp() {
  app = spawn(process.execPath, ['dist/server/entry.mjs'], { env, stdio: ['ignore', log, log] });
  await waitFor('the chaos app to listen', async () => portOpen(PORT), { timeoutMs: 20_000, everyMs: 50 });
}

async function killApp() {
  const child = app!;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGKILL');
  await exited;
  app = null;
}

beforeAll(async () => {
  if (await portOpen(PORT)) throw new Error(`port ${PORT} is taken: the chaos test needs it for its own copy of the app`);
  await startApp();
  worker = spawn(process.execPath, ['node_modules/tsx/dist/cli.mjs', 'scripts/worker.ts'], { env, stdio: ['ignore', log, log] });
});

afterAll(async () => {
  app?.kill('SIGKILL');
  worker?.kill('SIGTERM');
  await fetch(`${FAKE}/_fake/faults`, { method: 'DELETE' }).catch(() => null);
});

/** Signs the clerk in over HTTP and returns the session cookie. */
async function signIn(email: string): Promise<string> {
  const csrfRes = await fetch(`${APP}/api/auth/csrf`);
  const csrfCookie = csrfRes.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${APP}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: csrfCookie, origin: APP },
    body: new URLSearchParams({ email, password: FACTORY_PASSWORD, csrfToken, callbackUrl: '/' }),
  });
  const session = res.headers.getSetCookie().map((c) => c.split(';')[0]).find((c) => /session-token=/.test(c));
  if (!session) throw new Error(`sign-in failed (${res.status})`);
  return session;
}

interface Outcome {
  status: number;
  networkErrors: number;
}

/**
 * One client's pay request, sent again after a network error (the app was killed, or is starting),
 * as a clerk's browser retry would, until it gets an answer; bounded by the run's deadline.
 */
async function payUntilAnswered(cookie: string, ticketId: string, body: unknown, deadline: number, seen: { answered: number }): Promise<Outcome> {
  let networkErrors = 0;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(`${APP}/api/tickets/${ticketId}/pay`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie },
        body: JSON.stringify(body),
        signal: AbortSignal.timeout(15_000),
      });
      await res.arrayBuffer();
      seen.answered += 1;
      return { status: res.status, networkErrors };
    } catch {
      networkErrors += 1;
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  return { status: 0, networkErrors };
}

/** Fires the requests all at once, kills the app when `killWhen` says so, starts it again, and collects every answer. */
async function stampede(world: CounterWorld, ticketId: string, body: unknown, killWhen: (seen: { answered: number }) => Promise<boolean>) {
  const cookie = await signIn(world.clerk.email);
  const deadline = Date.now() + RUN_DEADLINE_MS;
  const seen = { answered: 0 };
  const all = Promise.all(Array.from({ length: REQUESTS }, () => payUntilAnswered(cookie, ticketId, body, deadline, seen)));
  await waitFor('the moment to kill the app', () => killWhen(seen), { timeoutMs: 20_000, everyMs: 5 });
  const answeredBeforeKill = seen.answered;
  await killApp();
  await startApp();
  const outcomes = await all;
  return { outcomes, answeredBeforeKill };
}

describe('chaos: 100 parallel pay requests while the app is killed and restarted', () => {
  it('cash: one payment, the drawer short by exactly the payout', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await acceptedTicket(db, world);
    const drawer = await openDrawer(db, world.clerk, world.storeId, '2500.00');
    const [ticket] = await db.select().from(tickets).where(eq(tickets.id, t.id));

    // Killed while most of the requests are still waiting: as soon as the first answer is back.
    const { outcomes, answeredBeforeKill } = await stampede(world, t.id, { method: 'cash' }, async (seen) => seen.answered >= 1);
    expect(answeredBeforeKill).toBeLessThan(REQUESTS);
    expect(outcomes.every((o) => o.status === 200 || o.status === 409)).toBe(true);
    expect(outcomes.filter((o) => o.status === 200).length).toBeLessThanOrEqual(1);
    expect(outcomes.some((o) => o.networkErrors > 0)).toBe(true);

    const rows = await db.select().from(payments).where(eq(payments.ticketId, t.id));
    expect(rows.map((p) => `${p.kind}:${p.method}:${p.state}`)).toEqual(['payout:cash:completed']);
    expect(rows[0]!.amountMinor).toBe(ticket!.payoutMinor);
    const [d] = await db.select().from(cashDrawers).where(eq(cashDrawers.id, drawer.id));
    expect(await drawerExpectedMinor(db, drawer.id, d!.floatMinor)).toBe(250_000 - ticket!.payoutMinor);
    const [paid] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    expect(paid!.state).toBe('paid');
    expect(await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'ticket.pay')))).toHaveLength(1);
  });

  it('electronic: one payment, one transfer and one payout at the provider', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const { url } = await startOnboarding(db, world.clerk, world.sellerId);
    const onboarded = await fetch(url, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ method: 'card', card_number: '4000056655665556', card_exp: '12/30', card_name: 'Pat Example' }),
      redirect: 'manual',
    });
    expect(onboarded.status).toBe(303);
    const account = await waitFor('the account to be onboarded', async () => {
      const a = await refreshPayoutAccount(db, world.sellerId);
      return a?.payoutsEnabled ? a : null;
    });
    const t = await acceptedTicket(db, world);
    const [ticket] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    // The provider is slow with this ticket's transfer, so the kill lands while the app waits for it.
    const fault = await fetch(`${FAKE}/_fake/faults`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ next: 'slow', path: '/v1/transfers', method: 'POST', delayMs: 1500 }),
    });
    expect(fault.status).toBe(200);

    const { outcomes } = await stampede(world, t.id, { method: 'electronic' }, async () => {
      const [p] = await db.select().from(payments).where(eq(payments.ticketId, t.id));
      return !!p?.sendingSince;
    });
    expect(outcomes.every((o) => [200, 202, 409].includes(o.status))).toBe(true);
    expect(outcomes.some((o) => o.networkErrors > 0)).toBe(true);

    const paid = await waitFor(
      'the payout to be confirmed and the ticket paid',
      async () => {
        const [row] = await db.select().from(tickets).where(eq(tickets.id, t.id));
        return row?.state === 'paid' ? row : null;
      },
      { timeoutMs: 45_000, everyMs: 250 },
    );
    expect(paid.state).toBe('paid');
    const rows = await db.select().from(payments).where(eq(payments.ticketId, t.id));
    expect(rows.map((p) => `${p.kind}:${p.method}:${p.state}`)).toEqual(['payout:electronic:completed']);
    expect(rows[0]!.amountMinor).toBe(ticket!.payoutMinor);
    const state = (await (await fetch(`${FAKE}/_fake/state`)).json()) as {
      transfers: { destination: string; amount: number }[];
      payouts: { account: string; payout: { amount: number; status: string } }[];
    };
    const transfers = state.transfers.filter((tr) => tr.destination === account.providerAccountId);
    const payouts = state.payouts.filter((p) => p.account === account.providerAccountId);
    expect(transfers.map((tr) => tr.amount)).toEqual([ticket!.payoutMinor]);
    expect(payouts.map((p) => `${p.payout.amount}:${p.payout.status}`)).toEqual([`${ticket!.payoutMinor}:paid`]);
    // Once the provider has accepted the payout nobody sends it again, however many requests come after.
    expect(await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'payment.electronic-sent')))).toHaveLength(1);
    expect(await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'ticket.pay')))).toHaveLength(1);
  });
});
