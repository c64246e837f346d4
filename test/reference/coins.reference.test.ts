import { describe, expect, it } from 'vitest';
import { COIN_CATALOGUE, coinSpec, FACE_VALUE_CLASSES, faceValueClass, GRAMS_PER_TROY_OUNCE } from '@/features/pricing';
import { Dec } from '@/features/pricing/decimal';

/**
 * Every figure here is an issuer's published specification (a statute where one sets it), and almost all
 * are "from memory": nobody checked the published text while writing them. Each test names its source.
 */
const OZT = new Dec(GRAMS_PER_TROY_OUNCE);
const places = (s: string) => (s.includes('.') ? s.length - s.indexOf('.') - 1 : 0);
const halfUnit = (s: string) => new Dec(5).div(new Dec(10).pow(places(s) + 1));
/** Stated as a fraction of an ounce: exact by definition, with no rounding of its own. */
const NOMINAL = new Set(['1', '0.5', '0.25', '0.1']);

const fineOzt = (gross: string, fineness: string) => new Dec(gross).mul(fineness).div(OZT);

/** Largest gap gross x fineness may show against a fine content, from the rounding of the three published figures. */
function publishedRounding(gross: string, fineness: string, fine: string) {
  return halfUnit(gross).mul(fineness).div(OZT)
    .plus(halfUnit(fineness).mul(gross).div(OZT))
    .plus(NOMINAL.has(fine) ? 0 : halfUnit(fine));
}

type Row = [coinType: string, gross: string, fineness: string, fine: string];

function checkRows(rows: Row[]) {
  for (const [type, gross, fineness, fine] of rows) {
    const c = coinSpec(type);
    expect(c, type).toBeDefined();
    expect([c!.grossWeightGrams, c!.fineness, c!.fineTroyOunces], type).toEqual([gross, fineness, fine]);
  }
}

describe('every coin in the catalogue', () => {
  it.each(COIN_CATALOGUE.map((c) => [c.coinType, c] as const))('%s: fine content = gross x fineness within the published rounding', (_type, c) => {
    const computed = fineOzt(c.grossWeightGrams, c.fineness);
    if (c.fineFrom === 'computed') {
      // Where the issuer's nominal weight and its gross and fineness disagree, the line is paid on gross x fineness.
      expect(c.fineTroyOunces).toBe(computed.toFixed(places(c.fineTroyOunces), Dec.ROUND_HALF_UP));
      expect(c.source).toMatch(/fine content = gross x fineness/);
    } else {
      const gap = computed.minus(c.fineTroyOunces).abs();
      expect(gap.lte(publishedRounding(c.grossWeightGrams, c.fineness, c.fineTroyOunces)), `${c.coinType}: ${computed.toFixed(6)} against ${c.fineTroyOunces}`).toBe(true);
    }
  });

  it('names its source, says "from memory" where nobody checked, and reads by country, metal and years', () => {
    for (const c of COIN_CATALOGUE) {
      expect(c.source, c.coinType).toMatch(/specifications|U\.S\.C\.|Act/);
      expect(c.source, c.coinType).toMatch(/from memory/);
      expect(c.label, c.coinType).toMatch(/\d{4}/);
      expect(c.label.toLowerCase(), c.coinType).toContain(c.metal === 'gold' ? 'gold' : c.metal);
    }
    expect(new Set(COIN_CATALOGUE.map((c) => c.coinType)).size).toBe(COIN_CATALOGUE.length);
  });
});

