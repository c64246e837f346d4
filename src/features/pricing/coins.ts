import type { Metal } from './metals';

export type CoinCategory = 'coin' | 'bullion';

export interface CoinSpec {
  readonly coinType: string;
  readonly label: string;
  readonly issuer: string;
  readonly denomination: string;
  readonly years: string;
  readonly metal: Metal;
  readonly grossWeightGrams: string;
  readonly fineness: string;
  /** The issuer's stated fine content per coin; priced on this figure. */
  readonly fineTroyOunces: string;
  readonly category: CoinCategory;
  readonly source: string;
}

const spec = (s: CoinSpec): CoinSpec => Object.freeze(s);

export const COIN_CATALOGUE: readonly CoinSpec[] = Object.freeze([
  spec({
    coinType: 'us-90-dime',
    label: 'US dime, 90% silver (1964 and earlier)',
    issuer: 'United States Mint',
    denomination: '10 cents',
    years: '1964 and earlier',
    metal: 'silver',
    grossWeightGrams: '2.50',
    fineness: '0.900',
    fineTroyOunces: '0.07234',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-90-quarter',
    label: 'US quarter dollar, 90% silver (1964 and earlier)',
    issuer: 'United States Mint',
    denomination: '25 cents',
    years: '1964 and earlier',
    metal: 'silver',
    grossWeightGrams: '6.25',
    fineness: '0.900',
    fineTroyOunces: '0.18084',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-90-half',
    label: 'US half dollar, 90% silver (1964 and earlier)',
    issuer: 'United States Mint',
    denomination: '50 cents',
    years: '1964 and earlier',
    metal: 'silver',
    grossWeightGrams: '12.50',
    fineness: '0.900',
    fineTroyOunces: '0.36169',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-90-dollar',
    label: 'US silver dollar, 90% silver (1878-1935)',
    issuer: 'United States Mint',
    denomination: '1 dollar',
    years: '1878-1935',
    metal: 'silver',
    grossWeightGrams: '26.73',
    fineness: '0.900',
    fineTroyOunces: '0.7734',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-40-half',
    label: 'US half dollar, 40% silver (1965-1970)',
    issuer: 'United States Mint',
    denomination: '50 cents',
    years: '1965-1970',
    metal: 'silver',
    grossWeightGrams: '11.50',
    fineness: '0.400',
    fineTroyOunces: '0.1479',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-35-nickel',
    label: 'US five cents, 35% silver (1942-1945)',
    issuer: 'United States Mint',
    denomination: '5 cents',
    years: '1942-1945',
    metal: 'silver',
    grossWeightGrams: '5.00',
    fineness: '0.350',
    fineTroyOunces: '0.05626',
    category: 'coin',
    source: 'US Mint coin specifications (from memory)',
  }),
  spec({
    coinType: 'us-1oz-silver-bullion',
    label: 'US 1 oz silver bullion coin (.999)',
    issuer: 'United States Mint',
    denomination: '1 dollar',
    years: '1986 onward',
    metal: 'silver',
    grossWeightGrams: '31.103',
    fineness: '0.999',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'US Mint bullion coin specifications: 1 troy oz of .999 silver (from memory)',
  }),
  spec({
    coinType: 'us-1oz-gold-bullion',
    label: 'US 1 oz gold bullion coin (22 karat)',
    issuer: 'United States Mint',
    denomination: '50 dollars',
    years: '1986 onward',
    metal: 'gold',
    grossWeightGrams: '33.931',
    fineness: '0.9167',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'US Mint bullion coin specifications: 33.931 g, 22 karat, 1 troy oz of gold (from memory)',
  }),
  spec({
    coinType: 'ca-1oz-silver-bullion',
    label: 'Canada 1 oz silver bullion coin (.9999)',
    issuer: 'Royal Canadian Mint',
    denomination: '5 dollars',
    years: '1988 onward',
    metal: 'silver',
    grossWeightGrams: '31.39',
    fineness: '0.9999',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'Royal Canadian Mint bullion specifications: 31.39 g, .9999, 1 troy oz (from memory)',
  }),
  spec({
    coinType: 'ca-1oz-gold-bullion',
    label: 'Canada 1 oz gold bullion coin (.9999)',
    issuer: 'Royal Canadian Mint',
    denomination: '50 dollars',
    years: '1982 onward',
    metal: 'gold',
    grossWeightGrams: '31.11',
    fineness: '0.9999',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'Royal Canadian Mint bullion specifications: 31.11 g, .9999, 1 troy oz (from memory)',
  }),
  spec({
    coinType: 'uk-1oz-gold-bullion-22k',
    label: 'UK 1 oz gold bullion coin (22 karat, to 2012)',
    issuer: 'The Royal Mint (UK)',
    denomination: '100 pounds',
    years: '1987-2012',
    metal: 'gold',
    grossWeightGrams: '34.05',
    fineness: '0.9167',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'The Royal Mint bullion specifications: 34.05 g, .9167, 1 troy oz (from memory)',
  }),
  spec({
    coinType: 'uk-1oz-gold-bullion-9999',
    label: 'UK 1 oz gold bullion coin (.9999, 2013 onward)',
    issuer: 'The Royal Mint (UK)',
    denomination: '100 pounds',
    years: '2013 onward',
    metal: 'gold',
    grossWeightGrams: '31.21',
    fineness: '0.9999',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'The Royal Mint bullion specifications: 31.21 g, .9999, 1 troy oz (from memory)',
  }),
  spec({
    coinType: 'za-1oz-gold-bullion',
    label: 'South Africa 1 oz gold bullion coin (22 karat)',
    issuer: 'South African Mint',
    denomination: 'no face value',
    years: '1967 onward',
    metal: 'gold',
    grossWeightGrams: '33.93',
    fineness: '0.9167',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'South African Mint bullion specifications: 33.93 g, .9167, 1 troy oz (from memory)',
  }),
  spec({
    coinType: 'at-1oz-gold-bullion',
    label: 'Austria 1 oz gold bullion coin (.9999)',
    issuer: 'Austrian Mint',
    denomination: '100 euros',
    years: '2002 onward',
    metal: 'gold',
    grossWeightGrams: '31.103',
    fineness: '0.9999',
    fineTroyOunces: '1',
    category: 'bullion',
    source: 'Austrian Mint bullion specifications: 31.103 g, .9999, 1 troy oz (from memory)',
  }),
]);

