import { memo } from 'react';
import { parseMark } from '@/features/pricing/marks';
import { COIN_CATALOGUE, FACE_VALUE_CLASSES, coinSpec, faceValueBases, faceValueClass, type FaceValueBasis } from '@/features/pricing/coins';
import { LINE_CATEGORIES } from '@/features/pricing/rates';
import { METALS, METAL_LABELS } from '@/features/pricing/metals';
import { TEST_METHOD_LABELS } from '../counter';
import { TEST_METHODS, type GradingLine } from '../grading';

interface Props {
  index: number;
  line: GradingLine;
  onChange: (key: string, patch: Partial<GradingLine>) => void;
  onRemove: (key: string) => void;
  disabled: boolean;
  /** `basis`: for face value, how the line was counted ("0.715 ozt per 1.00 face, circulated, common practice"). */
  summary: { payout: string | null; melt: string | null; problem: string | null; fineWeight: string | null; basis?: string | null };
}

const CATEGORY_LABELS: Record<string, string> = {
  jewelry: 'Jewelry',
  scrap: 'Scrap',
  dental: 'Dental',
  flatware: 'Flatware',
  hollowware: 'Hollowware',
  coin: 'Coin',
  bullion: 'Bullion',
};

/** The coin list grouped by issuer, in catalogue order. */
const COINS_BY_ISSUER: [string, (typeof COIN_CATALOGUE)[number][]][] = [];
for (const c of COIN_CATALOGUE) {
  const group = COINS_BY_ISSUER.find(([issuer]) => issuer === c.issuer);
  if (group) group[1].push(c);
  else COINS_BY_ISSUER.push([c.issuer, [c]]);
}

const BASIS_CHOICES: Record<FaceValueBasis, string> = {
  'common-practice': 'Circulated (common practice)',
  'mint-weight': 'Mint weight (uncirculated)',
};

