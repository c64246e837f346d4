import { parseRatio, ratioValue, toTrimmed } from './decimal';
import { METAL_LABELS, METAL_SYMBOLS, type Metal } from './metals';

export type MarkKind = 'solid' | 'filled' | 'plated' | 'no-precious' | 'needs-test' | 'unknown';

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
  readonly notes: readonly string[];
  readonly filled?: FilledLayer;
}

const MAX_MARK_LENGTH = 200;

function candidate(key: string, metal: Metal, finenessExact: string, label: string): MarkCandidate {
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
 * Millesimal marks and the metals each number is a standard or customary fineness of
 * (Hallmarking Convention / ISO 9202 standard finenesses, plus customary marks: 333, 416/417,
 * 583, 830/833/835, 875, 900, 950 silver, 958, 970). A number listed for more than one metal
 * is never guessed: it is a needs-test reading unless a metal word or symbol goes with it.
 */
const MILLESIMAL_METALS: Readonly<Record<string, readonly Metal[]>> = {
  '333': ['gold'],
  '375': ['gold'],
  '416': ['gold'],
  '417': ['gold'],
  '500': ['gold', 'palladium'],
  '583': ['gold'],
  '585': ['gold'],
  '750': ['gold'],
  '800': ['silver'],
  '830': ['silver'],
  '833': ['silver'],
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
  '990': ['gold'],
  '995': ['gold', 'platinum', 'palladium'],
  '999': ['gold', 'silver', 'platinum', 'palladium'],
  '9995': ['gold', 'platinum', 'palladium'],
  '9999': ['gold', 'silver', 'platinum', 'palladium'],
};

const CATALOGUE = new Map<string, MarkCandidate>();

function add(c: MarkCandidate): MarkCandidate {
  CATALOGUE.set(c.key, c);
  return c;
}

function karatKey(karat: number, plumb: boolean): string {
  return `${karat}K${plumb ? 'P' : ''}`;
}

for (let k = MIN_KARAT; k <= MAX_KARAT; k++) {
  add(candidate(karatKey(k, false), 'gold', `${k}/24`, `${k} karat gold (${k}/24)`));
  add(candidate(karatKey(k, true), 'gold', `${k}/24`, `${k} karat plumb gold (${k}/24, no tolerance below the mark)`));
}

function millesimalKey(num: string, metal: Metal): string {
  return (MILLESIMAL_METALS[num]?.length ?? 0) > 1 ? `${METAL_SYMBOLS[metal]}${num}` : num;
}

for (const [num, metals] of Object.entries(MILLESIMAL_METALS)) {
  for (const metal of metals) {
    add(candidate(millesimalKey(num, metal), metal, `0.${num}`, `${num} ${METAL_LABELS[metal].toLowerCase()}`));
  }
}

const WORD = {
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

/** Upper case, decimal finenesses to digits ("0.925", ".925" -> "925"; "999.9" -> "9999"), tokens spaced. */
export function normaliseMark(input: string): string {
  let s = input.length > MAX_MARK_LENGTH ? input.slice(0, MAX_MARK_LENGTH) : input;
  s = s.normalize('NFKC').toUpperCase();
  s = s.replace(/[\u2044\u2215]/g, '/');
  s = s.replace(/(^|[^\d])0?[.,](\d{3,4})(?!\d)/g, '$1$2');
  s = s.replace(/(^|[^\d])(\d{3})[.,](\d)(?!\d)/g, '$1$2$3');
  s = s.replace(/([A-Z])\.(?=[A-Z])/g, '$1');
  s = s.replace(/(\d)(?=[A-Z])/g, '$1 ').replace(/([A-Z])(?=\d)/g, '$1 ');
  s = s.replace(/\s*\/\s*/g, '/');
  s = s.replace(/[^A-Z0-9/]+/g, ' ').trim();
  return s;
}

const KARAT_UNIT = '(?:KARATS?|CARATS?|KT|CT|KP|K)';
const COMPOSITE = new RegExp(`^(${KARAT_UNIT.slice(3, -1)})(GF|RGP|GP|GE|HGE|HGP|EP|GEP)$`);

function expandTokens(normalized: string): string[] {
  const out: string[] = [];
  for (const token of normalized.split(' ')) {
    const m = COMPOSITE.exec(token);
    if (m) out.push(m[1]!, m[2]!);
    else if (token === 'SILVERPLATE' || token === 'SILVERPLATED') out.push('SILVER', 'PLATED');
    else if (token === 'GOLDFILLED') out.push('GOLD', 'FILLED');
    else if (token === 'NICKELSILVER') out.push('NICKEL', 'SILVER');
    else if (token !== '') out.push(token);
  }
  return out;
}

const NO_PRECIOUS = /\b(?:NICKEL SILVER|GERMAN SILVER|ALPAC+A|NEUSILBER|STAINLESS|TITANIUM|TUNGSTEN|BRASS)\b/;
const FILLED = /\b(?:GF|RGP|GOLD FILLED|GOLD FILL|ROLLED GOLD(?: PLATED?)?)\b/;
const PLATED_SILVER = /\b(?:EPNS|EPBM|EPWM|EPC|EP|SILVER PLATED?|(?:QUADRUPLE|QUAD|TRIPLE|DOUBLE) PLATED?|STERLING PLATED?)\b/;
const PLATED_GOLD = /\b(?:HGE|HGP|GEP|GP|GE|GOLD PLATED?|GOLD ELECTROPLATED?|HEAVY GOLD ELECTROPLATE)\b/;
const PLATED_ANY = /\b(?:PLATED?|ELECTROPLATED?)\b/;
const FRACTION = /\b(\d{1,3})\/(\d{1,4})\b/;
const KARAT_AFTER = new RegExp(`\\b(\\d{1,2}) ${KARAT_UNIT}\\b`, 'g');
const KARAT_BEFORE = /\bK (\d{1,2})\b/g;
const PLUMB = /\b\d{1,2} KP\b/;
const PT_WORD = /\b(?:PT|PLAT|PLATINUM|PLATINA)\b/;
const PD_WORD = /\b(?:PD|PALL|PALLADIUM)\b/;
const STERLING_WORD = /\b(?:STERLING|STERL|STER|STG)\b/;
const COIN_WORD = /\bCOIN\b/;
const FINE_SILVER = /\bFINE SILVER\b/;
const FINE_GOLD = /\bFINE GOLD\b/;
const BRITANNIA_WORD = /\bBRITANNIA\b/;
const VERMEIL_WORD = /\bVERMEIL\b/;
const NUMBER_TOKEN = /^\d{3,4}$/;

const SILVER_HINTS = new Set(['AG', 'S', 'SILVER', 'PLATA', 'ARGENTO', 'ARGENT']);
const GOLD_HINTS = new Set(['AU', 'G', 'GOLD', 'ORO']);

const VOCABULARY = new Set([
  'K', 'KT', 'CT', 'KP', 'KARAT', 'KARATS', 'CARAT', 'CARATS', 'GF', 'RGP', 'GP', 'GE', 'HGE', 'HGP', 'GEP', 'EP',
  'EPNS', 'EPBM', 'EPWM', 'EPC', 'FILLED', 'FILL', 'ROLLED', 'PLATE', 'PLATED', 'ELECTROPLATE', 'ELECTROPLATED',
  'HEAVY', 'QUADRUPLE', 'QUAD', 'TRIPLE', 'DOUBLE', 'PT', 'PLAT', 'PLATINUM', 'PLATINA', 'PD', 'PALL', 'PALLADIUM',
  'STERLING', 'STERL', 'STER', 'STG', 'COIN', 'FINE', 'BRITANNIA', 'VERMEIL', 'SOLID', 'PURE',
  ...SILVER_HINTS, ...GOLD_HINTS,
]);

type Draft = Omit<MarkReading, 'input' | 'normalized' | 'notes' | 'candidates'> & {
  candidates?: readonly MarkCandidate[];
};

function finish(input: string, normalized: string, notes: string[], draft: Draft): MarkReading {
  return Object.freeze({
    input,
    normalized,
    ...draft,
    candidates: Object.freeze([...(draft.candidates ?? [])]),
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

function needsTest(candidates: readonly MarkCandidate[], label: string): Draft {
  return { kind: 'needs-test', label, candidates };
}

function describeCandidates(cs: readonly MarkCandidate[]): string {
  return cs.map((c) => c.label).join(' or ');
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
      return finish(raw, normalized, notes, needsTest([], `${type === 'GF' ? 'Gold-filled' : 'Rolled gold plate'}, content unknown`));
    }
    const num = Number(fraction[1]);
    const den = Number(fraction[2]);
    if (num < 1 || den < 1 || num > den) {
      notes.push(`${num}/${den} is not a share of the weight.`);
      return finish(raw, normalized, notes, needsTest([], 'Gold-filled, fraction unreadable'));
    }
    const finenessExact = `${num * karat}/${den * 24}`;
    const key = `${num}/${den} ${karat}K ${type}`;
    const c = candidate(key, 'gold', finenessExact, `${type === 'GF' ? 'Gold-filled' : 'Rolled gold plate'}: ${num}/${den} of the weight is ${karat} karat gold`);
    return finish(raw, normalized, notes, {
      kind: 'filled',
      key,
      metal: 'gold',
      fineness: c.fineness,
      finenessExact,
      label: c.label,
      candidates: [c],
      filled: { layerFraction: `${num}/${den}`, layerKarat: karat, layerFinenessExact: `${karat}/24` },
    });
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

  // Each group is one mark read on the article; a group with several candidates is ambiguous.
  const groups: MarkCandidate[][] = [];
  const plumb = PLUMB.test(text);
  if (plumb) notes.push('KP (karat plumb): the article meets its karat without the legal tolerance below it.');
  for (const k of karats) groups.push([CATALOGUE.get(karatKey(k, plumb))!]);

  const consumed = new Set<number>();
  const hasPt = PT_WORD.test(text);
  const hasPd = PD_WORD.test(text);
  const silverHint = tokens.some((t) => SILVER_HINTS.has(t));
  const goldHint = tokens.some((t) => GOLD_HINTS.has(t));
  let metalWordOnly = false;

  tokens.forEach((token, i) => {
    if (!NUMBER_TOKEN.test(token)) return;
    const metals = MILLESIMAL_METALS[token];
    if (!metals) {
      notes.push(`The number ${token} is not a fineness Cupel knows.`);
      consumed.add(i);
      return;
    }
    consumed.add(i);
    const hinted = metals.filter(
      (m) => (m === 'platinum' && hasPt) || (m === 'palladium' && hasPd) || (m === 'silver' && silverHint) || (m === 'gold' && goldHint),
    );
    const chosen = hinted.length > 0 ? hinted : hasPt || hasPd || silverHint || goldHint ? [] : metals;
    if (chosen.length === 0) {
      notes.push(`${token} is not a standard fineness of the metal named beside it.`);
      groups.push(metals.map((m) => CATALOGUE.get(millesimalKey(token, m))!));
      return;
    }
    groups.push(chosen.map((m) => CATALOGUE.get(millesimalKey(token, m))!));
  });

  const numberedPt = groups.some((g) => g.some((c) => c.metal === 'platinum'));
  const numberedPd = groups.some((g) => g.some((c) => c.metal === 'palladium'));
  if (hasPt && !numberedPt) {
    notes.push('Unqualified "platinum" is taken at 950 (FTC Jewelry Guides, 16 CFR 23.7).');
    groups.push([WORD.platinum]);
  }
  if (hasPd && !numberedPd) {
    notes.push('Unqualified "palladium" is taken at 950 (FTC Jewelry Guides, 16 CFR 23.7).');
    groups.push([WORD.palladium]);
  }
  if (STERLING_WORD.test(text)) groups.push([WORD.sterling]);
  if (COIN_WORD.test(text)) groups.push([WORD.coinSilver]);
  if (FINE_SILVER.test(text)) groups.push([WORD.fineSilver]);
  if (FINE_GOLD.test(text)) groups.push([WORD.fineGold]);
  if (BRITANNIA_WORD.test(text)) groups.push([WORD.britannia]);
  if (vermeil) {
    notes.push('Vermeil is sterling coated with gold; the coat is not bought.');
    groups.push([WORD.vermeil]);
  }
  if (groups.length === 0 && (silverHint || goldHint)) metalWordOnly = true;

  const ignored = tokens.filter((t, i) => !consumed.has(i) && !VOCABULARY.has(t) && !/^\d/.test(t));
  if (ignored.length > 0) notes.push(`Not read: ${ignored.slice(0, 8).join(' ')}`);

  if (groups.length === 0) {
    if (metalWordOnly) {
      const metal: Metal = silverHint ? 'silver' : 'gold';
      notes.push(`"${METAL_LABELS[metal]}" without a fineness is not a purity mark (16 CFR 23.5 asks for a fineness beside the word). Test it.`);
      const cs = MARK_CATALOGUE.filter((c) => c.metal === metal && /^\D*\d+$/.test(c.key) && !c.key.endsWith('KP'));
      return finish(raw, normalized, notes, needsTest(cs, `${METAL_LABELS[metal]}, fineness unknown: needs a test`));
    }
    return finish(raw, normalized, notes, { kind: 'unknown', label: 'Mark not recognised: needs a test' });
  }

  const ambiguous = groups.find((g) => g.length > 1);
  if (ambiguous) {
    const unambiguous = groups.filter((g) => g.length === 1).map((g) => g[0]!);
    const narrowed = unambiguous.length > 0 ? ambiguous.filter((c) => unambiguous.every((u) => u.metal === c.metal)) : [];
    if (narrowed.length === 1 && unambiguous.every((u) => u.metal === narrowed[0]!.metal)) {
      groups.splice(groups.indexOf(ambiguous), 1, [narrowed[0]!]);
    } else {
      const union = dedupe(groups.flat());
      notes.push(`Could be ${describeCandidates(union)}; test before pricing.`);
      return finish(raw, normalized, notes, needsTest(union, 'Ambiguous mark: needs a test'));
    }
  }

  const singles = dedupe(groups.map((g) => g[0]!));
  const metals = new Set(singles.map((c) => c.metal));
  if (metals.size > 1) {
    notes.push(`Marks of more than one metal: ${describeCandidates(singles)}. Test before pricing.`);
    return finish(raw, normalized, notes, needsTest(singles, 'Marks of different metals: needs a test'));
  }
  if (singles.length === 1) return finish(raw, normalized, notes, solidFrom(singles[0]!));

  const values = singles.map((c) => ratioValue(parseRatio(c.finenessExact)));
  let lowest = 0;
  values.forEach((v, i) => {
    if (v.lt(values[lowest]!)) lowest = i;
  });
  const highest = values.reduce((a, b) => (a.gt(b) ? a : b));
  if (highest.minus(values[lowest]!).gt('0.005')) {
    notes.push(`Marks disagree: ${describeCandidates(singles)}. Test before pricing.`);
    return finish(raw, normalized, notes, needsTest(singles, 'Marks disagree: needs a test'));
  }
  notes.push(`Also marked: ${singles.filter((_, i) => i !== lowest).map((c) => c.key).join(', ')}; the lower fineness is used.`);
  return finish(raw, normalized, notes, solidFrom(singles[lowest]!));
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

/** The candidate of a reading for a metal the clerk has stated, when the reading allows it. */
export function resolveMarkForMetal(reading: MarkReading, metal: Metal | undefined): MarkCandidate | undefined {
  if (reading.kind === 'solid' || reading.kind === 'filled') {
    const c = reading.candidates[0];
    return c && (metal === undefined || c.metal === metal) ? c : undefined;
  }
  if (reading.kind === 'needs-test' && metal !== undefined) {
    const ofMetal = reading.candidates.filter((c) => c.metal === metal);
    return ofMetal.length === 1 ? ofMetal[0] : undefined;
  }
  return undefined;
}

/** A key is known when reading it gives back a solid or filled reading with that very key. */
export function isMarkKey(key: string): boolean {
  if (CATALOGUE.has(key)) return true;
  const r = parseMark(key);
  return (r.kind === 'filled' || r.kind === 'solid') && r.key === key;
}

export function markedFinenessOfKey(key: string): string | undefined {
  const c = CATALOGUE.get(key);
  if (c) return c.finenessExact;
  const r = parseMark(key);
  return r.key === key ? r.finenessExact : undefined;
}
