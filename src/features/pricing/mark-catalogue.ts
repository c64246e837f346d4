import { parseRatio, ratioValue, toTrimmed } from './decimal';
import { METAL_LABELS, METAL_SYMBOLS, type Metal } from './metals';

export interface MarkCandidate {
  /** Catalogue key; store settings (assumed fineness) are keyed by it. */
  readonly key: string;
  readonly metal: Metal;
  /** Decimal, 6 places at most ("0.583333"). */
  readonly fineness: string;
  /** Exact: "14/24" for karat, "0.925" for millesimal marks. */
  readonly finenessExact: string;
  readonly label: string;
}

export function candidate(key: string, metal: Metal, finenessExact: string, label: string): MarkCandidate {
  return Object.freeze({
    key,
    metal,
    fineness: toTrimmed(ratioValue(parseRatio(finenessExact)), 6),
    finenessExact,
    label,
  });
}

export const MIN_KARAT = 8;
export const MAX_KARAT = 24;

/**
 * Millesimal marks and every metal each number is a standard or customary fineness of.
 * - Hallmarking Convention / ISO 9202 standard finenesses: gold 375, 585, 750, 916, 990, 999;
 *   silver 800, 925, 958, 999; platinum 850, 900, 950, 999; palladium 500, 950, 999.
 * - Customary marks (common practice, from memory): gold 333, 416/417, 500 (12K), 583, 800 (19.2K) and
 *   833 (20K) in some countries, 875 (21K), 900 (coin gold), 917, 958 (23K), 995, 999.5, 999.9; silver 830,
 *   833, 835, 875, 900 (coin silver), 950, 970, 990, 999.9; platinum and palladium 990, 995, 999.5.
 * A number listed for more than one metal is never guessed: it is a needs-test reading unless a
 * metal word or symbol that fits goes with it, or the line names one of its metals.
 */
export const MILLESIMAL_METALS: Readonly<Record<string, readonly Metal[]>> = {
  '333': ['gold'],
  '375': ['gold'],
  '416': ['gold'],
  '417': ['gold'],
  '500': ['gold', 'palladium'],
  '583': ['gold'],
  '585': ['gold'],
  '750': ['gold'],
  '800': ['silver', 'gold'],
  '830': ['silver'],
  '833': ['silver', 'gold'],
  '835': ['silver'],
  '850': ['platinum'],
  '875': ['gold', 'silver'],
  '900': ['silver', 'platinum', 'gold'],
  '916': ['gold'],
  '917': ['gold'],
  '925': ['silver'],
  '950': ['platinum', 'palladium', 'silver'],
  '958': ['silver', 'gold'],
  '970': ['silver'],
  '990': ['gold', 'silver', 'platinum', 'palladium'],
  '995': ['gold', 'platinum', 'palladium'],
  '999': ['gold', 'silver', 'platinum', 'palladium'],
  '9995': ['gold', 'platinum', 'palladium'],
  '9999': ['gold', 'silver', 'platinum', 'palladium'],
};

/**
 * Keys that named one metal before their number was found to be a fineness of more than one.
 * Stored settings were moved to the new keys by a migration; the schema names the new key.
 */
export const RENAMED_MARK_KEYS: Readonly<Record<string, string>> = Object.freeze({ '800': 'AG800', '833': 'AG833', '990': 'AU990' });

const CATALOGUE = new Map<string, MarkCandidate>();

function add(c: MarkCandidate): MarkCandidate {
  CATALOGUE.set(c.key, c);
  return c;
}

export function karatKey(karat: number, plumb: boolean): string {
  return `${karat}K${plumb ? 'P' : ''}`;
}

export function millesimalKey(num: string, metal: Metal): string {
  return (MILLESIMAL_METALS[num]?.length ?? 0) > 1 ? `${METAL_SYMBOLS[metal]}${num}` : num;
}

for (let k = MIN_KARAT; k <= MAX_KARAT; k++) {
  add(candidate(karatKey(k, false), 'gold', `${k}/24`, `${k} karat gold (${k}/24)`));
  add(candidate(karatKey(k, true), 'gold', `${k}/24`, `${k} karat plumb gold (${k}/24, no tolerance below the mark)`));
}

for (const [num, metals] of Object.entries(MILLESIMAL_METALS)) {
  for (const metal of metals) {
    add(candidate(millesimalKey(num, metal), metal, `0.${num}`, `${num} ${METAL_LABELS[metal].toLowerCase()}`));
  }
}

export const WORD = {
  sterling: add(candidate('STERLING', 'silver', '0.925', 'Sterling silver (at least 925)')),
  coinSilver: add(candidate('COIN SILVER', 'silver', '0.900', 'Coin silver (at least 900)')),
  fineSilver: add(candidate('FINE SILVER', 'silver', '0.999', 'Fine silver (999)')),
  britannia: add(candidate('BRITANNIA', 'silver', '0.958', 'Britannia silver (958)')),
  vermeil: add(candidate('VERMEIL', 'silver', '0.925', 'Vermeil: gold-coated sterling, bought as sterling (925)')),
  fineGold: add(candidate('FINE GOLD', 'gold', '0.999', 'Fine gold (999)')),
  platinum: add(candidate('PLATINUM', 'platinum', '0.950', 'Platinum, unqualified (at least 950)')),
  palladium: add(candidate('PALLADIUM', 'palladium', '0.950', 'Palladium, unqualified (at least 950)')),
};

/** Every key a reading can carry (filled keys such as "1/20 14K GF" are built from their parts). */
export const MARK_CATALOGUE: readonly MarkCandidate[] = Object.freeze([...CATALOGUE.values()]);

export function markCandidateByKey(key: string): MarkCandidate | undefined {
  return CATALOGUE.get(key);
}

export function millesimalCandidate(num: string, metal: Metal): MarkCandidate {
  return CATALOGUE.get(millesimalKey(num, metal))!;
}

export function karatCandidate(karat: number, plumb: boolean): MarkCandidate {
  return CATALOGUE.get(karatKey(karat, plumb))!;
}
