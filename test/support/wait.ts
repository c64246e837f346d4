/** Polls until fn gives a truthy value; for work that finishes elsewhere (webhooks, the worker). Bounded by timeoutMs. */
export async function waitFor<T>(what: string, fn: () => Promise<T | null | undefined | false>, options: { timeoutMs?: number; everyMs?: number } = {}): Promise<T> {
  const timeoutMs = options.timeoutMs ?? 10_000;
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    const v = await fn();
    if (v) return v;
    await new Promise((r) => setTimeout(r, options.everyMs ?? 100));
  }
  throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
}
