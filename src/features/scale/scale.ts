import { AVOIRDUPOIS_REFUSAL, GRAMS_PER_AVOIRDUPOIS_OUNCE, GRAMS_PER_TROY_OUNCE, readWeightUnit, type WeightUnit } from '@/features/pricing/units';

/**
 * Reading the lines a counter balance sends over its serial port, in pure code.
 *
 * Balances print one reading per line (ended by CR, LF or both) when their print key is pressed,
 * when the load settles, or continuously. Three layouts are common; see README.md in this folder:
 *
 * - coded:  two comma-separated codes before the weight. The first says whether the reading has
 *           settled (ST), is still moving (US) or is out of range (OL); the optional second says what
 *           the number is (GS gross, NT net of the balance's own tare, TR the tare memory, QT a count).
 *           `ST,GS,+  12.345 g`   `US,NT,-   0.012 g`   `OL`
 * - reply:  a weight reply to a host request: `S`, a space, a status letter (S settled, D still moving,
 *           + above range, - below range, I busy), then the weight. `S S     12.345 g`   `S D    12.3 g`
 * - plain:  sign, number and unit alone, optionally labelled gross or net; a `?` anywhere (or the word
 *           MOTION) marks a reading still moving. Words or rows of H or L mark overload or underload.
 *           `+   12.34 g`   `+   12.34 g ?`   `N  12.345 dwt`   `OL`
 */

/** Units a balance may print. Metric carat and milligram are weighed but written into a line in grams. */
export type ScaleUnit = WeightUnit | 'mg' | 'ct';
export type ScaleLayout = 'coded' | 'reply' | 'plain';

export type ScaleReading =
  | {
      kind: 'weight';
      layout: ScaleLayout;
      stable: boolean;
      negative: boolean;
      /** The number as the balance printed it, without sign or leading zeros ("12.340", "0.5"). */
      value: string;
      unit: ScaleUnit;
      basis: 'gross' | 'net' | null;
      line: string;
    }
  | { kind: 'overload' | 'underload'; layout: ScaleLayout; line: string }
  /** The balance said something real that is not a weight Cupel may use (a count, a tare memory, ounces). */
  | { kind: 'no-weight'; layout: ScaleLayout; reason: string; line: string }
  | { kind: 'unreadable'; reason: string; line: string };

const MAX_LINE = 80;

const CODED = /^(ST|US|OL)\s*,\s*(?:([A-Z]{1,2})\s*,\s*)?(.*)$/i;
const REPLY = /^S\s+([SDI]|\+|-)(?=\s|$)\s*(.*)$/i;
const REPLY_ERROR = /^E[SLT]$/i;
const DEVICE_ERROR = /^(?:ERR(?:OR)?|E)\s*[-:]?\s*(\w{0,6})$/i;
const OVER = /^\+?\s*(?:OL|O-L|OVER|OVERLOAD|-+\s*OL\s*-+|H{2,})$/i;
const UNDER = /^(?:-\s*OL|UL|U-L|UNDER|UNDERLOAD|L{2,})$/i;
const VALUE_UNIT = /^([+-])?\s*(\d+(?:\.\d*)?|\.\d+)\s*([A-Za-z%][A-Za-z .]*?)?\s*$/;
const BASIS_WORDS: Record<string, 'gross' | 'net'> = { G: 'gross', GS: 'gross', GROSS: 'gross', N: 'net', NT: 'net', NET: 'net' };
const MOTION_WORDS = new Set(['MOTION', 'UNSTABLE', 'US']);
const STABLE_WORDS = new Set(['STABLE', 'ST']);
const LEADING_WORD = /^(GROSS|NET|GS|NT|G|N|MOTION|UNSTABLE|US|STABLE|ST)\s*:?\s+(?=[+-]?\s*[\d.])/i;
const TRAILING_WORD = /^(.*\S)\s+([A-Za-z]+)$/;

const CODED_KINDS: Record<string, 'gross' | 'net' | { reason: string }> = {
  GS: 'gross',
  G: 'gross',
  NT: 'net',
  N: 'net',
  TR: { reason: 'the balance sent its tare memory, not the weight on the pan' },
  T: { reason: 'the balance sent its tare memory, not the weight on the pan' },
  QT: { reason: 'the balance is counting pieces, not weighing: switch it back to weighing' },
  PC: { reason: 'the balance is counting pieces, not weighing: switch it back to weighing' },
};

/** One line from a balance; null for a blank line (balances send them between readings). */
export function parseScaleLine(text: string): ScaleReading | null {
  // Framing bytes (STX, ETX, NUL) and tabs become spaces; the layouts are read on what is printable.
  // eslint-disable-next-line no-control-regex
  const line = text.replace(/[\x00-\x1f\x7f]/g, ' ').trim();
  if (!line) return null;
  if (line.length > MAX_LINE) return { kind: 'unreadable', reason: 'the line is longer than any balance reading', line: line.slice(0, MAX_LINE) };

  const coded = CODED.exec(line);
  if (coded) return readCoded(coded[1]!.toUpperCase(), coded[2]?.toUpperCase(), coded[3]!.trim(), line);

  const reply = REPLY.exec(line);
  if (reply) return readReply(reply[1]!.toUpperCase(), reply[2]!.trim(), line);
  if (REPLY_ERROR.test(line)) return { kind: 'no-weight', layout: 'reply', reason: 'the balance did not accept a command and sent no weight', line };

  return readPlain(line);
}