const BY_TYPE = new Map(COIN_CATALOGUE.map((c) => [c.coinType, c]));

export function coinSpec(coinType: string): CoinSpec | undefined {
  return BY_TYPE.get(coinType);
}

export const COIN_TYPES = COIN_CATALOGUE.map((c) => c.coinType);

export type FaceValueBasis = 'common-practice' | 'mint-weight';

export interface FaceValueClass {
  readonly coinClass: string;
  readonly label: string;
  readonly metal: Metal;
  readonly fineness: string;
  /** Face value must be a whole multiple of this (the smallest coin in the class). */
  readonly faceStep: string;
  readonly troyOuncesPerDollarFace: Readonly<Partial<Record<FaceValueBasis, string>>>;
  readonly source: string;
}

export const FACE_VALUE_CLASSES: readonly FaceValueClass[] = Object.freeze([
  Object.freeze({
    coinClass: 'us-90',
    label: 'US 90% silver coin by face value (dimes, quarters, halves, 1964 and earlier)',
    metal: 'silver',
    fineness: '0.900',
    faceStep: '0.05',
    // Mint weight: $1 face = 10 dimes x 2.50 g x 0.900 = 22.5 g = 0.7234 ozt.
    // Circulated coin is worn; the trade counts 0.715 ozt per $1 face (common practice).
    troyOuncesPerDollarFace: { 'mint-weight': '0.7234', 'common-practice': '0.715' },
    source: 'Mint weight from US Mint specifications; 0.715 ozt per $1 is common practice',
  }),
  Object.freeze({
    coinClass: 'us-40',
    label: 'US 40% silver half dollars by face value (1965-1970)',
    metal: 'silver',
    fineness: '0.400',
    faceStep: '0.50',
    // $1 face = 2 halves x 11.50 g x 0.400 = 9.2 g = 0.2958 ozt.
    troyOuncesPerDollarFace: { 'mint-weight': '0.2958' },
    source: 'Mint weight from US Mint specifications',
  }),
]);

const CLASS_BY_ID = new Map(FACE_VALUE_CLASSES.map((c) => [c.coinClass, c]));

export function faceValueClass(coinClass: string): FaceValueClass | undefined {
  return CLASS_BY_ID.get(coinClass);
}

export const FACE_VALUE_CLASS_IDS = FACE_VALUE_CLASSES.map((c) => c.coinClass);
