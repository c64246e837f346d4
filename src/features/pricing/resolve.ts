import { FACE_VALUE_BASIS_LABELS, coinSpec, faceValueBases, faceValueBasisFor, faceValueClass } from './coins';
import {
  EXACT_ONE,
  EXACT_ZERO,
  ONE,
  addExact,
  cmpExact,
  exact,
  exactInt,
  exactToString,
  isMultipleExact,
  mulExact,
  parseRatio,
  percentOfExact,
  ratioThresholdTest,
  subExact,
  type Exact,
  type Ratio,
} from './decimal';
import { parseMark, resolveMarkForMetal, type MarkReading } from './marks';
import type { Metal } from './metals';
import { DEFAULT_RATES, resolveRateCategory, type RateCategory, type RateRule } from './rates';
import { TROY_OUNCE_GRAMS_EXACT } from './units';
import type {
  ValidCoinLine,
  ValidFaceValueLine,
  ValidFineWeightLine,
  ValidQuoteInput,
  ValidQuoteLine,
  ValidWeightLine,
} from './pricing.schema';

export interface Issue {
  path: (string | number)[];
  message: string;
}

export type FinenessSource = 'mark' | 'assumed' | 'test' | 'catalogue' | 'face-value' | 'assay';
export type RateSource = 'default' | 'store' | 'ticket-override' | 'line-override';

export interface WeightBreakdown {
  grossGrams: Exact;
  tareGrams: Exact;
  deductionsGrams: Exact;
  netGrams: Exact;
}

export interface PricedResolution {
  status: 'priced';
  metal: Metal;
  rateCategory: RateCategory;
  rule: RateRule;
  ruleSource: RateSource;
  /** Path of the rule in the input, to name it in errors. */
  rulePath: (string | number)[];
  /** Fine weight in troy ounces as the exact ratio n/d. */
  fineOzt: Ratio;
  /** Fine weight in grams, when it is known without dividing by the troy ounce. */
  fineGrams?: Ratio;
  marked?: Ratio;
  markedExact?: string;
  paidOn?: Ratio;
  paidOnExact?: string;
  finenessSource: FinenessSource;
  reading?: MarkReading;
  weights?: WeightBreakdown;
  grossGramsTotal?: Exact;
  notes: string[];
}

export interface UnpricedResolution {
  status: 'needs-test' | 'not-buyable';
  reading: MarkReading;
  message: string;
  weights?: WeightBreakdown;
}

export type LineResolution = PricedResolution | UnpricedResolution | { status: 'invalid' };

type QuoteContext = Pick<ValidQuoteInput, 'rates' | 'rateOverride' | 'assumedFineness'>;
type Writable<T> = { -readonly [K in keyof T]: T[K] };

function effectiveRule(
  line: ValidQuoteLine,
  index: number,
  category: RateCategory,
  quote: QuoteContext,
): { rule: RateRule; source: RateSource; path: (string | number)[] } {
  if (line.rateOverride) return { rule: line.rateOverride, source: 'line-override', path: ['lines', index, 'rateOverride'] };
  if (quote.rateOverride) return { rule: quote.rateOverride, source: 'ticket-override', path: ['rateOverride'] };
  const stored = quote.rates?.[category];
  if (stored) return { rule: stored, source: 'store', path: ['rates', category] };
  return { rule: DEFAULT_RATES[category], source: 'default', path: ['rates', category] };
}

function weighLine(line: ValidWeightLine, index: number, issues: Issue[] | null): WeightBreakdown | null {
  const gross = exact(line.grossWeight.grams);
  const tare = line.tare ? exact(line.tare.grams) : EXACT_ZERO;
  if (cmpExact(tare, gross) >= 0) {
    issues?.push({ path: ['lines', index, 'tare', 'value'], message: 'tare must be less than the gross weight' });
    return null;
  }
  const afterTare = subExact(gross, tare);
  let deductions = EXACT_ZERO;
  let ok = true;
  line.deductions.forEach((d, j) => {
    const grams = d.kind === 'grams' ? exact(d.value) : percentOfExact(afterTare, exact(d.value));
    if (d.kind === 'grams' && cmpExact(grams, gross) > 0) {
      issues?.push({ path: ['lines', index, 'deductions', j, 'value'], message: `deduction of ${d.value} g is larger than the gross weight (${exactToString(gross)} g)` });
      ok = false;
    }
    deductions = addExact(deductions, grams);
  });
  if (!ok) return null;
  const net = subExact(afterTare, deductions);
  if (net.m <= 0n) {
    issues?.push({ path: ['lines', index, 'deductions'], message: `tare and deductions leave no metal (net ${exactToString(net)} g)` });
    return null;
  }
  return { grossGrams: gross, tareGrams: tare, deductionsGrams: deductions, netGrams: net };
}

