import { parseRatio, ratioValue } from './decimal';
import {
  MAX_KARAT,
  MIN_KARAT,
  MARK_CATALOGUE,
  WORD,
  candidate,
  karatCandidate,
  markCandidateByKey,
  millesimalCandidate,
  MILLESIMAL_METALS,
  type MarkCandidate,
} from './mark-catalogue';
import { METAL_LABELS, type Metal } from './metals';
import {
  MAX_MARK_LENGTH,
  NO_PRECIOUS,
  FILLED,
  PLATED_SILVER,
  PLATED_GOLD,
  PLATED_ANY,
  FRACTION,
  KARAT_AFTER,
  KARAT_BEFORE,
  PLUMB,
  PT_WORD,
  PD_WORD,
  STERLING_WORD,
  COIN_WORD,
  FINE_SILVER,
  FINE_GOLD,
  BRITANNIA_WORD,
  VERMEIL_WORD,
  NUMBER_TOKEN,
  SILVER_HINTS,
  GOLD_HINTS,
  VOCABULARY,
  expandTokens,
  normaliseMark,
} from './mark-text';

export { normaliseMark } from './mark-text';
export { MARK_CATALOGUE, MAX_KARAT, MIN_KARAT, RENAMED_MARK_KEYS, markCandidateByKey, type MarkCandidate } from './mark-catalogue';

export type MarkKind = 'solid' | 'filled' | 'plated' | 'no-precious' | 'needs-test' | 'unknown';

/**
 * Why a reading needs a test. Only `ambiguous-metal` (a bare number that is a fineness of several
 * metals) can be settled by the line naming one of them; the others need a tested fineness.
 */
export type NeedsTestReason = 'ambiguous-metal' | 'metal-conflict' | 'marks-disagree' | 'fineness-unknown' | 'unqualified-gold';

export interface FilledLayer {
  /** Share of the article's weight that is karat gold, "1/20". */
  readonly layerFraction: string;
  readonly layerKarat: number;
  readonly layerFinenessExact: string;
}

export interface MarkReading {
  readonly input: string;
  readonly normalized: string;
  readonly kind: MarkKind;
  readonly key?: string;
  readonly metal?: Metal;
  /** Precious content of the whole article as a fraction of its weight (filled: layer share x layer fineness). */
  readonly fineness?: string;
  readonly finenessExact?: string;
  readonly label: string;
  readonly candidates: readonly MarkCandidate[];
  /** Metals the mark names by a word, a symbol or a karat (AG, SILVER, STERLING, PT, 14K...). */
  readonly namedMetals: readonly Metal[];
  readonly reason?: NeedsTestReason;
  readonly notes: readonly string[];
  readonly filled?: FilledLayer;
}

type Draft = Omit<MarkReading, 'input' | 'normalized' | 'notes' | 'candidates' | 'namedMetals'> & {
  candidates?: readonly MarkCandidate[];
};

const BIT: Readonly<Record<Metal, number>> = { gold: 1, silver: 2, platinum: 4, palladium: 8 };
const METAL_ORDER: readonly Metal[] = ['gold', 'silver', 'platinum', 'palladium'];
/** The frozen list of metals of each mask, in METAL_ORDER: one array per mask, shared by every reading. */
const METALS_OF_MASK: readonly (readonly Metal[])[] = Array.from({ length: 16 }, (_, mask) => Object.freeze(METAL_ORDER.filter((m) => (mask & BIT[m]) !== 0)));

function metalsOf(mask: number): readonly Metal[] {
  return METALS_OF_MASK[mask]!;
}

function finish(input: string, normalized: string, notes: string[], draft: Draft, namedMask = 0): MarkReading {
  return Object.freeze({
    input,
    normalized,
    ...draft,
    candidates: Object.freeze([...(draft.candidates ?? [])]),
    namedMetals: metalsOf(namedMask),
    notes: Object.freeze(notes),
  });
}

function solidFrom(c: MarkCandidate): Draft {
  return { kind: 'solid', key: c.key, metal: c.metal, fineness: c.fineness, finenessExact: c.finenessExact, label: c.label, candidates: [c] };
}