describe('United States Mint', () => {
  it('90% silver subsidiary coin, weights from 1873 (US Mint coin specifications; Coinage Act of 1873, from memory)', () => {
    checkRows([
      ['us-90-dime', '2.50', '0.900', '0.07234'],
      ['us-90-quarter', '6.25', '0.900', '0.18084'],
      ['us-90-half', '12.50', '0.900', '0.36169'],
    ]);
    for (const t of ['us-90-dime', 'us-90-quarter', 'us-90-half']) expect(coinSpec(t)!.years).toBe('1873-1964');
  });

  it('silver dollars 1878-1935 26.73 g at 90%, and the .999 re-issues of 2021 at the same weight (US Mint specifications, from memory)', () => {
    checkRows([
      ['us-90-dollar', '26.73', '0.900', '0.7734'],
      ['us-999-dollar-reissue', '26.73', '0.999', '0.858'],
    ]);
  });

  it('40% silver: halves 1965-1970 11.50 g, dollars 1971-1976 24.59 g (US Mint specifications, from memory)', () => {
    checkRows([
      ['us-40-half', '11.50', '0.400', '0.1479'],
      ['us-40-dollar', '24.59', '0.400', '0.3161'],
    ]);
    expect(coinSpec('us-40-dollar')!.years).toBe('1971-1976');
  });

  it('35% silver five cents from mid-1942 to 1945 only; early 1942 pieces carry no silver (US Mint specifications, from memory)', () => {
    checkRows([['us-35-nickel', '5.00', '0.350', '0.05626']]);
    const c = coinSpec('us-35-nickel')!;
    expect(c.years).toBe('mid-1942 to 1945');
    expect(c.label).toContain('mid-1942');
    expect(c.note).toMatch(/early 1942 are copper-nickel/);
  });

  it('gold before 1934: 516, 258, 129 and 64.5 grains at .900 (Coinage Act of 1837; US Mint specifications, from memory)', () => {
    checkRows([
      ['us-gold-20-dollar', '33.436', '0.900', '0.9675'],
      ['us-gold-10-dollar', '16.718', '0.900', '0.48375'],
      ['us-gold-5-dollar', '8.359', '0.900', '0.241875'],
      ['us-gold-2-50-dollar', '4.18', '0.900', '0.1209375'],
    ]);
    // 480 grains to the troy ounce (NIST Handbook 44, Appendix C): the fine content in grains is exact.
    for (const [type, grains] of [['us-gold-20-dollar', '516'], ['us-gold-10-dollar', '258'], ['us-gold-5-dollar', '129'], ['us-gold-2-50-dollar', '64.5']] as const) {
      expect(new Dec(grains).mul('0.9').div(480).toFixed(), type).toBe(new Dec(coinSpec(type)!.fineTroyOunces).toFixed());
    }
  });

  it('22 karat gold bullion coins by weight and fine content (31 U.S.C. 5112(a)(7)-(10), from memory)', () => {
    checkRows([
      ['us-1oz-gold-bullion', '33.931', '0.9167', '1'],
      ['us-half-oz-gold-bullion', '16.966', '0.9167', '0.5'],
      ['us-quarter-oz-gold-bullion', '8.483', '0.9167', '0.25'],
      ['us-tenth-oz-gold-bullion', '3.393', '0.9167', '0.1'],
    ]);
  });

  it('a .9999 one-ounce gold bullion coin apart from the 22 karat one (31 U.S.C. 5112(q); US Mint specifications, from memory)', () => {
    checkRows([['us-1oz-gold-bullion-9999', '31.108', '0.9999', '1']]);
    expect(coinSpec('us-1oz-gold-bullion-9999')!.label).not.toBe(coinSpec('us-1oz-gold-bullion')!.label);
  });

  it('silver bullion coin 31.103 g of .999 silver holds 0.999 ozt (31 U.S.C. 5112(e), from memory)', () => {
    checkRows([['us-1oz-silver-bullion', '31.103', '0.999', '0.999']]);
  });

  it('platinum and palladium bullion coins 31.120 g of .9995 (US Mint specifications, from memory)', () => {
    checkRows([
      ['us-1oz-platinum-bullion', '31.120', '0.9995', '1'],
      ['us-1oz-palladium-bullion', '31.120', '0.9995', '1'],
    ]);
    expect(coinSpec('us-1oz-platinum-bullion')!.metal).toBe('platinum');
    expect(coinSpec('us-1oz-palladium-bullion')!.metal).toBe('palladium');
  });
});

