import { exact, exactToString, mulExact, type Exact } from '@/features/pricing/decimal';
import { gramsPerUnit, WEIGHT_UNIT_LABELS, type WeightUnit } from '@/features/pricing/units';
import type { ScaleReading, ScaleUnit } from './scale';

/** A reading older than this is not "the current reading": the balance has stopped sending or was unplugged. */
export const READING_FRESH_MS = 3000;

/** The pricing schema's limit on a weight's decimal places (pricing.schema.ts); a placed weight must fit it. */
export const LINE_WEIGHT_MAX_PLACES = 10;

/** Exact definitions (NIST Handbook 44, Appendix C): 1 metric carat = 200 mg; 1 mg = 0.001 g. */
const GRAMS_PER_SCALE_ONLY_UNIT: Record<'mg' | 'ct', string> = { mg: '0.001', ct: '0.2' };

export interface ScaleWeight {
  /** What the balance showed, as the clerk would read it off its display. */
  shown: string;
  /** The weight in a unit a line can hold, exactly equal to what the balance showed. */
  value: string;
  unit: WeightUnit;
}

export type Checked = { ok: true; weight: ScaleWeight } | { ok: false; reason: string };

/**
 * Whether the latest line from the balance may become a line's gross weight: only a settled, positive
 * weight in a unit used for precious metal, received within READING_FRESH_MS.
 */
export function checkReading(latest: { reading: ScaleReading; ageMs: number } | null): Checked {
  if (!latest) return { ok: false, reason: 'No reading from the scale yet: check the cable and the baud rate, and set the balance to send its weight (continuous output, or its print key).' };
  const { reading, ageMs } = latest;
  if (ageMs > READING_FRESH_MS) {
    return { ok: false, reason: `The last reading is ${Math.floor(ageMs / 1000)} s old: the scale has stopped sending. Press the balance's print key, or set it to continuous output, and take the weight again.` };
  }
  switch (reading.kind) {
    case 'overload':
      return { ok: false, reason: 'The scale is overloaded: the load is above its range. Take it off and weigh it on a balance with a larger capacity, or in parts.' };
    case 'underload':
      return { ok: false, reason: 'The scale reads below zero (underload): clear the pan and zero the balance.' };
    case 'no-weight':
      return { ok: false, reason: `The scale sent no usable weight: ${reading.reason}.` };
    case 'unreadable':
      return { ok: false, reason: `Cupel cannot read what the scale sends ("${reading.line.slice(0, 40)}"): ${reading.reason}. Check the baud rate and the balance's output format.` };
    case 'weight':
      break;
  }
  if (!reading.stable) return { ok: false, reason: 'The scale is not steady yet (the reading is still moving): wait for it to settle and take the weight again.' };
  const shown = `${reading.negative ? '-' : ''}${reading.value} ${reading.unit}`;
  if (reading.negative) return { ok: false, reason: `The scale reads a negative weight (${shown}): empty the pan, zero the balance and weigh again.` };
  if (exact(reading.value).m === 0n) return { ok: false, reason: 'The scale reads zero: put the item on the pan.' };
  return { ok: true, weight: toLineUnit(reading.value, reading.unit, shown) };
}

/** Carat and milligram readings become grams, exactly; the other units are units a line holds. */
function toLineUnit(value: string, unit: ScaleUnit, shown: string): ScaleWeight {
  if (unit === 'mg' || unit === 'ct') return { shown, value: exactToString(mulExact(exact(value), exact(GRAMS_PER_SCALE_ONLY_UNIT[unit]))), unit: 'g' };
  return { shown, value, unit };
}

/** value in `from`, written exactly in `to` with at most LINE_WEIGHT_MAX_PLACES places; null when it cannot be. */
export function convertExactly(value: string, from: WeightUnit, to: WeightUnit): string | null {
  if (from === to) return value;
  const v = exact(value);
  const a = exact(gramsPerUnit(from));
  const b = exact(gramsPerUnit(to));
  // value x a / b, as the fraction n / d of integers
  const n = v.m * a.m * 10n ** BigInt(b.s);
  const d = b.m * 10n ** BigInt(v.s + a.s);
  for (let places = 0; places <= LINE_WEIGHT_MAX_PLACES; places++) {
    const scaled = n * 10n ** BigInt(places);
    if (scaled % d === 0n) return exactToString({ m: scaled / d, s: places } satisfies Exact);
  }
  return null;
}

export interface LineWeightFields {
  grossValue: string;
  grossUnit: WeightUnit;
  tareValue: string;
}

export type Placed = { ok: true; fields: LineWeightFields; shown: string; note: string | null } | { ok: false; reason: string };

/**
 * Puts a checked weight into a line. The line takes the balance's unit, so the screen shows what the
 * balance shows; a typed tare is rewritten in that unit when it can be exactly. When it cannot, the reading
 * is written in the line's unit if that is exact; otherwise nothing changes and the reason is given.
 */
export function placeWeight(weight: ScaleWeight, line: { grossUnit: WeightUnit; tareValue: string }): Placed {
  const converted = weight.shown !== `${weight.value} ${weight.unit}`;
  const shown = converted ? `${weight.shown} (${weight.value} ${weight.unit})` : weight.shown;
  const tare = line.tareValue.trim();
  if (!tare || line.grossUnit === weight.unit) {
    const note = line.grossUnit === weight.unit ? null : `the line now weighs in ${WEIGHT_UNIT_LABELS[weight.unit]}`;
    return { ok: true, fields: { grossValue: weight.value, grossUnit: weight.unit, tareValue: line.tareValue }, shown, note };
  }
  if (!/^\d+(\.\d+)?$/.test(tare)) return { ok: false, reason: 'The tare on this line is not a number yet: correct or clear it, then take the weight again.' };
  const tareInReadingUnit = convertExactly(tare, line.grossUnit, weight.unit);
  if (tareInReadingUnit !== null) {
    return {
      ok: true,
      fields: { grossValue: weight.value, grossUnit: weight.unit, tareValue: tareInReadingUnit },
      shown,
      note: `the tare of ${tare} ${line.grossUnit} is now written as ${tareInReadingUnit} ${weight.unit}`,
    };
  }
  const grossInLineUnit = convertExactly(weight.value, weight.unit, line.grossUnit);
  if (grossInLineUnit !== null) {
    return {
      ok: true,
      fields: { grossValue: grossInLineUnit, grossUnit: line.grossUnit, tareValue: line.tareValue },
      shown,
      note: `written as ${grossInLineUnit} ${line.grossUnit}, the unit of the tare`,
    };
  }
  return {
    ok: false,
    reason: `The tare is in ${WEIGHT_UNIT_LABELS[line.grossUnit]} and the scale weighs in ${WEIGHT_UNIT_LABELS[weight.unit]}; neither can be written exactly in the other. Clear the tare (or zero the balance with the container on it) and take the weight again.`,
  };
}
