import { useCallback, useEffect, useRef, useState } from 'react';
import type { GradingLine } from '@/features/counter/grading';
import { parseScaleLine, type ScaleReading } from '../scale';
import { checkReading, placeWeight } from '../take';
import {
  BAUD_RATES,
  DEFAULT_SERIAL_SETTINGS,
  FRAMINGS,
  connectSerialScale,
  connectSimulatedScale,
  connectionProblem,
  webSerialAvailable,
  type ScaleConnection,
  type SerialSettings,
} from '../transports';

interface Props {
  lines: GradingLine[];
  onTake: (key: string, patch: Partial<GradingLine>) => void;
  disabled: boolean;
  /** Set only when the server is configured with a simulated scale (tests, the local demo). */
  simulatedScaleUrl?: string | null;
}

type Latest = { reading: ScaleReading; at: number };
const SETTINGS_KEY = 'cupel.scale.serial';

const NOT_PRICED_BY_WEIGHT: Record<Exclude<GradingLine['kind'], 'weight'>, string> = {
  coin: 'is priced by count',
  'face-value': 'is priced by face value',
  'fine-weight': 'takes its fine weight from the assay report',
};

/**
 * The counter's balance, read through Web Serial: Alt+W (or the button) puts the settled reading into
 * the gross weight of the line last worked on. Typing the weight works as before.
 */
