import type { Metal } from './metals';

export const RATE_CATEGORIES = [
  'gold-jewelry-below-14k',
  'gold-jewelry-14k-to-17k',
  'gold-jewelry-18k-to-21k',
  'gold-jewelry-22k-to-23k',
  'gold-jewelry-24k',
  'gold-scrap',
  'gold-filled',
  'gold-coin',
  'gold-bullion',
  'silver-flatware',
  'silver-scrap',
  'silver-coin',
  'silver-bullion',
  'platinum',
  'platinum-bullion',
  'palladium',
  'palladium-bullion',
] as const;
export type RateCategory = (typeof RATE_CATEGORIES)[number];

/** How each category reads on the settings screen and wherever a rate is named. */
export const RATE_CATEGORY_LABELS: Readonly<Record<RateCategory, string>> = Object.freeze({
  'gold-jewelry-below-14k': 'Gold jewelry below 14K',
  'gold-jewelry-14k-to-17k': 'Gold jewelry 14K to 17K',
  'gold-jewelry-18k-to-21k': 'Gold jewelry 18K to 21K',
  'gold-jewelry-22k-to-23k': 'Gold jewelry 22K and 23K',
  'gold-jewelry-24k': 'Gold jewelry 24K (fine gold)',
  'gold-scrap': 'Gold scrap and dental',
  'gold-filled': 'Gold-filled',
  'gold-coin': 'Gold coins',
  'gold-bullion': 'Gold bullion',
  'silver-flatware': 'Sterling flatware and hollowware',
  'silver-scrap': 'Silver scrap and jewelry',
  'silver-coin': 'Silver coins',
  'silver-bullion': 'Silver bullion',
  platinum: 'Platinum jewelry and scrap',
  'platinum-bullion': 'Platinum bullion and coins',
  palladium: 'Palladium jewelry and scrap',
  'palladium-bullion': 'Palladium bullion and coins',
});

/**
 * Categories that were split: a rate saved for the old one applies to each of its parts that has no
 * rate of its own. Saved settings were moved by a migration; the schema still reads the old key.
 */
export const SPLIT_RATE_CATEGORIES: Readonly<Record<string, readonly RateCategory[]>> = Object.freeze({
  'gold-jewelry-18k-and-above': ['gold-jewelry-18k-to-21k', 'gold-jewelry-22k-to-23k', 'gold-jewelry-24k'],
});

/** What the clerk says the item is; with the metal and fineness it decides the rate category. */
export const LINE_CATEGORIES = ['jewelry', 'scrap', 'dental', 'flatware', 'hollowware', 'coin', 'bullion'] as const;
export type LineCategory = (typeof LINE_CATEGORIES)[number];

export type RateRule =
  | { readonly basis: 'percent-of-melt'; readonly percent: string }
  | { readonly basis: 'under-spot'; readonly amountPerTroyOunce: string };

export type Rates = Readonly<Record<RateCategory, RateRule>>;

const percent = (p: string): RateRule => Object.freeze({ basis: 'percent-of-melt', percent: p });

/**
 * Common practice, not a rule: shops set their own. All percent-of-melt so the defaults hold in any
 * currency; a shop that buys bullion at an amount under spot sets that in its own rates. Higher karats
 * and bullion pay a larger share of melt because they cost less to refine (common practice, from memory).
 */
export const DEFAULT_RATES: Rates = Object.freeze({
  'gold-jewelry-below-14k': percent('75'),
  'gold-jewelry-14k-to-17k': percent('80'),
  'gold-jewelry-18k-to-21k': percent('82'),
  'gold-jewelry-22k-to-23k': percent('84'),
  'gold-jewelry-24k': percent('86'),
  'gold-scrap': percent('75'),
  'gold-filled': percent('50'),
  'gold-coin': percent('92'),
  'gold-bullion': percent('97'),
  'silver-flatware': percent('75'),
  'silver-scrap': percent('70'),
  'silver-coin': percent('85'),
  'silver-bullion': percent('95'),
  platinum: percent('70'),
  'platinum-bullion': percent('94'),
  palladium: percent('65'),
  'palladium-bullion': percent('92'),
});

/**
 * Karat bands for gold jewelry, on the marked (or tested) fineness, highest first. 15 U.S.C. 295 lets a
 * gold article assayed with its solder fall up to 7/1000 below its mark, so each band starts at the lowest
 * such floor among its marks, rounded down to the thousandth:
 * - 14K: the 583 mark's floor 583 - 7 = 576 (14K itself 583.33 - 7 = 576.33; 585: 578);
 * - 18K: 750 - 7 = 743;
 * - 22K: the 916 mark's floor 916 - 7 = 909 (22K itself 916.67 - 7 = 909.67);
 * - 24K (fine gold): the 990 mark's floor 990 - 7 = 983 (999: 992; 24K: 993).
 * Each edge stays above the karat below it at its nominal fineness (13K 541.7, 17K 708.3, 21K 875, 23K 958.3).
 */
export const GOLD_JEWELRY_BANDS: readonly { readonly from: string; readonly category: RateCategory }[] = Object.freeze([
  { from: '0.983', category: 'gold-jewelry-24k' },
  { from: '0.909', category: 'gold-jewelry-22k-to-23k' },
  { from: '0.743', category: 'gold-jewelry-18k-to-21k' },
  { from: '0.576', category: 'gold-jewelry-14k-to-17k' },
]);

export function resolveRateCategory(
  metal: Metal,
  lineCategory: LineCategory,
  markedFineness: { gte(x: string): boolean },
  isFilled = false,
): RateCategory {
  if (metal === 'platinum') return lineCategory === 'bullion' || lineCategory === 'coin' ? 'platinum-bullion' : 'platinum';
  if (metal === 'palladium') return lineCategory === 'bullion' || lineCategory === 'coin' ? 'palladium-bullion' : 'palladium';
  if (metal === 'gold') {
    if (isFilled) return 'gold-filled';
    if (lineCategory === 'coin') return 'gold-coin';
    if (lineCategory === 'bullion') return 'gold-bullion';
    if (lineCategory === 'jewelry') {
      for (const band of GOLD_JEWELRY_BANDS) if (markedFineness.gte(band.from)) return band.category;
      return 'gold-jewelry-below-14k';
    }
    return 'gold-scrap';
  }
  if (lineCategory === 'coin') return 'silver-coin';
  if (lineCategory === 'bullion') return 'silver-bullion';
  if (lineCategory === 'flatware' || lineCategory === 'hollowware') return 'silver-flatware';
  return 'silver-scrap';
}

export function mergeRates(partial: Partial<Record<RateCategory, RateRule>> | undefined): Rates {
  return partial ? { ...DEFAULT_RATES, ...partial } : DEFAULT_RATES;
}