function priced(
  line: ValidQuoteLine,
  index: number,
  quote: QuoteContext,
  metal: Metal,
  category: RateCategory,
  rest: Omit<PricedResolution, 'status' | 'metal' | 'rateCategory' | 'rule' | 'ruleSource' | 'rulePath'>,
): PricedResolution {
  const { rule, source, path } = effectiveRule(line, index, category, quote);
  // rest is always a fresh literal; completing it in place avoids a spread per line.
  const resolution = rest as Writable<PricedResolution>;
  resolution.status = 'priced';
  resolution.metal = metal;
  resolution.rateCategory = category;
  resolution.rule = rule;
  resolution.ruleSource = source;
  resolution.rulePath = path;
  return resolution;
}

const troyOunceDenominators = new WeakMap<Ratio, Exact>();

/** Denominator of the fine troy ounces for a fineness: one object per fineness, so totals can group by it cheaply. */
function troyOunceDenominator(fineness: Ratio): Exact {
  let found = troyOunceDenominators.get(fineness);
  if (found === undefined) {
    found = mulExact(fineness.d, TROY_OUNCE_GRAMS_EXACT);
    troyOunceDenominators.set(fineness, found);
  }
  return found;
}

function resolveWeightLine(line: ValidWeightLine, index: number, quote: QuoteContext, issues: Issue[] | null): LineResolution {
  const weights = weighLine(line, index, issues);
  if (!weights) return { status: 'invalid' };
  const reading = line.mark !== undefined ? parseMark(line.mark) : undefined;
  const notes: string[] = [];

  if (line.fineness !== undefined) {
    const metal = line.metal ?? (reading && (reading.kind === 'solid' || reading.kind === 'filled') ? reading.metal : undefined);
    if (!metal) {
      issues?.push({ path: ['lines', index, 'metal'], message: 'say which metal the tested fineness is for' });
      return { status: 'invalid' };
    }
    if (reading?.metal && reading.metal !== metal) notes.push(`Marked ${reading.label}; priced on the test as ${metal}.`);
    else if (reading?.kind === 'needs-test') notes.push(`Marked "${reading.input}" (${reading.label.toLowerCase()}); priced on the test as ${metal}.`);
    const tested = parseRatio(line.fineness);
    const fineGramsN = mulExact(weights.netGrams, tested.n);
    return priced(line, index, quote, metal, resolveRateCategory(metal, line.category, ratioThresholdTest(tested)), {
      fineOzt: { n: fineGramsN, d: troyOunceDenominator(tested) },
      fineGrams: { n: fineGramsN, d: tested.d },
      marked: tested,
      markedExact: line.fineness,
      paidOn: tested,
      paidOnExact: line.fineness,
      finenessSource: 'test',
      reading,
      weights,
      notes,
    });
  }

  if (!reading) {
    issues?.push({ path: ['lines', index, 'mark'], message: 'give the purity mark, or a tested fineness with its metal' });
    return { status: 'invalid' };
  }
  if (reading.kind === 'plated' || reading.kind === 'no-precious') {
    return { status: 'not-buyable', reading, message: `${reading.label}: nothing to buy as precious metal`, weights };
  }
  const chosen = resolveMarkForMetal(reading, line.metal);
  if (!chosen) return { status: 'needs-test', reading, message: needsTestMessage(reading, line.metal), weights };
  const marked = parseRatio(chosen.finenessExact);
  const assumed = quote.assumedFineness[chosen.key];
  const paidOn = assumed !== undefined ? parseRatio(assumed) : marked;
  if (reading.kind === 'needs-test') notes.push(`Read as ${chosen.label} because the line says ${chosen.metal}.`);
  const fineGramsN = mulExact(weights.netGrams, paidOn.n);
  return priced(line, index, quote, chosen.metal, resolveRateCategory(chosen.metal, line.category, ratioThresholdTest(marked), reading.kind === 'filled'), {
    fineOzt: { n: fineGramsN, d: troyOunceDenominator(paidOn) },
    fineGrams: { n: fineGramsN, d: paidOn.d },
    marked,
    markedExact: chosen.finenessExact,
    paidOn,
    paidOnExact: assumed ?? chosen.finenessExact,
    finenessSource: assumed !== undefined ? 'assumed' : 'mark',
    reading,
    weights,
    notes,
  });
}

/** The plain reason a weight line is held for a test: what the mark says, and what does not fit. */
function needsTestMessage(reading: MarkReading, metal: Metal | undefined): string {
  if ((reading.kind === 'solid' || reading.kind === 'filled') && metal !== undefined) {
    return `The mark reads ${reading.label}, but the line says ${metal}. Test it and enter the tested fineness, or correct the metal.`;
  }
  if (reading.reason === 'ambiguous-metal') {
    const metals = [...new Set(reading.candidates.map((c) => c.metal))];
    const list = metals.length > 1 ? `${metals.slice(0, -1).join(', ')} or ${metals[metals.length - 1]}` : metals.join('');
    return metal !== undefined
      ? `The line says ${metal}, but ${reading.normalized} is a fineness of ${list}. Test it and enter the tested fineness, or correct the metal.`
      : `${reading.normalized} is a fineness of ${list}: choose the metal, or test it.`;
  }
  if (reading.reason === 'metal-conflict') {
    const said = reading.notes.find((n) => n.startsWith('The mark names') || n.startsWith('Marks of more than one metal') || n.startsWith('Could be'));
    return said ?? `${reading.label}. Test it before pricing.`;
  }
  if (reading.reason === 'unqualified-gold') return 'Marked "gold" with no karat: the word alone claims 24 karat (fine) gold. Test it before paying as 24K.';
  return reading.kind === 'unknown' ? `${reading.label}. Enter a tested fineness and its metal.` : `${reading.label}. Enter a tested fineness.`;
}

