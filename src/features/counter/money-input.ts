import { Dec } from '@/features/pricing/decimal';

/** An amount typed by staff ("250.00") in integer minor units, exactly; more decimals than the currency has are refused upstream by the schema. */
export function decimalToMinor(amount: string, exponent: number): number {
  const minor = new Dec(amount.trim()).mul(new Dec(10).pow(exponent));
  if (!minor.isInteger()) throw new Error(`amount ${amount} has more than ${exponent} decimals`);
  return minor.toNumber();
}
