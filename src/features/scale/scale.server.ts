/**
 * The simulated scale is offered on the ticket screen only when CUPEL_SIMULATED_SCALE_URL is set, and only
 * at a loopback address: it is a stand-in for tests and the local demo, never for a shop's counter.
 */
export function simulatedScaleUrl(env: Record<string, string | undefined> = process.env): string | null {
  const text = env.CUPEL_SIMULATED_SCALE_URL?.trim();
  if (!text) return null;
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    return null;
  }
  const loopback = url.hostname === '127.0.0.1' || url.hostname === 'localhost' || url.hostname === '[::1]';
  return loopback && (url.protocol === 'http:' || url.protocol === 'https:') ? url.origin : null;
}
