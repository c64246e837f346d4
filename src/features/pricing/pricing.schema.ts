import { z } from 'zod';
import { COIN_TYPES, FACE_VALUE_BASES, FACE_VALUE_CLASS_IDS } from './coins';
import { DECIMAL_PATTERN, Dec, compareRatio, parseRatio } from './decimal';
import { RENAMED_MARK_KEYS, isMarkKey, markedFinenessOfKey, parseMark } from './marks';
import { METALS } from './metals';
import { CURRENCY_CODES, type CurrencyCode } from './money';
import { LINE_CATEGORIES, RATE_CATEGORIES, SPLIT_RATE_CATEGORIES, type RateCategory } from './rates';
import { checkQuoteConsistency } from './resolve';
import { readWeightUnit, toGrams, type WeightUnit } from './units';

function isUsableLocale(locale: string): boolean {
  try {
    new Intl.NumberFormat(locale);
    return true;
  } catch {
    return false;
  }
}

export const MAX_LINE_WEIGHT_GRAMS = '100000';
export const MAX_SPOT_PER_TROY_OUNCE = '100000000';
export const MAX_COIN_COUNT = 100_000;
export const MAX_LINES = 500;
const MAX_DECIMAL_PLACES = 10;
const MAX_DECIMAL_LENGTH = 30;

interface DecimalRules {
  positive?: boolean;
  max?: string;
  maxMessage?: string;
}

/** A decimal written as a string ("12.5"); a JSON number is taken by its shortest written form, never computed on. */
export function decimalField(rules: DecimalRules = {}) {
  return z.unknown().transform((value, ctx): string => {
    let text: string;
    if (typeof value === 'string') text = value.trim();
    else if (typeof value === 'number') text = Number.isFinite(value) ? String(value) : String(value);
    else {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'is required: a decimal number written like "12.34"' });
      return z.NEVER;
    }
    if (text.length > MAX_DECIMAL_LENGTH || !DECIMAL_PATTERN.test(text)) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: `must be a decimal number written like "12.34" (got "${text.slice(0, 40)}")` });
      return z.NEVER;
    }
    const dot = text.indexOf('.');
    if (dot >= 0 && text.length - dot - 1 > MAX_DECIMAL_PLACES) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: `must have at most ${MAX_DECIMAL_PLACES} decimal places` });
      return z.NEVER;
    }
    const d = new Dec(text);
    if (d.isNegative() && !d.isZero()) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'must not be negative' });
      return z.NEVER;
    }
    if (rules.positive && d.isZero()) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'must be greater than 0' });
      return z.NEVER;
    }
    if (rules.max !== undefined && d.gt(rules.max)) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: rules.maxMessage ?? `must be at most ${rules.max}` });
      return z.NEVER;
    }
    return d.isZero() ? '0' : text.replace(/^-/, '');
  });
}

export const finenessField = decimalField({
  positive: true,
  max: '1',
  maxMessage: 'is a fraction of 1 and must be at most 1 (write 0.925, not 925)',
});

export const spotField = decimalField({
  positive: true,
  max: MAX_SPOT_PER_TROY_OUNCE,
  maxMessage: `must be at most ${MAX_SPOT_PER_TROY_OUNCE} per troy ounce`,
});

export const weightUnitField = z.unknown().transform((value, ctx): WeightUnit => {
  if (typeof value !== 'string') {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'is required: one of g, ozt, dwt, gr, kg' });
    return z.NEVER;
  }
  const read = readWeightUnit(value);
  if (!read.ok) {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: read.message });
    return z.NEVER;
  }
  return read.unit;
});

/** A weight in any troy or metric unit; carries its exact value in grams after parsing. */
export const weightSchema = z
  .object({ value: decimalField({ positive: true }), unit: weightUnitField })
  .transform((w, ctx) => {
    const grams = toGrams(w.value, w.unit);
    if (grams.gt(MAX_LINE_WEIGHT_GRAMS)) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, path: ['value'], message: 'is over 100 kg (100000 g): weigh it as several lines or check the unit' });
      return z.NEVER;
    }
    return { value: w.value, unit: w.unit, grams: grams.toFixed() };
  });

export const countField = z.unknown().transform((value, ctx): number => {
  const n = typeof value === 'number' ? value : typeof value === 'string' && /^\s*\d+\s*$/.test(value) ? Number(value) : NaN;
  if (!Number.isInteger(n) || n < 1) {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'must be a whole number of coins, at least 1' });
    return z.NEVER;
  }
  if (n > MAX_COIN_COUNT) {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: `must be at most ${MAX_COIN_COUNT}` });
    return z.NEVER;
  }
  return n;
});

export const rateRuleSchema = z.discriminatedUnion('basis', [
  z.object({
    basis: z.literal('percent-of-melt'),
    percent: decimalField({ max: '100', maxMessage: 'must be at most 100 (Cupel does not pay above melt)' }),
  }).strict(),
  z.object({ basis: z.literal('under-spot'), amountPerTroyOunce: decimalField() }).strict(),
]);

/** A rate saved for a category that was split applies to each part that has none of its own. */
function splitOldCategories(value: unknown): unknown {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return value;
  const record = value as Record<string, unknown>;
  if (!Object.keys(SPLIT_RATE_CATEGORIES).some((old) => Object.hasOwn(record, old))) return value;
  const out: Record<string, unknown> = {};
  for (const [key, rule] of Object.entries(record)) {
    const parts = SPLIT_RATE_CATEGORIES[key];
    if (!parts) out[key] = rule;
    else for (const part of parts) if (!Object.hasOwn(record, part)) out[part] = rule;
  }
  return out;
}

