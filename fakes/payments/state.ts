import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type Stripe from 'stripe';

export type Currency = string;
export type Balances = Record<Currency, number>;

export interface AccountRecord {
  account: Stripe.Account;
  balance: Balances;
}

export interface LinkRecord {
  token: string;
  account: string;
  type: string;
  refresh_url: string | null;
  return_url: string;
  created: number;
  expires_at: number;
  used_at: number | null;
}

export interface PayoutRecord {
  account: string;
  payout: Stripe.Payout;
  /** Epoch ms when the payout settles by itself; null once settled. */
  settle_at: number | null;
  outcome: 'paid' | 'failed';
}

export interface DeliveryAttempt {
  at: number;
  status: number | null;
  error: string | null;
  duration_ms: number;
}

export interface DeliveryRecord {
  id: string;
  event_id: string;
  url: string;
  /** A second delivery of the same event, as the repeat-webhook fault asks. */
  duplicate: boolean;
  status: 'pending' | 'delivered' | 'failed';
  attempts: DeliveryAttempt[];
  next_attempt_at: number | null;
}

export interface IdempotencyRecord {
  fingerprint: string;
  status: number;
  body: string;
  request_id: string;
  created_ms: number;
}

export interface FakeState {
  version: 1;
  platform_balance: Balances;
  accounts: Record<string, AccountRecord>;
  links: Record<string, LinkRecord>;
  transfers: Record<string, Stripe.Transfer>;
  payouts: Record<string, PayoutRecord>;
  /** Oldest first. */
  events: Stripe.Event[];
  deliveries: DeliveryRecord[];
  idempotency: Record<string, IdempotencyRecord>;
}

export function emptyState(platformBalance: number): FakeState {
  return {
    version: 1,
    platform_balance: { usd: platformBalance },
    accounts: {},
    links: {},
    transfers: {},
    payouts: {},
    events: [],
    deliveries: [],
    idempotency: {},
  };
}

export function loadState(file: string): FakeState | null {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
  const parsed = JSON.parse(text) as Partial<FakeState>;
  if (parsed.version !== 1) throw new Error(`${file}: unknown state version ${String(parsed.version)}`);
  return parsed as FakeState;
}

/** Writes the state to disk at most every `debounceMs`, through a temporary file so a crash never leaves half a file. */
export class StateFile {
  private timer: NodeJS.Timeout | null = null;

  constructor(
    readonly file: string,
    private readonly read: () => FakeState,
    private readonly debounceMs = 50,
  ) {
    mkdirSync(path.dirname(file), { recursive: true });
  }

  schedule(): void {
    if (this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.writeNow();
    }, this.debounceMs);
    this.timer.unref();
  }

  writeNow(): void {
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = null;
    }
    const tmp = `${this.file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(this.read()));
    renameSync(tmp, this.file);
  }
}
