import type { Metal } from './metals';
import type { CoinSpec } from './coin-spec';
import { US_COINS } from './coins-us';
import { WORLD_COINS } from './coins-world';

export type { CoinCategory, CoinSpec } from './coin-spec';

/** Every coin and bullion coin priced by count. Figures and sources: coins-us.ts and coins-world.ts. */
export const COIN_CATALOGUE: readonly CoinSpec[] = Object.freeze([...US_COINS, ...WORLD_COINS]);

const BY_TYPE = new Map(COIN_CATALOGUE.map((c) => [c.coinType, c]));

export function coinSpec(coinType: string): CoinSpec | undefined {
  return BY_TYPE.get(coinType);
}

export const COIN_TYPES = COIN_CATALOGUE.map((c) => c.coinType);

// ---------------------------------------------------------------------------
// Coin counted by face value
// ---------------------------------------------------------------------------

/**
 * `mint-weight`: the fine content of uncirculated coin, from the mint's weights.
 * `common-practice`: the figure the trade counts for worn, circulated coin, where it has one.
 */
export const FACE_VALUE_BASES = ['common-practice', 'mint-weight'] as const;
export type FaceValueBasis = (typeof FACE_VALUE_BASES)[number];

/** How the basis reads on the line and on the receipt. */
export const FACE_VALUE_BASIS_LABELS: Readonly<Record<FaceValueBasis, string>> = Object.freeze({
  'mint-weight': 'mint weight',
  'common-practice': 'circulated, common practice',
});

export interface FaceValueClass {
  readonly coinClass: string;
  readonly label: string;
  readonly metal: Metal;
  readonly fineness: string;
  /** Face value must be a whole multiple of this. */
  readonly faceStep: string;
  /** Gross weight of 1.00 face at mint weight. */
  readonly grossGramsPerDollarFace: string;
  /** Fine troy ounces per 1.00 face; every class has `mint-weight`. */
  readonly troyOuncesPerDollarFace: Readonly<{ 'mint-weight': string } & Partial<Record<FaceValueBasis, string>>>;
  /** Where each figure comes from. */
  readonly basisSources: Readonly<Partial<Record<FaceValueBasis, string>>>;
  /** The basis the counter uses unless the clerk chooses another this class has. */
  readonly counterBasis: FaceValueBasis;
  readonly note?: string;
}

const faceClass = (c: FaceValueClass): FaceValueClass => Object.freeze(c);

export const FACE_VALUE_CLASSES: readonly FaceValueClass[] = Object.freeze([
  faceClass({
    coinClass: 'us-90',
    label: 'US 90% silver dimes, quarters and halves (1873-1964)',
    metal: 'silver',
    fineness: '0.900',
    faceStep: '0.05',
    // 1.00 face = 10 dimes x 2.50 g = 25.00 g at 0.900 = 22.5 g = 0.7234 ozt.
    grossGramsPerDollarFace: '25.00',
    troyOuncesPerDollarFace: { 'mint-weight': '0.7234', 'common-practice': '0.715' },
    basisSources: {
      'mint-weight': 'US Mint coin specifications: 2.50 g per dime, 90% silver (from memory)',
      'common-practice': 'common practice: the trade counts worn, circulated 90% coin at 0.715 ozt per 1.00 face',
    },
    counterBasis: 'common-practice',
    note: 'Coins before 1873 weigh less: weigh them and price by weight.',
  }),
  faceClass({
    coinClass: 'us-40',
    label: 'US 40% silver half dollars (1965-1970)',
    metal: 'silver',
    fineness: '0.400',
    faceStep: '0.50',
    // 1.00 face = 2 halves x 11.50 g = 23.00 g at 0.400 = 9.2 g = 0.2958 ozt.
    grossGramsPerDollarFace: '23.00',
    troyOuncesPerDollarFace: { 'mint-weight': '0.2958' },
    basisSources: { 'mint-weight': 'US Mint coin specifications: 11.50 g per half dollar, 40% silver overall (from memory)' },
    counterBasis: 'mint-weight',
  }),
  faceClass({
    coinClass: 'us-35',
    label: 'US 35% silver five-cent pieces (mid-1942 to 1945)',
    metal: 'silver',
    fineness: '0.350',
    faceStep: '0.05',
    // 1.00 face = 20 pieces x 5.00 g = 100.00 g at 0.350 = 35 g = 1.1253 ozt.
    grossGramsPerDollarFace: '100.00',
    troyOuncesPerDollarFace: { 'mint-weight': '1.1253' },
    basisSources: { 'mint-weight': 'US Mint coin specifications: 5.00 g per five-cent piece, 35% silver (from memory)' },
    counterBasis: 'mint-weight',
    note: 'Only the wartime pieces with a large mint mark above the dome are silver; five-cent pieces of early 1942 are copper-nickel.',
  }),
  faceClass({
    coinClass: 'ca-80',
    label: 'Canada 80% silver 10, 25, 50 cents and dollars (1920-1966)',
    metal: 'silver',
    fineness: '0.800',
    faceStep: '0.05',
    // 1.00 face = one dollar of 23.327 g (or 2 halves, 4 quarters, 10 dimes) at 0.800 = 18.66 g = 0.6000 ozt.
    grossGramsPerDollarFace: '23.327',
    troyOuncesPerDollarFace: { 'mint-weight': '0.6000' },
    basisSources: { 'mint-weight': 'Royal Canadian Mint coin specifications: 23.327 g per dollar, 80% silver (from memory)' },
    counterBasis: 'mint-weight',
    note: 'Coins of 1967 are 80% or 50% silver, and dimes and quarters of 1968 50% silver or nickel: test them.',
  }),
]);

const CLASS_BY_ID = new Map(FACE_VALUE_CLASSES.map((c) => [c.coinClass, c]));

export function faceValueClass(coinClass: string): FaceValueClass | undefined {
  return CLASS_BY_ID.get(coinClass);
}

export const FACE_VALUE_CLASS_IDS = FACE_VALUE_CLASSES.map((c) => c.coinClass);

/** The bases a class has a figure for, the counter's own first. */
export function faceValueBases(cls: FaceValueClass): FaceValueBasis[] {
  return [cls.counterBasis, ...FACE_VALUE_BASES.filter((b) => b !== cls.counterBasis && cls.troyOuncesPerDollarFace[b] !== undefined)];
}

/** The basis a line is priced on: the one asked for, or the class's counter basis when none is. */
export function faceValueBasisFor(cls: FaceValueClass, requested: FaceValueBasis | undefined): FaceValueBasis {
  return requested ?? cls.counterBasis;
}

/** What the counter sends: the clerk's choice when the class has that figure, otherwise the class's counter basis. */
export function counterFaceValueBasis(coinClass: string, chosen: string | undefined): FaceValueBasis | undefined {
  const cls = faceValueClass(coinClass);
  if (!cls) return undefined;
  return faceValueBases(cls).find((b) => b === chosen) ?? cls.counterBasis;
}

/** "0.2958 ozt per 1.00 face, mint weight", or null for a class or basis without a figure. */
export function faceValueBasisText(coinClass: string, basis: string | undefined): string | null {
  const cls = faceValueClass(coinClass);
  if (!cls) return null;
  const b = faceValueBasisFor(cls, (FACE_VALUE_BASES as readonly string[]).includes(basis ?? '') ? (basis as FaceValueBasis) : undefined);
  const perDollar = cls.troyOuncesPerDollarFace[b];
  return perDollar === undefined ? null : `${perDollar} ozt per 1.00 face, ${FACE_VALUE_BASIS_LABELS[b]}`;
}