function resolveCoinLine(line: ValidCoinLine, index: number, quote: QuoteContext): LineResolution {
  const spec = coinSpec(line.coinType)!;
  const fineness = parseRatio(spec.fineness);
  return priced(line, index, quote, spec.metal, resolveRateCategory(spec.metal, spec.category, ratioThresholdTest(fineness)), {
    fineOzt: { n: mulExact(exact(spec.fineTroyOunces), exactInt(line.count)), d: EXACT_ONE },
    marked: fineness,
    markedExact: spec.fineness,
    paidOn: fineness,
    paidOnExact: spec.fineness,
    finenessSource: 'catalogue',
    grossGramsTotal: mulExact(exact(spec.grossWeightGrams), exactInt(line.count)),
    notes: [`${line.count} x ${spec.fineTroyOunces} ozt stated fine content (${spec.source}).`],
  });
}

function resolveFaceValueLine(line: ValidFaceValueLine, index: number, quote: QuoteContext, issues: Issue[] | null): LineResolution {
  const cls = faceValueClass(line.coinClass)!;
  const basis = faceValueBasisFor(cls, line.basis);
  const perDollar = cls.troyOuncesPerDollarFace[basis];
  if (perDollar === undefined) {
    issues?.push({ path: ['lines', index, 'basis'], message: `${line.coinClass} has no ${basis} figure; use ${faceValueBases(cls).join(' or ')}` });
    return { status: 'invalid' };
  }
  const face = exact(line.faceValue);
  if (!isMultipleExact(face, exact(cls.faceStep))) {
    issues?.push({ path: ['lines', index, 'faceValue'], message: `must be a multiple of ${cls.faceStep} for ${line.coinClass} coin` });
    return { status: 'invalid' };
  }
  const fineness = parseRatio(cls.fineness);
  return priced(line, index, quote, cls.metal, resolveRateCategory(cls.metal, 'coin', ratioThresholdTest(fineness)), {
    fineOzt: { n: mulExact(face, exact(perDollar)), d: EXACT_ONE },
    marked: fineness,
    markedExact: cls.fineness,
    paidOn: fineness,
    paidOnExact: cls.fineness,
    finenessSource: 'face-value',
    notes: [`${line.faceValue} face x ${perDollar} ozt per 1.00 face (${FACE_VALUE_BASIS_LABELS[basis]}; ${cls.basisSources[basis]}).`],
  });
}

function resolveFineWeightLine(line: ValidFineWeightLine, index: number, quote: QuoteContext): LineResolution {
  const grams = exact(line.fineWeight.grams);
  return priced(line, index, quote, line.metal, resolveRateCategory(line.metal, line.category, ONE), {
    fineOzt: { n: grams, d: TROY_OUNCE_GRAMS_EXACT },
    fineGrams: { n: grams, d: EXACT_ONE },
    finenessSource: 'assay',
    notes: [],
  });
}

export function resolveLine(line: ValidQuoteLine, index: number, quote: QuoteContext, issues: Issue[] | null = null): LineResolution {
  switch (line.kind) {
    case 'weight':
      return resolveWeightLine(line, index, quote, issues);
    case 'coin':
      return resolveCoinLine(line, index, quote);
    case 'face-value':
      return resolveFaceValueLine(line, index, quote, issues);
    case 'fine-weight':
      return resolveFineWeightLine(line, index, quote);
  }
}

/** Cross-field rules zod cannot see field by field: net weight, metal against mark, spot per metal, rates against spot. */
export function checkQuoteConsistency(quote: ValidQuoteInput): Issue[] {
  const issues: Issue[] = [];
  const missingSpot = new Map<Metal, number>();
  quote.lines.forEach((line, index) => {
    const r = resolveLine(line, index, quote, issues);
    if (r.status !== 'priced') return;
    const spot = quote.spot[r.metal];
    if (spot === undefined) {
      if (!missingSpot.has(r.metal)) missingSpot.set(r.metal, index);
      return;
    }
    if (r.rule.basis === 'under-spot' && cmpExact(exact(r.rule.amountPerTroyOunce), exact(spot)) > 0) {
      issues.push({
        path: [...r.rulePath, 'amountPerTroyOunce'],
        message: `amount under spot (${r.rule.amountPerTroyOunce}) is more than the ${r.metal} spot (${spot}); the payout would be negative`,
      });
    }
  });
  for (const [metal, index] of missingSpot) {
    issues.push({ path: ['spot', metal], message: `a ${metal} spot price per troy ounce is needed: line ${index + 1} is ${metal}` });
  }
  const seen = new Set<string>();
  return issues.filter((i) => {
    const id = `${i.path.join('.')}|${i.message}`;
    return seen.has(id) ? false : (seen.add(id), true);
  });
}
