import type { Metal } from './metals';

export type CoinCategory = 'coin' | 'bullion';

export interface CoinSpec {
  readonly coinType: string;
  /** Descriptive: country, denomination or weight, metal, years. */
  readonly label: string;
  readonly issuer: string;
  readonly denomination: string;
  readonly years: string;
  readonly metal: Metal;
  readonly grossWeightGrams: string;
  readonly fineness: string;
  /** Fine content per coin, in troy ounces; lines are priced on this figure. */
  readonly fineTroyOunces: string;
  /**
   * `issuer`: the fine content the issuer states, which agrees with gross x fineness within the rounding of
   * the published figures. `computed`: gross x fineness rounded half-up to the places written, used where
   * the issuer's nominal weight and its published gross weight and fineness disagree.
   */
  readonly fineFrom: 'issuer' | 'computed';
  readonly category: CoinCategory;
  /** The specification the figures come from, with "from memory" where nobody checked a published text. */
  readonly source: string;
  /** What the clerk should look at before choosing this coin. */
  readonly note?: string;
}
