import { pumpLines } from './stream';

/** The part of the Web Serial API Cupel uses (Chromium; not yet in TypeScript's DOM library). */
interface SerialPortLike {
  open(options: { baudRate: number; dataBits?: 7 | 8; stopBits?: 1 | 2; parity?: 'none' | 'even' | 'odd' }): Promise<void>;
  close(): Promise<void>;
  readonly readable: ReadableStream<Uint8Array> | null;
  getInfo?(): { usbVendorId?: number; usbProductId?: number };
}
interface SerialLike {
  requestPort(options?: object): Promise<SerialPortLike>;
}

export interface SerialSettings {
  baudRate: number;
  framing: '8N1' | '7E1' | '7O1';
}

export const BAUD_RATES = [1200, 2400, 4800, 9600, 19200, 38400] as const;
export const FRAMINGS: SerialSettings['framing'][] = ['8N1', '7E1', '7O1'];
export const DEFAULT_SERIAL_SETTINGS: SerialSettings = { baudRate: 9600, framing: '8N1' };

export interface ScaleConnection {
  /** What the control shows: "serial port" or "simulated scale". */
  label: string;
  /** Settles when the scale stops sending: unplugged, closed or the stream ended. */
  ended: Promise<void>;
  close(): Promise<void>;
}

function serialApi(): SerialLike | null {
  const nav = typeof navigator === 'undefined' ? undefined : (navigator as Navigator & { serial?: SerialLike });
  return nav?.serial ?? null;
}

/** Web Serial needs Chromium (Chrome, Edge) on a desktop and a secure page (https, or this computer's own address). */
export function webSerialAvailable(): boolean {
  return serialApi() !== null;
}

/** Asks the clerk to choose the balance's port, opens it and reads lines until closed. */
export async function connectSerialScale(settings: SerialSettings, onLine: (line: string) => void): Promise<ScaleConnection> {
  const serial = serialApi();
  if (!serial) throw new Error('Web Serial is not available in this browser.');
  const port = await serial.requestPort();
  const framing = { '8N1': { dataBits: 8, parity: 'none' }, '7E1': { dataBits: 7, parity: 'even' }, '7O1': { dataBits: 7, parity: 'odd' } } as const;
  await port.open({ baudRate: settings.baudRate, stopBits: 1, ...framing[settings.framing] });
  let current: ReturnType<typeof pumpLines> | null = null;
  let closing = false;
  const ended = (async () => {
    // A framing or parity error ends one readable stream; the port then offers a fresh one.
    while (port.readable && !closing) {
      current = pumpLines(port.readable, onLine);
      try {
        await current.done;
        if (!closing) break;
      } catch {
        // non-fatal read error: loop and read on
      }
    }
  })();
  return {
    label: `serial port, ${settings.baudRate} baud ${settings.framing}`,
    ended,
    close: async () => {
      closing = true;
      await current?.stop();
      await ended.catch(() => {});
      await port.close().catch(() => {});
    },
  };
}

/**
 * The simulated scale (fakes/scale): the same lines a balance sends, streamed over HTTP. Offered only
 * when the server is configured with CUPEL_SIMULATED_SCALE_URL.
 */
export async function connectSimulatedScale(url: string, onLine: (line: string) => void): Promise<ScaleConnection> {
  const abort = new AbortController();
  const res = await fetch(new URL('/stream', url), { signal: abort.signal, cache: 'no-store' });
  if (!res.ok || !res.body) throw new Error(`The simulated scale answered ${res.status}.`);
  const pump = pumpLines(res.body, onLine);
  return {
    label: 'simulated scale',
    ended: pump.done.catch(() => {}),
    close: async () => {
      await pump.stop();
      abort.abort();
    },
  };
}

/** A plain sentence for a failed connection attempt. */
export function connectionProblem(err: unknown): string {
  const name = err instanceof Error || (typeof DOMException !== 'undefined' && err instanceof DOMException) ? (err as Error).name : '';
  if (name === 'NotFoundError') return 'No scale was chosen. Plug the balance in, press Connect scale and pick its port.';
  if (name === 'SecurityError') return 'The browser does not allow serial ports on this page (a browser policy, or the page is not on https).';
  if (name === 'InvalidStateError') return 'That port is already open in this browser: disconnect it first.';
  if (name === 'NetworkError') return 'The port could not be opened: another program may be using the balance.';
  return `The scale could not be connected: ${err instanceof Error ? err.message : String(err)}`;
}