export const ratesSchema = z.preprocess(
  splitOldCategories,
  z
    .object(Object.fromEntries(RATE_CATEGORIES.map((c) => [c, rateRuleSchema.optional()])) as Record<RateCategory, z.ZodOptional<typeof rateRuleSchema>>)
    .strict(),
);

const metalSchema = z.enum(METALS);
const lineCategorySchema = z.enum(LINE_CATEGORIES);
const description = z.string().max(200).optional();

export const deductionSchema = z.object({
  kind: z.enum(['grams', 'percent']),
  value: decimalField({ positive: true }),
  reason: z.string().max(120).optional(),
}).strict().superRefine((d, ctx) => {
  if (d.kind === 'percent' && new Dec(d.value).gt(100)) {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, path: ['value'], message: 'a percentage deduction must be at most 100' });
  }
});

export const weightLineSchema = z.object({
  kind: z.literal('weight'),
  category: lineCategorySchema.default('jewelry'),
  mark: z.string().max(200).optional(),
  fineness: finenessField.optional(),
  metal: metalSchema.optional(),
  grossWeight: weightSchema,
  tare: weightSchema.optional(),
  deductions: z.array(deductionSchema).max(20).default([]),
  rateOverride: rateRuleSchema.optional(),
  description,
}).strict();

export const coinLineSchema = z.object({
  kind: z.literal('coin'),
  coinType: z.string().superRefine((t, ctx) => {
    if (!COIN_TYPES.includes(t)) ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: `unknown coin type "${t.slice(0, 40)}"` });
  }),
  count: countField,
  rateOverride: rateRuleSchema.optional(),
  description,
}).strict();

export const faceValueLineSchema = z.object({
  kind: z.literal('face-value'),
  coinClass: z.string().superRefine((t, ctx) => {
    if (!FACE_VALUE_CLASS_IDS.includes(t)) ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: `unknown coin class "${t.slice(0, 40)}"` });
  }),
  faceValue: decimalField({ positive: true, max: '1000000', maxMessage: 'must be at most 1000000 face' }),
  /** Left out, the class's counter basis (`FaceValueClass.counterBasis`). */
  basis: z.enum(FACE_VALUE_BASES, { errorMap: () => ({ message: `basis must be ${FACE_VALUE_BASES.join(' or ')}` }) }).optional(),
  rateOverride: rateRuleSchema.optional(),
  description,
}).strict();

export const fineWeightLineSchema = z.object({
  kind: z.literal('fine-weight'),
  metal: metalSchema,
  fineWeight: weightSchema,
  category: lineCategorySchema.default('scrap'),
  rateOverride: rateRuleSchema.optional(),
  description,
}).strict();

export const quoteLineSchema = z.discriminatedUnion('kind', [weightLineSchema, coinLineSchema, faceValueLineSchema, fineWeightLineSchema]);

export const spotSchema = z.object({
  gold: spotField.optional(),
  silver: spotField.optional(),
  platinum: spotField.optional(),
  palladium: spotField.optional(),
}).strict();

/** Why a key is refused; a number of several metals names the keys to use instead ("990" -> AU990, AG990...). */
function unknownMarkKeyMessage(key: string): string {
  const shown = key.slice(0, 40);
  const reading = parseMark(key);
  if (reading.reason === 'ambiguous-metal') {
    const keys = reading.candidates.map((c) => c.key);
    const renamed = RENAMED_MARK_KEYS[key];
    return `"${shown}" is a fineness of more than one metal: use ${keys.join(', ')}${renamed ? ` (${renamed} is what "${shown}" meant before)` : ''}`;
  }
  return `"${shown}" is not a mark key Cupel knows`;
}

export const assumedFinenessSchema = z.record(z.string(), finenessField).superRefine((record, ctx) => {
  for (const [key, value] of Object.entries(record)) {
    if (!isMarkKey(key)) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, path: [key], message: unknownMarkKeyMessage(key) });
      continue;
    }
    const marked = markedFinenessOfKey(key)!;
    if (compareRatio(parseRatio(value), parseRatio(marked)) > 0) {
      ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, path: [key], message: `is above the marked fineness of ${key} (${marked})` });
    }
  }
});

export const quoteInputSchema = z.object({
  currency: z.enum(CURRENCY_CODES as [CurrencyCode, ...CurrencyCode[]]).default('USD'),
  locale: z
    .string()
    .max(35)
    .superRefine((l, ctx) => {
      if (!isUsableLocale(l)) ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, message: 'is not a locale this runtime can format money in' });
    })
    .default('en-US'),
  spot: spotSchema.default({}),
  rates: ratesSchema.optional(),
  assumedFineness: assumedFinenessSchema.default({}),
  rateOverride: rateRuleSchema.optional(),
  lines: z.array(quoteLineSchema).max(MAX_LINES),
}).strict().superRefine((quote, ctx) => {
  // Runs only when every field parsed: field issues above are fatal.
  for (const issue of checkQuoteConsistency(quote)) {
    ctx.addIssue({ fatal: true, code: z.ZodIssueCode.custom, path: issue.path, message: issue.message });
  }
});

export type QuoteInput = z.input<typeof quoteInputSchema>;
export type ValidQuoteInput = z.output<typeof quoteInputSchema>;
export type ValidQuoteLine = ValidQuoteInput['lines'][number];
export type ValidWeightLine = z.output<typeof weightLineSchema>;
export type ValidCoinLine = z.output<typeof coinLineSchema>;
export type ValidFaceValueLine = z.output<typeof faceValueLineSchema>;
export type ValidFineWeightLine = z.output<typeof fineWeightLineSchema>;
export type ValidRateRule = z.output<typeof rateRuleSchema>;