function readCoded(status: string, code: string | undefined, rest: string, line: string): ScaleReading {
  if (status === 'OL') return { kind: rest.startsWith('-') ? 'underload' : 'overload', layout: 'coded', line };
  let basis: 'gross' | 'net' | null = null;
  if (code !== undefined) {
    const meaning = CODED_KINDS[code];
    if (meaning === undefined) return { kind: 'unreadable', reason: `unknown data code "${code}"`, line };
    if (typeof meaning === 'object') return { kind: 'no-weight', layout: 'coded', reason: meaning.reason, line };
    basis = meaning;
  }
  if (OVER.test(rest)) return { kind: 'overload', layout: 'coded', line };
  if (UNDER.test(rest)) return { kind: 'underload', layout: 'coded', line };
  return weightOf(rest, { layout: 'coded', stable: status === 'ST', basis, line });
}

function readReply(status: string, rest: string, line: string): ScaleReading {
  if (status === '+') return { kind: 'overload', layout: 'reply', line };
  if (status === '-') return { kind: 'underload', layout: 'reply', line };
  if (status === 'I') return { kind: 'no-weight', layout: 'reply', reason: 'the balance was busy and sent no weight', line };
  return weightOf(rest, { layout: 'reply', stable: status === 'S', basis: null, line });
}

function readPlain(line: string): ScaleReading {
  let stable = true;
  let basis: 'gross' | 'net' | null = null;
  let rest = line;
  if (rest.includes('?')) {
    stable = false;
    rest = rest.replace(/\?/g, ' ').trim();
  }
  const apply = (word: string) => {
    if (BASIS_WORDS[word]) basis = BASIS_WORDS[word]!;
    else if (MOTION_WORDS.has(word)) stable = false;
  };
  const lead = LEADING_WORD.exec(rest);
  if (lead) {
    apply(lead[1]!.toUpperCase());
    rest = rest.slice(lead[0].length);
  }
  // A label or a stability word after the unit; what stays before it must still end in a unit,
  // so "+ 12.345 G" keeps G as grams.
  for (let i = 0; i < 2; i++) {
    const m = TRAILING_WORD.exec(rest);
    const word = m?.[2]!.toUpperCase();
    if (!m || !word || !(BASIS_WORDS[word] || MOTION_WORDS.has(word) || STABLE_WORDS.has(word)) || !/[A-Za-z]$/.test(m[1]!)) break;
    apply(word);
    rest = m[1]!;
  }
  if (OVER.test(rest)) return { kind: 'overload', layout: 'plain', line };
  if (UNDER.test(rest)) return { kind: 'underload', layout: 'plain', line };
  const error = DEVICE_ERROR.exec(rest);
  if (error) return { kind: 'no-weight', layout: 'plain', reason: `the balance shows an error${error[1] ? ` (${error[1]})` : ''}: see its manual`, line };
  return weightOf(rest, { layout: 'plain', stable, basis, line });
}

function weightOf(
  text: string,
  at: { layout: ScaleLayout; stable: boolean; basis: 'gross' | 'net' | null; line: string },
): ScaleReading {
  const { line, layout } = at;
  if (/\d,\d/.test(text)) {
    return { kind: 'unreadable', reason: 'the balance writes a decimal comma: set it to print a decimal point', line };
  }
  const m = VALUE_UNIT.exec(text);
  if (!m) return { kind: 'unreadable', reason: text ? 'no weight in the line' : 'the line holds no weight', line };
  const unitText = m[3]?.trim();
  if (!unitText) return { kind: 'unreadable', reason: 'the balance sent a number without a unit', line };
  const unit = readScaleUnit(unitText);
  if (!unit.ok) return unit.weighs ? { kind: 'no-weight', layout, reason: unit.reason, line } : { kind: 'unreadable', reason: unit.reason, line };
  return { kind: 'weight', layout, stable: at.stable, negative: m[1] === '-', value: tidyNumber(m[2]!), unit: unit.unit, basis: at.basis, line };
}

type UnitRead = { ok: true; unit: ScaleUnit } | { ok: false; weighs: boolean; reason: string };

const EXTRA_UNITS: Record<string, ScaleUnit> = { mg: 'mg', ct: 'ct', carat: 'ct', carats: 'ct', gn: 'gr', 't oz': 'ozt', 'oz.t': 'ozt' };
const COUNTING = new Set(['pcs', 'pc', 'pce', '%']);

/** The pricing feature's unit names, plus what balances print: ct (metric carat), mg, GN (grains). */
export function readScaleUnit(text: string): UnitRead {
  const key = text.trim().toLowerCase().replace(/\s+/g, ' ').replace(/\.$/, '');
  const extra = EXTRA_UNITS[key];
  if (extra) return { ok: true, unit: extra };
  if (COUNTING.has(key)) return { ok: false, weighs: true, reason: 'the balance is counting pieces or showing a percentage, not weighing' };
  const read = readWeightUnit(key);
  if (read.ok) return { ok: true, unit: read.unit };
  if (read.message === AVOIRDUPOIS_REFUSAL) {
    return {
      ok: false,
      weighs: true,
      reason:
        `the balance weighs in "${text.trim()}", an avoirdupois unit never used for precious metal (the avoirdupois ounce is ` +
        `${GRAMS_PER_AVOIRDUPOIS_OUNCE} g, about 10% lighter than the troy ounce of ${GRAMS_PER_TROY_OUNCE} g): set the balance to g, ct, dwt, ozt or gr`,
    };
  }
  return { ok: false, weighs: false, reason: `unknown unit "${text.trim().slice(0, 12)}"` };
}

/** "0012.340" -> "12.340", ".5" -> "0.5", "12." -> "12". Digits after the point are kept: they are the balance's resolution. */
function tidyNumber(digits: string): string {
  let [whole, frac] = digits.split('.') as [string, string | undefined];
  whole = whole.replace(/^0+(?=\d)/, '') || '0';
  return frac ? `${whole}.${frac}` : whole;
}
