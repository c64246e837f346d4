import { createHmac } from 'node:crypto';
import http from 'node:http';

/** The `Stripe-Signature` header value the provider's SDK verifies: `t=<unix>,v1=<hex HMAC-SHA256 of "t.body">`. */
export function signatureHeader(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${v1}`;
}

const LOOPBACK_HOSTS = new Set(['127.0.0.1', 'localhost', '[::1]', '::1']);

/** Webhooks carry a signature made with a local-only secret, so they only ever go to this machine. */
export function assertLoopbackUrl(raw: string): URL {
  const url = new URL(raw);
  if (url.protocol !== 'http:') throw new Error(`webhook URL must be http:// on this machine, got ${raw}`);
  if (!LOOPBACK_HOSTS.has(url.hostname)) throw new Error(`webhook URL must point at 127.0.0.1 or localhost, got ${raw}`);
  return url;
}

export interface AttemptResult {
  status: number | null;
  error: string | null;
  duration_ms: number;
}

export function postWebhook(url: string, payload: string, secret: string, timeoutMs: number, signal?: AbortSignal): Promise<AttemptResult> {
  const started = Date.now();
  return new Promise((resolve) => {
    let settled = false;
    const done = (status: number | null, error: string | null) => {
      if (settled) return;
      settled = true;
      resolve({ status, error, duration_ms: Date.now() - started });
    };
    let target: URL;
    try {
      target = assertLoopbackUrl(url);
    } catch (err) {
      done(null, (err as Error).message);
      return;
    }
    const body = Buffer.from(payload, 'utf8');
    const req = http.request(
      target,
      {
        method: 'POST',
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'content-length': body.length,
          'user-agent': 'Cupel-local-payments-fake/1 (webhooks)',
          'stripe-signature': signatureHeader(payload, secret),
          connection: 'close',
        },
        timeout: timeoutMs,
        signal,
      },
      (res) => {
        res.resume();
        res.on('end', () => done(res.statusCode ?? null, null));
        res.on('error', (err) => done(res.statusCode ?? null, err.message));
      },
    );
    req.on('timeout', () => {
      req.destroy(new Error(`no answer within ${timeoutMs} ms`));
    });
    req.on('error', (err) => done(null, err.message));
    req.end(body);
  });
}