/** One graded item. Field order follows the clerk's work: what it is, its mark, the test, the scale. */
function LineEditorImpl({ index, line, onChange, onRemove, disabled, summary }: Props) {
  const id = (f: string) => `l${index}-${f}`;
  const set = (patch: Partial<GradingLine>) => onChange(line.key, patch);
  const reading = line.kind === 'weight' && line.mark.trim() ? parseMark(line.mark) : null;
  const faceClass = line.kind === 'face-value' ? faceValueClass(line.coinClass) : undefined;
  const faceBases = faceClass ? faceValueBases(faceClass) : [];
  const coinNote = line.kind === 'coin' ? coinSpec(line.coinType)?.note : line.kind === 'face-value' ? faceClass?.note : undefined;

  return (
    <fieldset className="rounded-lg border border-ink-200 bg-white p-4" data-testid={`line-${index + 1}`} disabled={disabled}>
      <legend className="px-1 text-sm font-bold text-ink-700">Line {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-6">
        <div>
          <label className="field-label" htmlFor={id('kind')}>
            Priced by
          </label>
          <select id={id('kind')} className="field-input" value={line.kind} onChange={(e) => set({ kind: e.target.value as GradingLine['kind'] })}>
            <option value="weight">Weight and mark</option>
            <option value="coin">Coin or bullion count</option>
            <option value="face-value">Coin by face value</option>
            <option value="fine-weight">Assayed fine weight</option>
          </select>
        </div>
        {(line.kind === 'weight' || line.kind === 'fine-weight') && (
          <div>
            <label className="field-label" htmlFor={id('category')}>
              Category
            </label>
            <select id={id('category')} className="field-input" value={line.category} onChange={(e) => set({ category: e.target.value as GradingLine['category'] })}>
              {LINE_CATEGORIES.map((c) => (
                <option key={c} value={c}>
                  {CATEGORY_LABELS[c] ?? c}
                </option>
              ))}
            </select>
          </div>
        )}
        {line.kind === 'weight' && (
          <>
            <div className="md:col-span-2">
              <label className="field-label" htmlFor={id('mark')}>
                Mark
              </label>
              <input
                id={id('mark')}
                className="field-input"
                value={line.mark}
                placeholder="14K, 925, STERLING, PT950…"
                autoComplete="off"
                onChange={(e) => set({ mark: e.target.value })}
                aria-describedby={id('reading')}
              />
              <p id={id('reading')} className="mt-1 text-sm" aria-live="polite" data-testid={`line-${index + 1}-reading`}>
                {reading ? <MarkReadingText reading={reading} /> : <span className="text-ink-400">The reading appears as you type</span>}
              </p>
            </div>
            <MetalSelect id={id('metal')} value={line.metal} onChange={(metal) => set({ metal })} blankLabel="From the mark" />
            <div>
              <label className="field-label" htmlFor={id('tested')}>
                Tested fineness
              </label>
              <input id={id('tested')} className="field-input" inputMode="decimal" placeholder="e.g. 0.585" value={line.testedFineness} onChange={(e) => set({ testedFineness: e.target.value })} />
            </div>
          </>
        )}
        {line.kind === 'fine-weight' && (
          <MetalSelect id={id('metal')} value={line.metal} onChange={(metal) => set({ metal })} blankLabel="Choose…" />
        )}
        {line.kind === 'coin' && (
          <>
            <div className="md:col-span-3">
              <label className="field-label" htmlFor={id('coin')}>
                Coin or bullion type
              </label>
              <select id={id('coin')} className="field-input" value={line.coinType} onChange={(e) => set({ coinType: e.target.value })}>
                {COINS_BY_ISSUER.map(([issuer, coins]) => (
                  <optgroup key={issuer} label={issuer}>
                    {coins.map((c) => (
                      <option key={c.coinType} value={c.coinType}>
                        {c.label}
                      </option>
                    ))}
                  </optgroup>
                ))}
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor={id('count')}>
                Count
              </label>
              <input id={id('count')} className="field-input" inputMode="numeric" value={line.count} onChange={(e) => set({ count: e.target.value })} />
            </div>
          </>
        )}
        {line.kind === 'face-value' && (
          <>
            <div className="md:col-span-3">
              <label className="field-label" htmlFor={id('class')}>
                Coin class
              </label>
              <select id={id('class')} className="field-input" value={line.coinClass} onChange={(e) => set({ coinClass: e.target.value })}>
                {FACE_VALUE_CLASSES.map((c) => (
                  <option key={c.coinClass} value={c.coinClass}>
                    {c.label}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor={id('face')}>
                Face value
              </label>
              <input id={id('face')} className="field-input" inputMode="decimal" placeholder="5.00" value={line.faceValue} onChange={(e) => set({ faceValue: e.target.value })} />
            </div>
            {faceBases.length > 1 && (
              <div className="md:col-span-2">
                <label className="field-label" htmlFor={id('basis')}>
                  Counted at
                </label>
                <select id={id('basis')} className="field-input" value={line.faceBasis || faceBases[0]} onChange={(e) => set({ faceBasis: e.target.value as GradingLine['faceBasis'] })}>
                  {faceBases.map((b) => (
                    <option key={b} value={b}>
                      {BASIS_CHOICES[b]}
                    </option>
                  ))}
                </select>
              </div>
            )}
          </>
        )}
        {coinNote && (
          <p className="text-sm text-ink-600 md:col-span-6" data-testid={`line-${index + 1}-coin-note`}>
            {coinNote}
          </p>
        )}
      </div>

      {(line.kind === 'weight' || line.kind === 'fine-weight') && (
        <div className="mt-3 grid gap-3 md:grid-cols-6">
          {line.kind === 'weight' ? (
            <>
              <div>
                <label className="field-label" htmlFor={id('gross')}>
                  Gross weight
                </label>
                <input id={id('gross')} className="field-input" inputMode="decimal" value={line.grossValue} onChange={(e) => set({ grossValue: e.target.value })} />
              </div>
              <div>
                <label className="field-label" htmlFor={id('tare')}>
                  Tare
                </label>
                <input id={id('tare')} className="field-input" inputMode="decimal" value={line.tareValue} onChange={(e) => set({ tareValue: e.target.value })} />
              </div>
            </>
          ) : (
            <div>
              <label className="field-label" htmlFor={id('fine')}>
                Fine weight (assay)
              </label>
              <input id={id('fine')} className="field-input" inputMode="decimal" value={line.fineValue} onChange={(e) => set({ fineValue: e.target.value })} />
            </div>
          )}
          <div>
            <label className="field-label" htmlFor={id('unit')}>
              Unit
            </label>
            <select id={id('unit')} className="field-input" value={line.grossUnit} onChange={(e) => set({ grossUnit: e.target.value as GradingLine['grossUnit'] })}>
              <option value="g">grams</option>
              <option value="dwt">pennyweight</option>
              <option value="ozt">troy ounces</option>
              <option value="gr">grains</option>
              <option value="kg">kilograms</option>
            </select>
          </div>
          {line.kind === 'weight' && (
            <>
              <div>
                <label className="field-label" htmlFor={id('dg')}>
                  Deduct (g)
                </label>
                <input id={id('dg')} className="field-input" inputMode="decimal" value={line.deductionGrams} onChange={(e) => set({ deductionGrams: e.target.value })} />
              </div>
              <div>
                <label className="field-label" htmlFor={id('dp')}>
                  Deduct (%)
                </label>
                <input id={id('dp')} className="field-input" inputMode="decimal" value={line.deductionPercent} onChange={(e) => set({ deductionPercent: e.target.value })} />
              </div>
              <div>
                <label className="field-label" htmlFor={id('dr')}>
                  Deduction for
                </label>
                <input id={id('dr')} className="field-input" placeholder="stones, fill, blades" value={line.deductionReason} onChange={(e) => set({ deductionReason: e.target.value })} />
              </div>
            </>
          )}
        </div>
      )}

      <div className="mt-3 grid gap-3 md:grid-cols-6">
        <div>
          <label className="field-label" htmlFor={id('test')}>
            Test done
          </label>
          <select id={id('test')} className="field-input" value={line.testMethod} onChange={(e) => set({ testMethod: e.target.value as GradingLine['testMethod'] })}>
            {TEST_METHODS.map((t) => (
              <option key={t} value={t}>
                {TEST_METHOD_LABELS[t]}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field-label" htmlFor={id('result')}>
            Test result
          </label>
          <input id={id('result')} className="field-input" value={line.testResult} onChange={(e) => set({ testResult: e.target.value })} />
        </div>
        <div className="md:col-span-2">
          <label className="field-label" htmlFor={id('desc')}>
            Description
          </label>
          <input id={id('desc')} className="field-input" value={line.description} onChange={(e) => set({ description: e.target.value })} />
        </div>
        <div>
          <label className="field-label" htmlFor={id('raise')}>
            Raise rate (points)
          </label>
          <input id={id('raise')} className="field-input" inputMode="decimal" placeholder="0" value={line.raisePoints} onChange={(e) => set({ raisePoints: e.target.value })} />
        </div>
        <div className="flex items-end">
          <button type="button" className="btn-quiet w-full" onClick={() => onRemove(line.key)} aria-label={`Remove line ${index + 1}`}>
            Remove
          </button>
        </div>
      </div>
      <div className="mt-2">
        <label className="field-label" htmlFor={id('note')}>
          Note
        </label>
        <input id={id('note')} className="field-input" value={line.note} onChange={(e) => set({ note: e.target.value })} />
      </div>
      <p className="mt-3 text-sm" data-testid={`line-${index + 1}-figures`} aria-live="polite">
        {summary.problem ? (
          <span className="font-semibold text-red-800">{summary.problem}</span>
        ) : (
          <>
            Fine weight <strong>{summary.fineWeight}</strong> · melt <strong>{summary.melt}</strong> · pays <strong>{summary.payout}</strong>
            {summary.basis && <span data-testid={`line-${index + 1}-basis`}> · counted at {summary.basis}</span>}
          </>
        )}
      </p>
    </fieldset>
  );
}

function MetalSelect({ id, value, onChange, blankLabel }: { id: string; value: GradingLine['metal']; onChange: (metal: GradingLine['metal']) => void; blankLabel: string }) {
  return (
    <div>
      <label className="field-label" htmlFor={id}>
        Metal
      </label>
      <select id={id} className="field-input" value={value} onChange={(e) => onChange(e.target.value as GradingLine['metal'])}>
        <option value="">{blankLabel}</option>
        {METALS.map((m) => (
          <option key={m} value={m}>
            {METAL_LABELS[m]}
          </option>
        ))}
      </select>
    </div>
  );
}

function MarkReadingText({ reading }: { reading: ReturnType<typeof parseMark> }) {
  switch (reading.kind) {
    case 'solid':
    case 'filled':
      return <span className="font-semibold text-emerald-800">{reading.label}</span>;
    case 'plated':
    case 'no-precious':
      return <span className="font-semibold text-red-800">{reading.label}: no buyable precious content</span>;
    default:
      return (
        <span className="font-semibold text-amber-800">
          {reading.label}
          {reading.reason === 'ambiguous-metal' && <> · could be {reading.candidates.map((c) => c.label).join(', ')}: test it or choose the metal</>}
          {reading.reason === 'marks-disagree' && <> · {reading.candidates.map((c) => c.label).join(', ')}: test it and enter the tested fineness</>}
          {reading.kind === 'needs-test' && reading.reason !== 'ambiguous-metal' && reading.reason !== 'marks-disagree' && <> · test it and enter the tested fineness</>}
        </span>
      );
  }
}

export const LineEditor = memo(LineEditorImpl);
