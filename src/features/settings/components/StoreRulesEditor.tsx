import { useEffect, useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { DEFAULT_RATES, RATE_CATEGORIES, RATE_CATEGORY_LABELS, type RateCategory, type RateRule } from '@/features/pricing/rates';
import { ID_TYPE_LABELS } from '@/features/sellers/sellers';
import { parseMark } from '@/features/pricing/marks';

interface Definition {
  type: 'integer' | 'decimal' | 'boolean' | 'string' | 'json';
  label: string;
  help: string;
  default: unknown;
}
interface SettingsAnswer {
  storeId: string;
  values: Record<string, unknown>;
  definitions: Record<string, Definition>;
}

const RATE_LABELS = RATE_CATEGORY_LABELS;

const SIMPLE_KEYS = [
  'seller.minimum_age_years',
  'seller.expired_id_blocks',
  'seller.accepted_id_types',
  'hold.period_days',
  'spot.stale_after_minutes',
  'spot.clerks_may_enter',
  'cash.limit_per_ticket',
  'rates.clerk_raise_limit_points',
  'counter.ownership_statement',
];

/** Managers set the store's rules, payout rates and paid-on finenesses; every change is audited. */
export default function StoreRulesEditor({ storeId }: { storeId: string }) {
  const url = `/api/stores/${storeId}/settings`;
  const { data, mutate } = useSWR(url, (u: string) => fetchJson<SettingsAnswer>(u));
  const [messages, setMessages] = useState<Record<string, { ok: boolean; text: string }>>({});

  async function save(key: string, value: unknown) {
    setMessages((m) => ({ ...m, [key]: { ok: true, text: 'Saving…' } }));
    try {
      const answer = await fetchJson<SettingsAnswer>(url, { method: 'PUT', body: JSON.stringify({ key, value }) });
      await mutate({ ...data!, values: answer.values }, { revalidate: false });
      setMessages((m) => ({ ...m, [key]: { ok: true, text: 'Saved.' } }));
    } catch (err) {
      const text = err instanceof ApiError ? [err.message, ...err.issues.map((i) => `${i.path}: ${i.message}`)].filter((v, i, a) => a.indexOf(v) === i).join(' ') : String(err);
      setMessages((m) => ({ ...m, [key]: { ok: false, text } }));
    }
  }

  if (!data) return <p className="text-ink-600">Loading the store's rules…</p>;
  return (
    <div className="space-y-6">
      <section className="card" aria-labelledby="rules-heading">
        <h2 id="rules-heading" className="text-lg font-bold">
          Counter rules
        </h2>
        <p className="text-sm text-ink-600">Rules that the law decides differ by place: set them as local law and licensed practice require.</p>
        <div className="mt-4 space-y-5">
          {SIMPLE_KEYS.map((key) => (
            <SettingField key={key} settingKey={key} def={data.definitions[key]!} value={data.values[key]} onSave={save} message={messages[key]} />
          ))}
        </div>
      </section>
      <RatesEditor value={(data.values['pricing.rates'] ?? {}) as Partial<Record<RateCategory, RateRule>>} onSave={(v) => save('pricing.rates', v)} message={messages['pricing.rates']} />
      <FinenessEditor value={(data.values['pricing.assumed_fineness'] ?? {}) as Record<string, string>} onSave={(v) => save('pricing.assumed_fineness', v)} message={messages['pricing.assumed_fineness']} />
    </div>
  );
}

function Message({ message }: { message?: { ok: boolean; text: string } }) {
  if (!message) return null;
  return (
    <p role={message.ok ? 'status' : 'alert'} className={message.ok ? 'mt-1 text-sm font-semibold text-emerald-800' : 'field-error'}>
      {message.text}
    </p>
  );
}

function SettingField({
  settingKey,
  def,
  value,
  onSave,
  message,
}: {
  settingKey: string;
  def: Definition;
  value: unknown;
  onSave: (key: string, value: unknown) => Promise<void>;
  message?: { ok: boolean; text: string };
}) {
  const [draft, setDraft] = useState<unknown>(value);
  useEffect(() => setDraft(value), [value]);
  const id = `setting-${settingKey.replace(/\W/g, '-')}`;
  let control;
  if (def.type === 'boolean') {
    control = (
      <label className="mt-1 flex items-center gap-2">
        <input id={id} type="checkbox" checked={!!draft} onChange={(e) => setDraft(e.target.checked)} /> {draft ? 'Yes' : 'No'}
      </label>
    );
  } else if (settingKey === 'seller.accepted_id_types') {
    const list = (draft as string[]) ?? [];
    control = (
      <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1" id={id}>
        {Object.entries(ID_TYPE_LABELS).map(([v, label]) => (
          <label key={v} className="flex items-center gap-1">
            <input type="checkbox" checked={list.includes(v)} onChange={(e) => setDraft(e.target.checked ? [...list, v] : list.filter((x) => x !== v))} /> {label}
          </label>
        ))}
      </div>
    );
  } else if (settingKey === 'counter.ownership_statement') {
    control = <textarea id={id} className="field-input" rows={3} value={String(draft ?? '')} onChange={(e) => setDraft(e.target.value)} />;
  } else {
    control = <input id={id} className="field-input max-w-xs" inputMode="decimal" value={String(draft ?? '')} onChange={(e) => setDraft(e.target.value)} />;
  }
  const toSave = () => (def.type === 'integer' && /^-?\d+$/.test(String(draft).trim()) ? Number(String(draft).trim()) : draft);
  return (
    <div>
      <label className="field-label" htmlFor={id}>
        {def.label}
      </label>
      <p className="text-xs text-ink-600">{def.help}</p>
      <div className="flex flex-wrap items-end gap-2">
        <div className="min-w-0 flex-1">{control}</div>
        <button type="button" className="btn-quiet" onClick={() => void onSave(settingKey, toSave())}>
          Save
        </button>
      </div>
      <Message message={message} />
    </div>
  );
}

function RatesEditor({ value, onSave, message }: { value: Partial<Record<RateCategory, RateRule>>; onSave: (v: unknown) => Promise<void>; message?: { ok: boolean; text: string } }) {
  const [draft, setDraft] = useState(value);
  useEffect(() => setDraft(value), [value]);
  const set = (c: RateCategory, rule: RateRule | undefined) =>
    setDraft((d) => {
      const next = { ...d };
      if (rule) next[c] = rule;
      else delete next[c];
      return next;
    });
  return (
    <section className="card" aria-labelledby="rates-heading">
      <h2 id="rates-heading" className="text-lg font-bold">
        Payout rates
      </h2>
      <p className="text-sm text-ink-600">A share of melt value, or an amount under spot per troy ounce (usual for bullion). A category left on "Cupel default" pays the default shown (common practice, not advice).</p>
      <table className="mt-3 w-full text-left text-sm">
        <thead className="text-ink-600">
          <tr>
            <th className="py-1">Category</th>
            <th>Paid as</th>
            <th>Value</th>
          </tr>
        </thead>
        <tbody>
          {RATE_CATEGORIES.map((c) => {
            const rule = draft[c];
            const fallback = DEFAULT_RATES[c];
            const basis = rule?.basis ?? 'default';
            return (
              <tr key={c} className="border-t border-ink-100">
                <td className="py-1.5">{RATE_LABELS[c]}</td>
                <td>
                  <label className="sr-only" htmlFor={`basis-${c}`}>
                    {RATE_LABELS[c]}: paid as
                  </label>
                  <select
                    id={`basis-${c}`}
                    className="field-input mt-0 py-1"
                    value={basis}
                    onChange={(e) => {
                      const b = e.target.value;
                      if (b === 'default') set(c, undefined);
                      else if (b === 'percent-of-melt') set(c, { basis: 'percent-of-melt', percent: fallback.basis === 'percent-of-melt' ? fallback.percent : '80' });
                      else set(c, { basis: 'under-spot', amountPerTroyOunce: '0.00' });
                    }}
                  >
                    <option value="default">Cupel default ({fallback.basis === 'percent-of-melt' ? `${fallback.percent}% of melt` : `${fallback.amountPerTroyOunce} under spot`})</option>
                    <option value="percent-of-melt">% of melt value</option>
                    <option value="under-spot">Amount under spot per ozt</option>
                  </select>
                </td>
                <td>
                  {rule && (
                    <>
                      <label className="sr-only" htmlFor={`rate-${c}`}>
                        {RATE_LABELS[c]}: {rule.basis === 'percent-of-melt' ? 'percent of melt' : 'amount under spot'}
                      </label>
                      <input
                        id={`rate-${c}`}
                        className="field-input mt-0 w-28 py-1"
                        inputMode="decimal"
                        value={rule.basis === 'percent-of-melt' ? rule.percent : rule.amountPerTroyOunce}
                        onChange={(e) => set(c, rule.basis === 'percent-of-melt' ? { basis: 'percent-of-melt', percent: e.target.value } : { basis: 'under-spot', amountPerTroyOunce: e.target.value })}
                      />
                    </>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <button type="button" className="btn-primary mt-3" onClick={() => void onSave(draft)}>
        Save payout rates
      </button>
      <Message message={message} />
    </section>
  );
}

function FinenessEditor({ value, onSave, message }: { value: Record<string, string>; onSave: (v: unknown) => Promise<void>; message?: { ok: boolean; text: string } }) {
  const [rows, setRows] = useState<[string, string][]>(Object.entries(value));
  useEffect(() => setRows(Object.entries(value)), [value]);
  return (
    <section className="card" aria-labelledby="fineness-heading">
      <h2 id="fineness-heading" className="text-lg font-bold">
        Paid-on fineness by mark
      </h2>
      <p className="text-sm text-ink-600">
        Marked items often assay a little under their mark; US law allows small tolerances (15 U.S.C. 295). Name a mark (14K, 585, STERLING…) and the fineness the store pays it on; it may not be above the mark. Quotes show both.
      </p>
      <ul className="mt-3 space-y-2">
        {rows.map(([mark, fineness], i) => (
          <li key={i} className="flex flex-wrap items-end gap-2">
            <div>
              <label className="field-label" htmlFor={`af-mark-${i}`}>
                Mark
              </label>
              <input id={`af-mark-${i}`} className="field-input w-32" value={mark} onChange={(e) => setRows((r) => r.map((row, j) => (j === i ? [e.target.value, row[1]] : row)))} />
            </div>
            <div>
              <label className="field-label" htmlFor={`af-fine-${i}`}>
                Pay on fineness
              </label>
              <input id={`af-fine-${i}`} className="field-input w-32" inputMode="decimal" value={fineness} onChange={(e) => setRows((r) => r.map((row, j) => (j === i ? [row[0], e.target.value] : row)))} />
            </div>
            <button type="button" className="btn-quiet" onClick={() => setRows((r) => r.filter((_, j) => j !== i))}>
              Remove
            </button>
          </li>
        ))}
      </ul>
      <div className="mt-3 flex gap-2">
        <button type="button" className="btn-quiet" onClick={() => setRows((r) => [...r, ['', '']])}>
          Add a mark
        </button>
        <button type="button" className="btn-primary" onClick={() => void onSave(Object.fromEntries(rows.filter(([m]) => m.trim()).map(([m, f]) => [parseMark(m).key ?? m.trim().toUpperCase(), f.trim()])))}>
          Save paid-on finenesses
        </button>
      </div>
      <Message message={message} />
    </section>
  );
}
