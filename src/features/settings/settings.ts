import { z } from 'zod';
import { assumedFinenessSchema, ratesSchema } from '@/features/pricing/pricing.schema';

/**
 * Store settings: each key has a type, a default and a description. Rules that the law decides
 * (age, ID, hold period, cash limits) are settings because they differ by place; the defaults
 * are common starting points, not legal advice.
 */
export const SETTING_DEFINITIONS = {
  'seller.minimum_age_years': {
    type: 'integer',
    schema: z.number().int().min(16).max(99),
    default: 18,
    label: 'Minimum seller age (years)',
    help: 'Local law sets the minimum age to sell precious metal; 18 is common.',
  },
  'seller.expired_id_blocks': {
    type: 'boolean',
    schema: z.boolean(),
    default: true,
    label: 'An expired ID blocks a purchase',
    help: 'Whether an ID document past its expiry date may be accepted.',
  },
  'seller.accepted_id_types': {
    type: 'json',
    schema: z.array(z.enum(['drivers-license', 'state-id', 'passport', 'national-id', 'residence-permit', 'military-id'])).min(1),
    default: ['drivers-license', 'state-id', 'passport', 'military-id'],
    label: 'Accepted ID documents',
    help: 'Government photo ID types the store accepts, as local law allows.',
  },
  'hold.period_days': {
    type: 'integer',
    schema: z.number().int().min(0).max(365),
    default: 10,
    label: 'Hold period (days)',
    help: 'Days purchased items are held before melting or resale; local law decides (commonly 7 to 30).',
  },
  'spot.stale_after_minutes': {
    type: 'integer',
    schema: z.number().int().min(1).max(1440),
    default: 30,
    label: 'Spot price goes stale after (minutes)',
    help: 'A quote cannot be given on a spot price older than this.',
  },
  'spot.clerks_may_enter': {
    type: 'boolean',
    schema: z.boolean(),
    default: true,
    label: 'Clerks may enter spot prices',
    help: 'When off, only managers enter the day\u2019s spot.',
  },
  'cash.limit_per_ticket': {
    type: 'decimal',
    schema: z.string().regex(/^\d+(\.\d{1,2})?$/, 'an amount like 2500.00'),
    default: '2500.00',
    label: 'Cash limit per ticket',
    help: 'Above this amount cash is refused. Large cash payments are reportable in many places.',
  },
  'rates.clerk_raise_limit_points': {
    type: 'decimal',
    schema: z.string().regex(/^\d+(\.\d{1,2})?$/, 'percentage points like 3.00'),
    default: '3.00',
    label: 'Clerk may raise a rate by up to (percentage points)',
    help: 'Raises beyond this need a manager\u2019s approval.',
  },
  'pricing.rates': {
    type: 'json',
    schema: ratesSchema,
    default: {},
    label: 'Payout rates',
    help: 'Per category, a percentage of melt value or an amount under spot per troy ounce. Categories not set use Cupel\u2019s defaults.',
  },
  'pricing.assumed_fineness': {
    type: 'json',
    schema: assumedFinenessSchema,
    default: {},
    label: 'Paid-on fineness by mark',
    help: 'Marked items often assay a little under their mark (US law allows small tolerances, 15 U.S.C. 295); the shop may pay on a lower fineness.',
  },
  'counter.ownership_statement': {
    type: 'string',
    schema: z.string().trim().min(20).max(2000),
    default:
      'I declare that I am the lawful owner of the items listed, or am authorised by their owner to sell them, that they are not stolen, and that the identification I presented is my own.',
    label: 'Seller\u2019s statement of ownership',
    help: 'The statement a seller agrees to when signing; have it reviewed against local law.',
  },
} as const satisfies Record<string, { type: 'integer' | 'decimal' | 'boolean' | 'string' | 'json'; schema: z.ZodTypeAny; default: unknown; label: string; help: string }>;

export type SettingKey = keyof typeof SETTING_DEFINITIONS;
export type SettingValue<K extends SettingKey> = z.infer<(typeof SETTING_DEFINITIONS)[K]['schema']>;
export type StoreSettings = { [K in SettingKey]: SettingValue<K> };

export function isSettingKey(key: string): key is SettingKey {
  return Object.hasOwn(SETTING_DEFINITIONS, key);
}

export function defaultSettings(): StoreSettings {
  const out: Record<string, unknown> = {};
  for (const [key, def] of Object.entries(SETTING_DEFINITIONS)) out[key] = structuredClone(def.default);
  return out as StoreSettings;
}

/** Parses a value for a key, with an error that names the key. */
export function parseSettingValue<K extends SettingKey>(key: K, value: unknown): SettingValue<K> {
  const result = SETTING_DEFINITIONS[key].schema.safeParse(value);
  if (!result.success) {
    throw new SettingValueError(key, result.error.issues.map((i) => i.message).join('; '));
  }
  return result.data as SettingValue<K>;
}

export class SettingValueError extends Error {
  constructor(
    readonly key: string,
    message: string,
  ) {
    super(`${key}: ${message}`);
  }
}
