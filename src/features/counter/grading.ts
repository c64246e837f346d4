import { TEST_METHODS, type TestMethod } from '@/db/enums';
import type { Metal } from '@/features/pricing/metals';
import type { WeightUnit } from '@/features/pricing/units';
import type { LineCategory } from '@/features/pricing/rates';
import { DECIMAL_PATTERN } from '@/features/pricing/decimal';
import { counterFaceValueBasis, type FaceValueBasis } from '@/features/pricing/coins';

export { TEST_METHODS };

/**
 * A line as the clerk types it: every field a string, so a half-typed value never becomes a number.
 * `toCounterLine` turns it into the engine's input; an incomplete line gives a prompt instead.
 */
export interface GradingLine {
  key: string;
  kind: 'weight' | 'coin' | 'face-value' | 'fine-weight';
  category: LineCategory;
  metal: '' | Metal;
  mark: string;
  testedFineness: string;
  grossValue: string;
  grossUnit: WeightUnit;
  tareValue: string;
  deductionGrams: string;
  deductionPercent: string;
  deductionReason: string;
  coinType: string;
  count: string;
  coinClass: string;
  faceValue: string;
  /** The clerk's choice of basis for face value; '' is the class's counter basis. */
  faceBasis: '' | FaceValueBasis;
  fineValue: string;
  description: string;
  testMethod: TestMethod;
  testResult: string;
  note: string;
  raisePoints: string;
}

let keySeq = 0;
export function newGradingLine(overrides: Partial<GradingLine> = {}): GradingLine {
  keySeq += 1;
  return {
    key: `line-${Date.now().toString(36)}-${keySeq}`,
    kind: 'weight',
    category: 'jewelry',
    metal: '',
    mark: '',
    testedFineness: '',
    grossValue: '',
    grossUnit: 'g',
    tareValue: '',
    deductionGrams: '',
    deductionPercent: '',
    deductionReason: '',
    coinType: 'us-90-dime',
    count: '',
    coinClass: 'us-90',
    faceValue: '',
    faceBasis: '',
    fineValue: '',
    description: '',
    testMethod: 'none',
    testResult: '',
    note: '',
    raisePoints: '',
    ...overrides,
  };
}

const filled = (v: string) => v.trim() !== '';
const isDecimal = (v: string) => DECIMAL_PATTERN.test(v.trim());

export type CounterLinePayload = {
  item: Record<string, unknown>;
  testMethod: TestMethod;
  testResult: string | null;
  note: string | null;
  raisePoints: string;
};

/** The engine's input for a line, or what the clerk still has to enter. */
export function toCounterLine(line: GradingLine): { ok: true; payload: CounterLinePayload } | { ok: false; prompt: string } {
  const description = line.description.trim() || undefined;
  let item: Record<string, unknown>;
  switch (line.kind) {
    case 'weight': {
      if (!filled(line.grossValue)) return { ok: false, prompt: 'Enter the gross weight' };
      if (!filled(line.mark) && !filled(line.testedFineness)) return { ok: false, prompt: 'Enter the mark or a tested fineness' };
      const deductions: Record<string, unknown>[] = [];
      if (filled(line.deductionGrams)) deductions.push({ kind: 'grams', value: line.deductionGrams.trim(), reason: line.deductionReason.trim() || undefined });
      if (filled(line.deductionPercent)) deductions.push({ kind: 'percent', value: line.deductionPercent.trim(), reason: line.deductionReason.trim() || undefined });
      item = {
        kind: 'weight',
        category: line.category,
        ...(filled(line.mark) ? { mark: line.mark.trim() } : {}),
        ...(filled(line.testedFineness) ? { fineness: line.testedFineness.trim() } : {}),
        ...(line.metal ? { metal: line.metal } : {}),
        grossWeight: { value: line.grossValue.trim(), unit: line.grossUnit },
        ...(filled(line.tareValue) ? { tare: { value: line.tareValue.trim(), unit: line.grossUnit } } : {}),
        deductions,
        description,
      };
      break;
    }
    case 'coin':
      if (!filled(line.count)) return { ok: false, prompt: 'Enter how many coins' };
      item = { kind: 'coin', coinType: line.coinType, count: line.count.trim(), description };
      break;
    case 'face-value':
      if (!filled(line.faceValue)) return { ok: false, prompt: 'Enter the face value' };
      // Always a basis the class has a figure for, so the line is priced and the ticket records which basis priced it.
      item = { kind: 'face-value', coinClass: line.coinClass, faceValue: line.faceValue.trim(), basis: counterFaceValueBasis(line.coinClass, line.faceBasis || undefined), description };
      break;
    case 'fine-weight':
      if (!line.metal) return { ok: false, prompt: 'Choose the metal' };
      if (!filled(line.fineValue)) return { ok: false, prompt: 'Enter the assayed fine weight' };
      item = { kind: 'fine-weight', metal: line.metal, category: line.category, fineWeight: { value: line.fineValue.trim(), unit: line.grossUnit }, description };
      break;
  }
  if (filled(line.raisePoints) && !isDecimal(line.raisePoints)) return { ok: false, prompt: 'Raise must be a number of points, like 2.5' };
  return {
    ok: true,
    payload: {
      item,
      testMethod: line.testMethod,
      testResult: line.testResult.trim() || null,
      note: line.note.trim() || null,
      raisePoints: line.raisePoints.trim() || '0',
    },
  };
}

/** A saved line's input back into the fields the clerk edits. */
export function fromCounterLine(input: CounterLinePayload): GradingLine {
  const item = input.item as Record<string, any>;
  const grams = (item.deductions ?? []).find((d: { kind: string }) => d.kind === 'grams');
  const percent = (item.deductions ?? []).find((d: { kind: string }) => d.kind === 'percent');
  return newGradingLine({
    kind: item.kind,
    category: item.category ?? (item.kind === 'coin' ? 'coin' : 'jewelry'),
    metal: item.metal ?? '',
    mark: item.mark ?? '',
    testedFineness: item.fineness ?? '',
    grossValue: item.grossWeight?.value ?? '',
    grossUnit: item.grossWeight?.unit ?? item.fineWeight?.unit ?? 'g',
    tareValue: item.tare?.value ?? '',
    deductionGrams: grams?.value ?? '',
    deductionPercent: percent?.value ?? '',
    deductionReason: grams?.reason ?? percent?.reason ?? '',
    coinType: item.coinType ?? 'us-90-dime',
    count: item.count !== undefined ? String(item.count) : '',
    coinClass: item.coinClass ?? 'us-90',
    faceValue: item.faceValue ?? '',
    faceBasis: item.basis ?? '',
    fineValue: item.fineWeight?.value ?? '',
    description: item.description ?? '',
    testMethod: input.testMethod ?? 'none',
    testResult: input.testResult ?? '',
    note: input.note ?? '',
    raisePoints: input.raisePoints && input.raisePoints !== '0' ? input.raisePoints : '',
  });
}
