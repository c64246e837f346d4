import type { Metal } from './metals';

export const RATE_CATEGORIES = [
  'gold-jewelry-below-14k',
  'gold-jewelry-14k-to-17k',
  'gold-jewelry-18k-and-above',
  'gold-scrap',
  'gold-filled',
  'gold-coin',
  'gold-bullion',
  'silver-flatware',
  'silver-scrap',
  'silver-coin',
  'silver-bullion',
  'platinum',
  'palladium',
] as const;
export type RateCategory = (typeof RATE_CATEGORIES)[number];

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
 * currency; a shop that buys bullion at an amount under spot sets that in its own rates.
 */
export const DEFAULT_RATES: Rates = Object.freeze({
  'gold-jewelry-below-14k': percent('75'),
  'gold-jewelry-14k-to-17k': percent('80'),
  'gold-jewelry-18k-and-above': percent('82'),
  'gold-scrap': percent('75'),
  'gold-filled': percent('50'),
  'gold-coin': percent('92'),
  'gold-bullion': percent('97'),
  'silver-flatware': percent('75'),
  'silver-scrap': percent('70'),
  'silver-coin': percent('85'),
  'silver-bullion': percent('95'),
  platinum: percent('70'),
  palladium: percent('65'),
});

/**
 * Karat bands for gold jewelry, on the marked (or tested) fineness. The edges sit a little below
 * 14/24 and 18/24 so that 583 and 585 marks band with 14K and 750 with 18K.
 */
export const GOLD_BAND_14K_FROM = '0.580';
export const GOLD_BAND_18K_FROM = '0.745';

export function resolveRateCategory(
  metal: Metal,
  lineCategory: LineCategory,
  markedFineness: { gte(x: string): boolean },
  isFilled = false,
): RateCategory {
  if (metal === 'platinum') return 'platinum';
  if (metal === 'palladium') return 'palladium';
  if (metal === 'gold') {
    if (isFilled) return 'gold-filled';
    if (lineCategory === 'coin') return 'gold-coin';
    if (lineCategory === 'bullion') return 'gold-bullion';
    if (lineCategory === 'jewelry') {
      if (markedFineness.gte(GOLD_BAND_18K_FROM)) return 'gold-jewelry-18k-and-above';
      if (markedFineness.gte(GOLD_BAND_14K_FROM)) return 'gold-jewelry-14k-to-17k';
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