describe('other issuers', () => {
  it('Royal Canadian Mint bullion coins of .9999 gold and silver and .9995 platinum and palladium (from memory)', () => {
    checkRows([
      // Corrected: 31.39 g at .9999 would hold 1.009 ozt; the one-ounce silver coin weighs 31.11 g.
      ['ca-1oz-silver-bullion', '31.11', '0.9999', '1'],
      ['ca-1oz-gold-bullion', '31.11', '0.9999', '1'],
      ['ca-half-oz-gold-bullion', '15.55', '0.9999', '0.5'],
      ['ca-quarter-oz-gold-bullion', '7.797', '0.9999', '0.2507'],
      ['ca-tenth-oz-gold-bullion', '3.131', '0.9999', '0.1007'],
      ['ca-1oz-platinum-bullion', '31.11', '0.9995', '0.9997'],
      ['ca-1oz-palladium-bullion', '31.11', '0.9995', '0.9997'],
    ]);
  });

  it('British sovereign and half sovereign, 7.98805 g and 3.99403 g of 22 carat (Coinage Act 1971 (UK), Schedule 1, from memory)', () => {
    checkRows([
      ['uk-sovereign', '7.98805', '0.9167', '0.2354'],
      ['uk-half-sovereign', '3.99403', '0.9167', '0.1177'],
    ]);
  });

  it('The Royal Mint one-ounce bullion coins hold 31.21 g fine (The Royal Mint bullion specifications, from memory)', () => {
    checkRows([
      ['uk-1oz-gold-bullion-22k', '34.05', '0.9167', '1.0035'],
      ['uk-1oz-gold-bullion-9999', '31.21', '0.9999', '1.0033'],
      ['uk-1oz-silver-bullion', '31.21', '0.999', '1.0024'],
    ]);
  });

  it('South African Mint 22 karat gold bullion coins (South African Mint bullion specifications, from memory)', () => {
    checkRows([
      ['za-1oz-gold-bullion', '33.93', '0.9167', '1'],
      ['za-half-oz-gold-bullion', '16.965', '0.9167', '0.5'],
      ['za-quarter-oz-gold-bullion', '8.482', '0.9167', '0.25'],
      ['za-tenth-oz-gold-bullion', '3.393', '0.9167', '0.1'],
    ]);
  });

  it('Austrian Mint .9999 gold and .999 silver bullion coins, paid on gross x fineness (Austrian Mint bullion specifications, from memory)', () => {
    checkRows([
      ['at-1oz-gold-bullion', '31.103', '0.9999', '0.9999'],
      ['at-half-oz-gold-bullion', '15.552', '0.9999', '0.5000'],
      ['at-quarter-oz-gold-bullion', '7.776', '0.9999', '0.2500'],
      ['at-tenth-oz-gold-bullion', '3.121', '0.9999', '0.1003'],
      ['at-1oz-silver-bullion', '31.103', '0.999', '0.9990'],
    ]);
  });

  it('Mexico 50 pesos, 41.666 g of .900 gold, 37.5 g fine (Banco de México specifications, from memory)', () => {
    checkRows([['mx-50-pesos', '41.666', '0.900', '1.2057']]);
    expect(new Dec('37.5').div(OZT).toFixed(4, Dec.ROUND_HALF_UP)).toBe('1.2057');
  });
});

describe('coin counted by face value', () => {
  it.each(FACE_VALUE_CLASSES.map((c) => [c.coinClass, c] as const))('%s: mint figure per 1.00 face = gross per 1.00 face x fineness, and its counter basis has a figure', (_id, cls) => {
    const mint = cls.troyOuncesPerDollarFace['mint-weight'];
    expect(mint).toBe(fineOzt(cls.grossGramsPerDollarFace, cls.fineness).toFixed(places(mint), Dec.ROUND_HALF_UP));
    expect(cls.troyOuncesPerDollarFace[cls.counterBasis]).toBeDefined();
    for (const basis of Object.keys(cls.troyOuncesPerDollarFace)) expect(cls.basisSources[basis as 'mint-weight'], `${cls.coinClass} ${basis}`).toMatch(/from memory|common practice/);
  });

  it('90%: 0.7234 ozt per 1.00 face at mint weight (10 dimes x 2.50 g x 0.900, US Mint specifications, from memory), 0.715 for circulated coin (common practice)', () => {
    const cls = faceValueClass('us-90')!;
    expect(cls.troyOuncesPerDollarFace).toEqual({ 'mint-weight': '0.7234', 'common-practice': '0.715' });
    expect(cls.counterBasis).toBe('common-practice');
    expect(cls.label).toContain('1873-1964');
  });

  it('40% halves: 0.2958 ozt per 1.00 face (2 x 11.50 g x 0.400, US Mint specifications, from memory); no common-practice figure, so the counter counts mint weight', () => {
    const cls = faceValueClass('us-40')!;
    expect(cls.troyOuncesPerDollarFace).toEqual({ 'mint-weight': '0.2958' });
    expect(cls.counterBasis).toBe('mint-weight');
    // 2 halves of 0.1479 ozt each (the per-coin figure in the catalogue)
    expect(new Dec(coinSpec('us-40-half')!.fineTroyOunces).mul(2).toFixed()).toBe('0.2958');
  });

  it('35% five cents: 1.1253 ozt per 1.00 face (20 x 5.00 g x 0.350, US Mint specifications, from memory)', () => {
    const cls = faceValueClass('us-35')!;
    expect(cls.troyOuncesPerDollarFace).toEqual({ 'mint-weight': '1.1253' });
    expect(cls.counterBasis).toBe('mint-weight');
    expect(cls.note).toMatch(/early 1942/);
  });

  it('Canada 80%: 0.6000 ozt per 1.00 face (23.327 g per dollar x 0.800, Royal Canadian Mint specifications, from memory)', () => {
    const cls = faceValueClass('ca-80')!;
    expect(cls.troyOuncesPerDollarFace).toEqual({ 'mint-weight': '0.6000' });
    expect(cls.counterBasis).toBe('mint-weight');
    expect(cls.metal).toBe('silver');
  });
});