export function ScaleControl({ lines, onTake, disabled, simulatedScaleUrl = null }: Props) {
  // Known only in the browser; the server renders the control as "checking" so hydration matches.
  const [available, setAvailable] = useState<boolean | null>(null);
  const [settings, setSettings] = useState<SerialSettings>(DEFAULT_SERIAL_SETTINGS);
  const [connection, setConnection] = useState<ScaleConnection | null>(null);
  const [connecting, setConnecting] = useState(false);
  const [shown, setShown] = useState<ScaleReading | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const [targetKey, setTargetKey] = useState<string | null>(null);
  const latest = useRef<Latest | null>(null);
  const section = useRef<HTMLElement>(null);

  const onLine = useCallback((text: string) => {
    const reading = parseScaleLine(text);
    if (!reading) return;
    latest.current = { reading, at: Date.now() };
    setShown(reading);
  }, []);

  useEffect(() => {
    setAvailable(webSerialAvailable());
    setSettings(loadSettings());
  }, []);

  // Lines are found by position: a line's key can differ between the server's render and the browser's.
  const linesNow = useRef(lines);
  linesNow.current = lines;
  useEffect(() => {
    function onFocus(e: FocusEvent) {
      const at = (e.target as Element | null)?.closest?.('[data-line-index]')?.getAttribute('data-line-index');
      const key = at == null ? undefined : linesNow.current[Number(at)]?.key;
      if (key) setTargetKey(key);
    }
    document.addEventListener('focusin', onFocus);
    return () => document.removeEventListener('focusin', onFocus);
  }, []);

  useEffect(() => {
    if (!connection) return;
    let current = true;
    void connection.ended.then(() => {
      if (!current) return;
      setConnection(null);
      latest.current = null;
      setShown(null);
      setMessage({ tone: 'error', text: 'The scale stopped sending and is disconnected. Connect it again, or type the weight.' });
    });
    return () => {
      current = false;
      void connection.close();
    };
  }, [connection]);

  // The bar sticks to the top of the window; keep a focused field from scrolling in under it.
  useEffect(() => {
    const root = document.documentElement;
    if (section.current) root.style.scrollPaddingTop = `${section.current.offsetHeight + 12}px`;
  });
  useEffect(() => () => void (document.documentElement.style.scrollPaddingTop = ''), []);

  const target = lines.find((l) => l.key === targetKey) ?? lines.at(-1);
  const targetIndex = target ? lines.indexOf(target) + 1 : 0;

  async function connect(kind: 'serial' | 'simulated') {
    setConnecting(true);
    setMessage(null);
    try {
      const c = kind === 'serial' ? await connectSerialScale(settings, onLine) : await connectSimulatedScale(simulatedScaleUrl!, onLine);
      setConnection(c);
      setMessage({ tone: 'ok', text: `Connected to the ${c.label}.` });
    } catch (err) {
      setMessage({ tone: 'error', text: connectionProblem(err) });
    } finally {
      setConnecting(false);
    }
  }

  function take() {
    if (disabled) return;
    if (!connection) return setMessage({ tone: 'error', text: 'Connect the scale first, or type the weight.' });
    if (!target) return setMessage({ tone: 'error', text: 'Add a line first.' });
    if (target.kind !== 'weight') {
      return setMessage({ tone: 'error', text: `Line ${targetIndex} ${NOT_PRICED_BY_WEIGHT[target.kind]}: the scale fills the gross weight of a line priced by weight and mark.` });
    }
    const now = latest.current;
    const checked = checkReading(now ? { reading: now.reading, ageMs: Date.now() - now.at } : null);
    if (!checked.ok) return setMessage({ tone: 'error', text: `Not taken: ${checked.reason}` });
    const placed = placeWeight(checked.weight, target);
    if (!placed.ok) return setMessage({ tone: 'error', text: `Not taken: ${placed.reason}` });
    onTake(target.key, placed.fields);
    setMessage({ tone: 'ok', text: `Line ${targetIndex}: gross weight ${placed.shown} from the scale${placed.note ? ` (${placed.note})` : ''}.` });
    if (section.current?.contains(document.activeElement)) {
      document.querySelector<HTMLElement>(`[data-line-index="${targetIndex - 1}"] input[id$="-gross"]`)?.focus();
    }
  }

  const takeRef = useRef(take);
  takeRef.current = take;
  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      // The physical key, so it works on every keyboard layout and with Option on macOS.
      if (e.altKey && !e.ctrlKey && !e.metaKey && e.code === 'KeyW') {
        e.preventDefault();
        takeRef.current();
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  function changeSettings(patch: Partial<SerialSettings>) {
    const next = { ...settings, ...patch };
    setSettings(next);
    try {
      localStorage.setItem(SETTINGS_KEY, JSON.stringify(next));
    } catch {
      // private mode: the choice lasts for this page only
    }
  }

  // Sticks to the top of the window so the scale stays at hand on a long ticket.
  return (
    <section ref={section} className="card sticky top-0 z-10 py-3" aria-labelledby="scale-heading" data-testid="scale">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <h3 id="scale-heading" className="font-bold">
          Scale
        </h3>
        <p className="min-w-[11rem] font-mono text-lg" data-testid="scale-reading" aria-label="Scale reading">
          {connection ? <ReadingText reading={shown} /> : <span className="font-sans text-sm text-ink-500">not connected</span>}
        </p>
        {connection ? (
          <>
            <button type="button" className="btn-primary" onClick={take} disabled={disabled || !target}>
              Take weight{target ? ` into line ${targetIndex}` : ''}
            </button>
            <span className="text-sm text-ink-600">
              or <kbd className="rounded border px-1">Alt</kbd>+<kbd className="rounded border px-1">W</kbd> · connected: {connection.label}
            </span>
            <button type="button" className="btn-quiet" onClick={() => setConnection(null)}>
              Disconnect
            </button>
          </>
        ) : (
          <>
            <button type="button" className="btn-quiet" onClick={() => void connect('serial')} disabled={!available || connecting}>
              Connect scale
            </button>
            {simulatedScaleUrl && (
              <button type="button" className="btn-quiet" onClick={() => void connect('simulated')} disabled={connecting}>
                Connect simulated scale
              </button>
            )}
            {available && (
              <details className="text-sm">
                <summary className="cursor-pointer">Port settings ({settings.baudRate} baud {settings.framing})</summary>
                <div className="mt-1 flex gap-2">
                  <label className="flex items-center gap-1">
                    Baud
                    <select className="field-input py-1" value={settings.baudRate} onChange={(e) => changeSettings({ baudRate: Number(e.target.value) })}>
                      {BAUD_RATES.map((b) => (
                        <option key={b} value={b}>
                          {b}
                        </option>
                      ))}
                    </select>
                  </label>
                  <label className="flex items-center gap-1">
                    Bits, parity, stop
                    <select className="field-input py-1" value={settings.framing} onChange={(e) => changeSettings({ framing: e.target.value as SerialSettings['framing'] })}>
                      {FRAMINGS.map((f) => (
                        <option key={f} value={f}>
                          {f}
                        </option>
                      ))}
                    </select>
                  </label>
                </div>
              </details>
            )}
          </>
        )}
      </div>
      {available === false && (
        <p className="mt-2 text-sm font-semibold text-amber-900" data-testid="scale-unavailable">
          This browser has no Web Serial, so Cupel cannot read the scale here: it needs Chrome or Edge on a computer, with Cupel on https or on this computer's own address. Type the weights instead.
        </p>
      )}
      {message && (
        <p role={message.tone === 'error' ? 'alert' : 'status'} data-testid="scale-message" className={`mt-2 text-sm font-semibold ${message.tone === 'error' ? 'text-red-800' : 'text-emerald-800'}`}>
          {message.text}
        </p>
      )}
    </section>
  );
}

function ReadingText({ reading }: { reading: ScaleReading | null }) {
  if (!reading) return <span className="font-sans text-sm text-ink-500">waiting for the scale…</span>;
  switch (reading.kind) {
    case 'weight':
      return (
        <>
          {reading.negative ? '-' : ''}
          {reading.value} {reading.unit}{' '}
          <span className={`font-sans text-sm font-semibold ${reading.stable ? 'text-emerald-800' : 'text-amber-800'}`}>{reading.stable ? 'steady' : 'moving'}</span>
        </>
      );
    case 'overload':
      return <span className="font-sans text-sm font-semibold text-red-800">overload</span>;
    case 'underload':
      return <span className="font-sans text-sm font-semibold text-red-800">underload</span>;
    case 'unreadable':
      return (
        <span className="font-sans text-sm font-semibold text-red-800" title={reading.reason}>
          unreadable line: {reading.reason}
        </span>
      );
    default:
      return (
        <span className="font-sans text-sm font-semibold text-red-800" title={reading.reason}>
          no usable weight
        </span>
      );
  }
}

function loadSettings(): SerialSettings {
  try {
    const saved = JSON.parse(localStorage.getItem(SETTINGS_KEY) ?? 'null') as Partial<SerialSettings> | null;
    if (saved && (BAUD_RATES as readonly number[]).includes(saved.baudRate!) && FRAMINGS.includes(saved.framing!)) return saved as SerialSettings;
  } catch {
    // no storage: the defaults
  }
  return DEFAULT_SERIAL_SETTINGS;
}
