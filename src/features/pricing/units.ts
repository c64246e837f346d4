import { Dec, dec, exact, type Exact } from './decimal';

export const WEIGHT_UNITS = ['g', 'kg', 'ozt', 'dwt', 'gr'] as const;
export type WeightUnit = (typeof WEIGHT_UNITS)[number];

/** Exact definitions (NIST Handbook 44, Appendix C): 1 gr = 64.79891 mg; 1 dwt = 24 gr; 1 ozt = 480 gr. */
export const GRAMS_PER_GRAIN = '0.06479891';
export const GRAMS_PER_PENNYWEIGHT = '1.55517384';
export const GRAMS_PER_TROY_OUNCE = '31.1034768';
/** Only to explain refusals: never used to weigh metal. */
export const GRAMS_PER_AVOIRDUPOIS_OUNCE = '28.349523125';

const GRAMS_PER_UNIT: Record<WeightUnit, Dec> = {
  g: new Dec(1),
  kg: new Dec(1000),
  ozt: new Dec(GRAMS_PER_TROY_OUNCE),
  dwt: new Dec(GRAMS_PER_PENNYWEIGHT),
  gr: new Dec(GRAMS_PER_GRAIN),
};

export const TROY_OUNCE_GRAMS: Dec = GRAMS_PER_UNIT.ozt;
export const TROY_OUNCE_GRAMS_EXACT: Exact = exact(GRAMS_PER_TROY_OUNCE);
export const PENNYWEIGHT_GRAMS_EXACT: Exact = exact(GRAMS_PER_PENNYWEIGHT);

export const WEIGHT_UNIT_LABELS: Record<WeightUnit, string> = {
  g: 'grams',
  kg: 'kilograms',
  ozt: 'troy ounces',
  dwt: 'pennyweights',
  gr: 'grains',
};

const UNIT_ALIASES: Record<string, WeightUnit> = {
  g: 'g', gm: 'g', gms: 'g', gram: 'g', grams: 'g', gramme: 'g', grammes: 'g',
  kg: 'kg', kilo: 'kg', kilos: 'kg', kilogram: 'kg', kilograms: 'kg',
  ozt: 'ozt', 'oz t': 'ozt', 'oz tr': 'ozt', oz_tr: 'ozt', '[oz_tr]': 'ozt', toz: 'ozt', 'troy oz': 'ozt',
  'troy ounce': 'ozt', 'troy ounces': 'ozt', 'oz troy': 'ozt', 'ounce troy': 'ozt',
  dwt: 'dwt', pwt: 'dwt', '[pwt_tr]': 'dwt', pennyweight: 'dwt', pennyweights: 'dwt',
  gr: 'gr', '[gr]': 'gr', grain: 'gr', grains: 'gr',
};

const AVOIRDUPOIS_NAMES = new Set([
  'oz', 'ounce', 'ounces', 'oz av', 'oz avdp', 'avdp', 'avoirdupois', 'avoirdupois ounce', 'avoirdupois ounces',
  '[oz_av]', 'oz_av', 'lb', 'lbs', 'pound', 'pounds', '[lb_av]',
]);

export const AVOIRDUPOIS_REFUSAL =
  'Cupel weighs metal in troy units only: the avoirdupois ounce (28.349523125 g) is about 10% lighter than ' +
  'the troy ounce (31.1034768 g) and is never used for precious metal. Enter the weight in g, ozt, dwt, gr or kg.';

export type UnitReading = { ok: true; unit: WeightUnit } | { ok: false; message: string };

/** Reads a unit as typed by a clerk; refuses avoirdupois ounces and pounds with the reason. */
export function readWeightUnit(text: string): UnitReading {
  const key = text.trim().toLowerCase().replace(/\s+/g, ' ').replace(/\.$/, '');
  const unit = UNIT_ALIASES[key];
  if (unit) return { ok: true, unit };
  if (AVOIRDUPOIS_NAMES.has(key)) return { ok: false, message: AVOIRDUPOIS_REFUSAL };
  return { ok: false, message: `unknown weight unit "${text.slice(0, 40)}"; use g, ozt, dwt, gr or kg` };
}

/** Exact: every unit is a terminating decimal number of grams. */
export function toGrams(value: string | Dec, unit: WeightUnit): Dec {
  return unit === 'g' ? dec(value) : dec(value).mul(GRAMS_PER_UNIT[unit]);
}

/** Exact for any value that came from toGrams; otherwise correct to 80 significant digits. */
export function fromGrams(grams: string | Dec, unit: WeightUnit): Dec {
  return unit === 'g' ? dec(grams) : dec(grams).div(GRAMS_PER_UNIT[unit]);
}

export function convertWeight(value: string | Dec, from: WeightUnit, to: WeightUnit): Dec {
  return from === to ? dec(value) : fromGrams(toGrams(value, from), to);
}

export function gramsPerUnit(unit: WeightUnit): string {
  return GRAMS_PER_UNIT[unit].toFixed();
}
