import { describe, expect, it } from 'vitest';
import { FACE_VALUE_CLASSES, priceQuote, safePriceQuote, type PricedLine } from '@/features/pricing';
import { quote } from './factories';

const faceLine = (coinClass: string, faceValue: string, basis?: string) => ({ kind: 'face-value' as const, coinClass, faceValue, ...(basis ? { basis } : {}) });

function priced(coinClass: string, faceValue: string, basis?: string): PricedLine {
  const line = priceQuote(quote([faceLine(coinClass, faceValue, basis) as never])).lines[0]!;
  if (line.status !== 'priced') throw new Error(`${coinClass} is ${line.status}`);
  return line;
}

function issues(coinClass: string, faceValue: string, basis?: string) {
  const r = safePriceQuote(quote([faceLine(coinClass, faceValue, basis) as never]));
  if (r.ok) throw new Error('expected validation issues');
  return r.issues;
}

// Spot silver 30.00; the default silver-coin rate is 85% of melt (common practice). Each payout is rounded half-up once.
describe('coin by face value, class by class', () => {
  it('90% (1873-1964): circulated at 0.715 ozt per 1.00 face unless mint weight (0.7234) is asked for', () => {
    const circulated = priced('us-90', '10.00');
    expect(circulated.faceValue).toEqual({
      coinClass: 'us-90',
      faceValue: '10.00',
      basis: 'common-practice',
      basisLabel: 'circulated, common practice',
      troyOuncesPerDollarFace: '0.715',
      label: 'US 90% silver dimes, quarters and halves (1873-1964)',
    });
    expect(circulated.fineWeightTroyOunces).toBe('7.150000');
    expect(circulated.meltValue.amountMinor).toBe(21450); // 7.15 x 30.00
    expect(circulated.payout.amountMinor).toBe(18233); // 214.50 x 0.85 = 182.325 -> 182.33
    const mint = priced('us-90', '10.00', 'mint-weight');
    expect(mint.faceValue).toMatchObject({ basis: 'mint-weight', basisLabel: 'mint weight', troyOuncesPerDollarFace: '0.7234' });
    expect(mint.meltValue.amountMinor).toBe(21702); // 7.234 x 30.00
    expect(mint.payout.amountMinor).toBe(18447); // 217.02 x 0.85 = 184.467 -> 184.47
  });

  it('40% halves (1965-1970): mint weight, 0.2958 ozt per 1.00 face, with or without the basis named', () => {
    for (const line of [priced('us-40', '10.00'), priced('us-40', '10.00', 'mint-weight')]) {
      expect(line.faceValue).toMatchObject({ basis: 'mint-weight', basisLabel: 'mint weight', troyOuncesPerDollarFace: '0.2958' });
      expect(line.fineWeightTroyOunces).toBe('2.958000');
      expect(line.meltValue.amountMinor).toBe(8874); // 2.958 x 30.00
      expect(line.payout.amountMinor).toBe(7543); // 88.74 x 0.85 = 75.429 -> 75.43
      expect(line.payoutRate.rateCategory).toBe('silver-coin');
      expect(line.notes.join(' ')).toMatch(/10\.00 face x 0\.2958 ozt per 1\.00 face \(mint weight; US Mint/);
    }
  });

  it('35% five cents (mid-1942 to 1945): mint weight, 1.1253 ozt per 1.00 face', () => {
    const line = priced('us-35', '5.00');
    expect(line.faceValue).toMatchObject({ basis: 'mint-weight', troyOuncesPerDollarFace: '1.1253' });
    expect(line.fineWeightTroyOunces).toBe('5.626500');
    expect(line.meltValue.amountMinor).toBe(16880); // 5.6265 x 30.00 = 168.795 -> 168.80
    expect(line.payout.amountMinor).toBe(14348); // 168.795 x 0.85 = 143.47575 -> 143.48
  });

  it('Canada 80% (1920-1966): mint weight, 0.6000 ozt per 1.00 face', () => {
    const line = priced('ca-80', '10.00');
    expect(line.faceValue).toMatchObject({ basis: 'mint-weight', troyOuncesPerDollarFace: '0.6000' });
    expect(line.meltValue.amountMinor).toBe(18000); // 6.000 x 30.00
    expect(line.payout.amountMinor).toBe(15300);
    expect(line.paidOnFinenessExact).toBe('0.800');
  });

  it('every class prices on its counter basis when the line names none', () => {
    for (const cls of FACE_VALUE_CLASSES) {
      const line = priced(cls.coinClass, '1.00');
      expect(line.faceValue!.basis, cls.coinClass).toBe(cls.counterBasis);
      expect(line.fineWeightTroyOunces, cls.coinClass).toBe(Number(cls.troyOuncesPerDollarFace[cls.counterBasis]).toFixed(6));
    }
  });

  it('refuses a basis the class has no figure for, naming the one it has', () => {
    for (const coinClass of ['us-40', 'us-35', 'ca-80']) {
      expect(issues(coinClass, '1.00', 'common-practice'), coinClass).toEqual([
        { path: 'lines.0.basis', message: `${coinClass} has no common-practice figure; use mint-weight` },
      ]);
    }
    expect(issues('us-90', '1.00', 'worn')[0]).toMatchObject({ path: 'lines.0.basis', message: 'basis must be common-practice or mint-weight' });
  });

  it('refuses face value that the coins of the class cannot add up to', () => {
    expect(issues('us-40', '0.75')[0]).toMatchObject({ path: 'lines.0.faceValue', message: 'must be a multiple of 0.50 for us-40 coin' });
    expect(issues('us-35', '0.07')[0]!.path).toBe('lines.0.faceValue');
    expect(issues('ca-80', '1.03')[0]!.path).toBe('lines.0.faceValue');
  });
});
