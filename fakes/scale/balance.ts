/**
 * A simulated counter balance: what is on its pan, and the line it would print for it right now.
 * It writes lines the way balances do, in three layouts (Cupel's own parser lives in src/features/scale;
 * this file shares no code with it, so the browser test checks one against the other):
 *
 *   coded   ST,GS,+   12.345 g     (US while moving, OL out of range)
 *   reply   S S      12.345 g      (S D while moving, S + / S - out of range)
 *   plain   +   12.345 g           (a trailing ? while moving, +  OL / -  OL out of range)
 */
export const LAYOUTS = ['coded', 'reply', 'plain'] as const;
export type Layout = (typeof LAYOUTS)[number];

export interface PanState {
  /** The settled weight as the display shows it, e.g. "12.345" (its decimals are the balance's resolution). */
  value: string;
  /** What the balance prints after the number: g, ct, dwt, ozt, gr, oz... (any short word, to test refusals). */
  unit: string;
  layout: Layout;
  /** true: something keeps the pan moving (a draught, a hand on the pan); never settles. */
  motion: boolean;
  load: 'in-range' | 'overload' | 'underload';
  /** Lines printed exactly as given, instead of a reading (to test what a confused balance sends). */
  raw: string | null;
}

export type PanUpdate = Partial<PanState> & { settleMs?: number };

export const EMPTY_PAN: PanState = { value: '0.000', unit: 'g', layout: 'coded', motion: false, load: 'in-range', raw: null };

/** Small wobbles in the last digit while a load settles; deterministic so tests can rely on them. */
const WOBBLE = [7, -4, 3, -2, 1, -1];

export class SimulatedBalance {
  private pan: PanState = { ...EMPTY_PAN };
  private settledAt = 0;
  private tick = 0;

  get state(): PanState & { settling: boolean } {
    return { ...this.pan, settling: this.isSettling(Date.now()) };
  }

  /** Puts a load on the pan (or changes its settings). A new value moves for settleMs (default 600) first. */
  set(update: PanUpdate, now = Date.now()): PanState {
    // A raw line lasts until something else is put on the pan.
    const next: PanState = { ...this.pan, ...(update.raw === undefined ? { raw: null } : {}), ...stripUndefined(update) };
    if (!/^\d{1,7}(\.\d{1,5})?$/.test(next.value)) throw new Error('value must be a decimal like "12.345"');
    if (!/^[A-Za-z .]{1,6}$/.test(next.unit)) throw new Error('unit must be a short word like "g" or "dwt"');
    if (!LAYOUTS.includes(next.layout)) throw new Error(`layout must be one of ${LAYOUTS.join(', ')}`);
    if (!['in-range', 'overload', 'underload'].includes(next.load)) throw new Error('load must be in-range, overload or underload');
    if (next.raw !== null && (typeof next.raw !== 'string' || next.raw.length > 300 || /[\r\n]/.test(next.raw))) throw new Error('raw must be one line');
    const settleMs = update.settleMs ?? (update.value !== undefined && update.value !== this.pan.value ? 600 : 0);
    if (!Number.isInteger(settleMs) || settleMs < 0 || settleMs > 60_000) throw new Error('settleMs must be 0 to 60000');
    this.pan = next;
    this.settledAt = now + settleMs;
    return this.pan;
  }

  private isSettling(now: number) {
    return this.pan.motion || now < this.settledAt;
  }

  /** The line the balance prints now (without its CR LF). */
  line(now = Date.now()): string {
    const p = this.pan;
    if (p.raw !== null) return p.raw;
    this.tick += 1;
    if (p.load !== 'in-range') {
      const sign = p.load === 'overload' ? '+' : '-';
      if (p.layout === 'coded') return `OL,GS,${sign}      OL`;
      if (p.layout === 'reply') return `S ${sign}`;
      return `${sign}      OL`;
    }
    const moving = this.isSettling(now);
    const shown = moving ? wobble(p.value, WOBBLE[this.tick % WOBBLE.length]!) : p.value;
    const number = shown.padStart(9, ' ');
    if (p.layout === 'coded') return `${moving ? 'US' : 'ST'},GS,+${number} ${p.unit}`;
    if (p.layout === 'reply') return `S ${moving ? 'D' : 'S'} ${number} ${p.unit}`;
    return `+${number} ${p.unit}${moving ? ' ?' : ''}`;
  }
}

/** value +/- steps in its last printed digit, never below zero. */
function wobble(value: string, steps: number): string {
  const dot = value.indexOf('.');
  const places = dot < 0 ? 0 : value.length - dot - 1;
  let units = BigInt(value.replace('.', '')) + BigInt(steps);
  if (units < 0n) units = 0n;
  const digits = units.toString().padStart(places + 1, '0');
  return places ? `${digits.slice(0, -places)}.${digits.slice(-places)}` : digits;
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([k, v]) => v !== undefined && k !== 'settleMs')) as Partial<T>;
}