function readKarats(text: string, notes: string[]): number[] {
  const found: number[] = [];
  for (const re of [KARAT_AFTER, KARAT_BEFORE]) {
    re.lastIndex = 0;
    for (let m = re.exec(text); m !== null; m = re.exec(text)) {
      const k = Number(m[1]);
      if (k >= MIN_KARAT && k <= MAX_KARAT) found.push(k);
      else notes.push(`${k} karat is outside ${MIN_KARAT}K-${MAX_KARAT}K and was not read as a gold mark.`);
    }
  }
  return found;
}

function needsTest(candidates: readonly MarkCandidate[], label: string, reason: NeedsTestReason): Draft {
  return { kind: 'needs-test', label, candidates, reason };
}

function describeCandidates(cs: readonly MarkCandidate[]): string {
  return cs.map((c) => c.label).join(' or ');
}

/** "gold", "gold or silver", "gold, silver or platinum". */
function metalList(metals: Iterable<Metal>): string {
  const names = [...metals].map((m) => METAL_LABELS[m].toLowerCase());
  return names.length <= 1 ? (names[0] ?? '') : `${names.slice(0, -1).join(', ')} or ${names[names.length - 1]}`;
}

function capitalised(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Reads a purity mark as stamped or typed. Never throws; never guesses between metals. */
export function parseMarkUncached(input: unknown): MarkReading {
  const raw = typeof input === 'string' ? input : input === undefined || input === null ? '' : String(input);
  const normalized = normaliseMark(raw);
  const notes: string[] = [];
  if (raw.length > MAX_MARK_LENGTH) notes.push(`Only the first ${MAX_MARK_LENGTH} characters were read.`);
  if (normalized === '') return finish(raw, normalized, notes, { kind: 'unknown', label: 'No readable mark' });

  const tokens = expandTokens(normalized);
  const text = tokens.join(' ');

  if (NO_PRECIOUS.test(text)) {
    notes.push('Nickel silver (German silver, alpaca) is a copper-nickel-zinc alloy with no silver; steel, titanium, tungsten and brass carry no precious metal.');
    return finish(raw, normalized, notes, { kind: 'no-precious', label: 'No precious metal' });
  }

  const karats = readKarats(text, notes);

  if (FILLED.test(text)) {
    const isRolledPlate = /\b(?:RGP|ROLLED GOLD)\b/.test(text);
    const type = isRolledPlate ? 'RGP' : 'GF';
    const fraction = FRACTION.exec(text);
    const karat = karats[0];
    if (isRolledPlate) notes.push('Rolled gold plate: a bonded karat-gold layer, usually thinner than gold-filled; the fraction states its share of the weight.');
    if (!fraction || karat === undefined) {
      notes.push(
        !fraction
          ? 'Gold-filled mark without its fraction: the share of gold in the weight is unknown. Test, or buy on an agreed fraction.'
          : 'Gold-filled mark without the karat of its layer: test the layer.',
      );
      return finish(raw, normalized, notes, needsTest([], `${type === 'GF' ? 'Gold-filled' : 'Rolled gold plate'}, content unknown`, 'fineness-unknown'), BIT.gold);
    }
    const num = Number(fraction[1]);
    const den = Number(fraction[2]);
    if (num < 1 || den < 1 || num > den) {
      notes.push(`${num}/${den} is not a share of the weight.`);
      return finish(raw, normalized, notes, needsTest([], 'Gold-filled, fraction unreadable', 'fineness-unknown'), BIT.gold);
    }
    const finenessExact = `${num * karat}/${den * 24}`;
    const key = `${num}/${den} ${karat}K ${type}`;
    const c = candidate(key, 'gold', finenessExact, `${type === 'GF' ? 'Gold-filled' : 'Rolled gold plate'}: ${num}/${den} of the weight is ${karat} karat gold`);
    return finish(
      raw,
      normalized,
      notes,
      {
        kind: 'filled',
        key,
        metal: 'gold',
        fineness: c.fineness,
        finenessExact,
        label: c.label,
        candidates: [c],
        filled: { layerFraction: `${num}/${den}`, layerKarat: karat, layerFinenessExact: `${karat}/24` },
      },
      BIT.gold,
    );
  }

  const vermeil = VERMEIL_WORD.test(text);
  if (!vermeil) {
    const silverCoat = PLATED_SILVER.test(text);
    const goldCoat = PLATED_GOLD.test(text);
    if (silverCoat || goldCoat || PLATED_ANY.test(text)) {
      notes.push('A plated coat is too thin to recover: no buyable precious content. Buy by other value or decline.');
      if (karats.length > 0) notes.push('A karat figure beside a plate mark names the colour of the coat, not the article.');
      if (/\bSTERLING PLATED?\b/.test(text)) notes.push('"Sterling plated" names a coat, not sterling.');
      const label = goldCoat ? 'Gold-plated (no buyable precious content)' : silverCoat ? 'Silver-plated (no buyable precious content)' : 'Plated (no buyable precious content)';
      return finish(raw, normalized, notes, { kind: 'plated', label });
    }
  }

  // Metals named by a bare word or symbol (AG, SILVER, AU, GOLD, PT, PD...): each must be met by a mark of that metal.
  // Sets of metals are bit masks here: this runs for every mark typed at the counter.
  let symbolMask = 0;
  for (const t of tokens) {
    if (GOLD_HINTS.has(t)) symbolMask |= BIT.gold;
    else if (SILVER_HINTS.has(t)) symbolMask |= BIT.silver;
  }
  if (PT_WORD.test(text)) symbolMask |= BIT.platinum;
  if (PD_WORD.test(text)) symbolMask |= BIT.palladium;
  // "Gold vermeil" names the coat of gold-coated sterling, not the article's metal.
  if (vermeil) symbolMask &= ~BIT.gold;

  // Each group is one mark read on the article; a group with several candidates is ambiguous.
  const groups: MarkCandidate[][] = [];
  const plumb = PLUMB.test(text);
  if (plumb) notes.push('KP (karat plumb): the article meets its karat without the legal tolerance below it.');
  for (const k of karats) groups.push([karatCandidate(k, plumb)]);
  const wordGroups: MarkCandidate[][] = [];
  if (STERLING_WORD.test(text)) wordGroups.push([WORD.sterling]);
  if (COIN_WORD.test(text)) wordGroups.push([WORD.coinSilver]);
  if (FINE_SILVER.test(text)) wordGroups.push([WORD.fineSilver]);
  if (FINE_GOLD.test(text)) wordGroups.push([WORD.fineGold]);
  if (BRITANNIA_WORD.test(text)) wordGroups.push([WORD.britannia]);
  if (vermeil) {
    notes.push('Vermeil is sterling coated with gold; the coat is not bought.');
    wordGroups.push([WORD.vermeil]);
  }
  // Every metal the mark names: by word or symbol, by a karat (gold) or by a silver word (sterling, coin...).
  let namedMask = symbolMask;
  if (groups.length > 0) namedMask |= BIT.gold;
  for (const g of wordGroups) namedMask |= BIT[g[0]!.metal];

  const consumed = new Set<number>();
  const conflicts: string[] = [];
  const conflictCandidates: MarkCandidate[] = [];
  const conflictLabels: string[] = [];
  for (let i = 0; i < tokens.length; i++) {
    const token = tokens[i]!;
    if (!NUMBER_TOKEN.test(token)) continue;
    consumed.add(i);
    const metals = MILLESIMAL_METALS[token];
    if (!metals) {
      notes.push(`The number ${token} is not a fineness Cupel knows.`);
      continue;
    }
    const group: MarkCandidate[] = [];
    for (const m of metals) if (namedMask === 0 || (namedMask & BIT[m]) !== 0) group.push(millesimalCandidate(token, m));
    if (group.length > 0) {
      groups.push(group);
      continue;
    }
    const named = metalsOf(namedMask);
    conflicts.push(`The mark names ${metalList(named)}, but ${token} is a fineness of ${metalList(metals)}, not of ${metalList(named)}.`);
    conflictLabels.push(`${capitalised(metalList(named))} named, but ${token} is a fineness of ${metalList(metals)}: needs a test`);
    for (const m of metals) conflictCandidates.push(millesimalCandidate(token, m));
  }

  groups.push(...wordGroups);
  if (conflicts.length === 0) {
    let groupsMask = 0;
    for (const g of groups) for (const c of g) groupsMask |= BIT[c.metal];
    if ((symbolMask & BIT.platinum) !== 0 && (groupsMask & BIT.platinum) === 0) {
      notes.push('Unqualified "platinum" is taken at 950 (FTC Jewelry Guides, 16 CFR 23.7).');
      groups.push([WORD.platinum]);
      groupsMask |= BIT.platinum;
    }
    if ((symbolMask & BIT.palladium) !== 0 && (groupsMask & BIT.palladium) === 0) {
      notes.push('Unqualified "palladium" is taken at 950 (FTC Jewelry Guides, 16 CFR 23.7).');
      groups.push([WORD.palladium]);
      groupsMask |= BIT.palladium;
    }
    const unmet = symbolMask & ~groupsMask;
    if (groups.length > 0 && unmet !== 0) {
      const other = groups.flat();
      const otherMetals = metalList(metalsOf(groupsMask));
      for (const m of metalsOf(unmet)) {
        conflicts.push(`The mark names ${metalList([m])}, but ${describeCandidates(other)} is a mark of ${otherMetals}, not of ${metalList([m])}.`);
        conflictLabels.push(`${METAL_LABELS[m]} named, but the mark reads ${otherMetals}: needs a test`);
      }
      conflictCandidates.push(...other);
    }
  }

  const ignored = tokens.filter((t, i) => !consumed.has(i) && !VOCABULARY.has(t) && !/^\d/.test(t));
  if (ignored.length > 0) notes.push(`Not read: ${ignored.slice(0, 8).join(' ')}`);

  if (conflicts.length > 0) {
    notes.push(...conflicts.map((c) => `${c} Test it before pricing.`));
    const cs = dedupe([...conflictCandidates, ...groups.flat()]);
    return finish(raw, normalized, notes, needsTest(cs, conflictLabels[0]!, 'metal-conflict'), namedMask);
  }

  if (groups.length === 0) {
    if (metalsOf(symbolMask).length > 1) {
      notes.push(`The mark names ${metalList(metalsOf(symbolMask))} with no fineness. Test it before pricing.`);
      return finish(raw, normalized, notes, needsTest([], 'Metals named without a fineness: needs a test', 'metal-conflict'), namedMask);
    }
    if ((symbolMask & BIT.gold) !== 0) {
      notes.push(
        'Unqualified "gold" may describe only fine (24 karat) gold throughout (FTC Jewelry Guides, 16 CFR 23.4, from memory), so the mark claims 24K. ' +
          'Items stamped "gold" alone are often of a lower karat or plated (common practice): test it before paying as 24K.',
      );
      return finish(raw, normalized, notes, needsTest([karatCandidate(24, false)], 'Gold with no karat: claims 24K, needs a test', 'unqualified-gold'), namedMask);
    }
    if ((symbolMask & BIT.silver) !== 0) {
      notes.push('"Silver" without a fineness is not a purity mark (16 CFR 23.5 asks for a fineness beside the word). Test it.');
      const cs = MARK_CATALOGUE.filter((c) => c.metal === 'silver' && /^\D*\d+$/.test(c.key) && !c.key.endsWith('KP'));
      return finish(raw, normalized, notes, needsTest(cs, 'Silver, fineness unknown: needs a test', 'fineness-unknown'), namedMask);
    }
    return finish(raw, normalized, notes, { kind: 'unknown', label: 'Mark not recognised: needs a test' });
  }

  const ambiguous = groups.find((g) => g.length > 1);
  if (ambiguous) {
    const unambiguous = groups.filter((g) => g.length === 1).map((g) => g[0]!);
    // Only numbers narrow numbers ("835 833" is silver); with a metal named, a group still ambiguous names two metals.
    const narrowed = unambiguous.length > 0 && namedMask === 0 ? ambiguous.filter((c) => unambiguous.every((u) => u.metal === c.metal)) : [];
    if (narrowed.length === 1 && unambiguous.every((u) => u.metal === narrowed[0]!.metal)) {
      groups.splice(groups.indexOf(ambiguous), 1, [narrowed[0]!]);
    } else {
      const union = dedupe(groups.flat());
      const onlyNumbers = namedMask === 0;
      notes.push(
        onlyNumbers
          ? `Could be ${describeCandidates(union)}: the number is a fineness of ${metalList(new Set(union.map((c) => c.metal)))}. Test it, or name the metal.`
          : `Could be ${describeCandidates(union)}; test before pricing.`,
      );
      return finish(raw, normalized, notes, needsTest(union, 'Ambiguous mark: needs a test', onlyNumbers ? 'ambiguous-metal' : 'metal-conflict'), namedMask);
    }
  }

  const singles = dedupe(groups.map((g) => g[0]!));
  const metals = new Set(singles.map((c) => c.metal));
  if (metals.size > 1) {
    notes.push(`Marks of more than one metal: ${describeCandidates(singles)}. Test before pricing.`);
    return finish(raw, normalized, notes, needsTest(singles, 'Marks of different metals: needs a test', 'metal-conflict'), namedMask);
  }
  if (singles.length === 1) return finish(raw, normalized, notes, solidFrom(singles[0]!), namedMask);

  const values = singles.map((c) => ratioValue(parseRatio(c.finenessExact)));
  let lowest = 0;
  values.forEach((v, i) => {
    if (v.lt(values[lowest]!)) lowest = i;
  });
  const highest = values.reduce((a, b) => (a.gt(b) ? a : b));
  if (highest.minus(values[lowest]!).gt('0.005')) {
    notes.push(`Marks disagree: ${describeCandidates(singles)}. Test before pricing.`);
    return finish(raw, normalized, notes, needsTest(singles, 'Marks disagree: needs a test', 'marks-disagree'), namedMask);
  }
  notes.push(`Also marked: ${singles.filter((_, i) => i !== lowest).map((c) => c.key).join(', ')}; the lower fineness is used.`);
  return finish(raw, normalized, notes, solidFrom(singles[lowest]!), namedMask);
}

function dedupe(cs: readonly MarkCandidate[]): MarkCandidate[] {
  const seen = new Set<string>();
  return cs.filter((c) => (seen.has(c.key) ? false : (seen.add(c.key), true)));
}

const readingCache = new Map<string, MarkReading>();
const READING_CACHE_LIMIT = 5000;

/** Cached parseMarkUncached: the counter re-prices on every keystroke with the same marks. */
export function parseMark(input: unknown): MarkReading {
  if (typeof input !== 'string') return parseMarkUncached(input);
  let found = readingCache.get(input);
  if (found === undefined) {
    found = parseMarkUncached(input);
    if (readingCache.size >= READING_CACHE_LIMIT) readingCache.clear();
    readingCache.set(input, found);
  }
  return found;
}

/**
 * The candidate of a reading for the metal the line states. A clear mark gives its own candidate only
 * when the line's metal (if any) is the mark's; a bare number of several metals gives the one of the
 * line's metal; a mark whose words and numbers disagree gives none, whatever the line says.
 */
export function resolveMarkForMetal(reading: MarkReading, metal: Metal | undefined): MarkCandidate | undefined {
  if (reading.kind === 'solid' || reading.kind === 'filled') {
    const c = reading.candidates[0];
    return c && (metal === undefined || c.metal === metal) ? c : undefined;
  }
  if (reading.kind === 'needs-test' && reading.reason === 'ambiguous-metal' && metal !== undefined) {
    const ofMetal = reading.candidates.filter((c) => c.metal === metal);
    return ofMetal.length === 1 ? ofMetal[0] : undefined;
  }
  return undefined;
}

/** A key is known when reading it gives back a solid or filled reading with that very key. */
export function isMarkKey(key: string): boolean {
  if (markCandidateByKey(key)) return true;
  const r = parseMark(key);
  return (r.kind === 'filled' || r.kind === 'solid') && r.key === key;
}

export function markedFinenessOfKey(key: string): string | undefined {
  const c = markCandidateByKey(key);
  if (c) return c.finenessExact;
  const r = parseMark(key);
  return r.key === key ? r.finenessExact : undefined;
}
