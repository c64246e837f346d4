import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';
import { convertWeight, type WeightUnit } from '@/features/pricing/units';
import type { PricedLine } from '@/features/pricing/pricing';
import type { Metal } from '@/features/pricing/metals';
import { ACID_TEST_CAUTIONS, displaySpot } from '../counter';
import { fromCounterLine, newGradingLine, toCounterLine, type GradingLine } from '../grading';
import { faceValueBasisLine, offerPercentages, priceTicket } from '../ticket-pricing';
import type { WorkbenchData } from '../workbench.server';
import { LineEditor } from './LineEditor';
import { SignaturePad } from './SignaturePad';
import { PhotoStrip } from '@/features/photos/components/PhotoStrip';
import { ScaleControl } from '@/features/scale/components/ScaleControl';

interface Props {
  initial: WorkbenchData;
  /** Offered only when the server is configured with a simulated scale (tests, the local demo). */
  simulatedScaleUrl?: string | null;
}

const SHOW_UNITS: { unit: WeightUnit; label: string }[] = [
  { unit: 'g', label: 'g' },
  { unit: 'dwt', label: 'dwt' },
  { unit: 'ozt', label: 'ozt' },
];

/** Live pricing of what is on screen, with the same engine and the same per-line rounding as the server. */
export function useLivePricing(lines: GradingLine[], data: WorkbenchData, ticketRaisePoints: string) {
  return useMemo(() => {
    const spot: Partial<Record<Metal, string>> = {};
    for (const [metal, s] of Object.entries(data.spot)) spot[metal as Metal] = s!.pricePerTroyOunce;
    const converted = lines.map(toCounterLine);
    const ready = converted.flatMap((c, i) => (c.ok ? [{ i, payload: c.payload }] : []));
    const priced = priceTicket({
      currency: data.ticket.currency as CurrencyCode,
      spot,
      rates: data.settings.rates,
      assumedFineness: data.settings.assumedFineness,
      ticketRaisePoints: /^\d+(\.\d+)?$/.test(ticketRaisePoints.trim()) ? ticketRaisePoints.trim() : '0',
      lines: ready.map((r) => ({ item: r.payload.item, raisePoints: r.payload.raisePoints })),
    });
    const perLine = lines.map((_, i) => {
      const c = converted[i]!;
      if (!c.ok) return { result: null as PricedLine | null, problem: c.prompt };
      const p = priced.lines[ready.findIndex((r) => r.i === i)]!;
      const issue = p.inputIssues[0];
      if (issue) return { result: null, problem: `${issue.path ? `${issue.path}: ` : ''}${issue.message}` };
      if (p.problem || p.raiseError) return { result: null, problem: p.problem ?? p.raiseError };
      return { result: p.result as PricedLine, problem: null };
    });
    return { perLine, totals: priced, payloads: converted };
  }, [lines, data, ticketRaisePoints]);
}

export default function TicketWorkbench({ initial, simulatedScaleUrl = null }: Props) {
  const { data, mutate } = useSWR<WorkbenchData>(`/api/tickets/${initial.ticket.id}/workbench`, (u: string) => fetchJson<WorkbenchData>(u), {
    fallbackData: initial,
    revalidateOnFocus: true,
    // While an electronic payout is on its way, or the seller is setting up their account, look again every few seconds.
    refreshInterval: (latest) =>
      latest?.ticket.payments.some((p) => p.state === 'pending') || (latest?.ticket.state === 'accepted' && latest.seller.payoutAccount.onboardingUrl) ? 2000 : 0,
  });
  const d = data ?? initial;
  const currency = d.ticket.currency as CurrencyCode;
  const fmt = (minor: number) => moneyOf(minor, currency).formatted;
  const editable = d.ticket.state === 'draft' || d.ticket.state === 'quoted';

  const [lines, setLines] = useState<GradingLine[]>(() => initialLines(initial));
  const [ticketRaise, setTicketRaise] = useState(() => (Number(initial.ticket.ticketRaisePoints) ? initial.ticket.ticketRaisePoints : ''));
  const [dirty, setDirty] = useState(false);
  const [busy, setBusy] = useState<string | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const [showUnit, setShowUnit] = useState<WeightUnit>('g');
  const [signature, setSignature] = useState<string | null>(null);
  const [agrees, setAgrees] = useState(false);
  const [signing, setSigning] = useState(false);
  const [payMethod, setPayMethod] = useState<'cash' | 'check' | 'electronic'>('cash');
  const [checkNumber, setCheckNumber] = useState('');
  const [instant, setInstant] = useState(false);
  const [voidReason, setVoidReason] = useState('');
  const [managerEmail, setManagerEmail] = useState('');
  const [managerPassword, setManagerPassword] = useState('');
  const focusKey = useRef<string | null>(null);

  const live = useLivePricing(lines, d, ticketRaise);

  useEffect(() => {
    if (!focusKey.current) return;
    document.getElementById(`${focusKey.current}`)?.querySelector<HTMLElement>('select, input')?.focus();
    focusKey.current = null;
  });

  const change = useCallback((key: string, patch: Partial<GradingLine>) => {
    setLines((ls) => ls.map((l) => (l.key === key ? { ...l, ...patch } : l)));
    setDirty(true);
  }, []);
  const remove = useCallback((key: string) => {
    setLines((ls) => ls.filter((l) => l.key !== key));
    setDirty(true);
  }, []);
  const addLine = useCallback((overrides: Partial<GradingLine> = {}) => {
    const line = newGradingLine(overrides);
    focusKey.current = `wrap-${line.key}`;
    setLines((ls) => [...ls, line]);
    setDirty(true);
  }, []);

  async function run(label: string, fn: () => Promise<unknown>, success?: string) {
    setBusy(label);
    setMessage(null);
    try {
      await fn();
      const fresh = await mutate();
      if (fresh && !(fresh.ticket.state === 'draft' || fresh.ticket.state === 'quoted')) setDirty(false);
      if (success) setMessage({ tone: 'ok', text: success });
      return true;
    } catch (err) {
      setMessage({ tone: 'error', text: err instanceof ApiError ? err.message : String(err) });
      return false;
    } finally {
      setBusy(null);
    }
  }

  async function save() {
    const incomplete = live.payloads.findIndex((p) => !p.ok);
    if (incomplete >= 0) {
      const p = live.payloads[incomplete]!;
      setMessage({ tone: 'error', text: `Line ${incomplete + 1}: ${!p.ok ? p.prompt : ''}` });
      return false;
    }
    const body = {
      lines: live.payloads.map((p) => (p.ok ? p.payload : null)),
      ticketRaisePoints: ticketRaise.trim() || '0',
    };
    const ok = await run('save', () => fetchJson(`/api/tickets/${d.ticket.id}/lines`, { method: 'PUT', body: JSON.stringify(body) }), 'Saved and priced by the server.');
    if (ok) setDirty(false);
    return ok;
  }

  async function showOffer() {
    if (dirty && !(await save())) return;
    await run('quote', () => fetchJson(`/api/tickets/${d.ticket.id}/quote`, { method: 'POST' }), 'Offer ready to show the seller.');
  }

  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (!e.altKey) return;
      if (e.key === 'n' || e.key === 'N') {
        e.preventDefault();
        if (editable) addLine();
      } else if (e.key === 's' || e.key === 'S') {
        e.preventDefault();
        if (editable) void save();
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const pendingApproval = d.ticket.approvals.find((a) => a.state === 'pending');
  const pendingPayout = d.ticket.payments.find((p) => p.kind === 'payout' && p.state === 'pending');
  const failedPayout = d.ticket.payments.filter((p) => p.kind === 'payout' && p.state === 'failed').at(-1);
  const shares = offerPercentages(live.totals.payoutMinor, live.totals.meltValueMinor);
  const marginPercent = shares?.margin ?? null;
  const payPercent = shares?.payout ?? null;
  const anyAcid = lines.some((l) => l.testMethod === 'acid');

  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
      <div className="space-y-4">
        <SellerPanel data={d} fmt={fmt} />
        {message && (
          <p role={message.tone === 'error' ? 'alert' : 'status'} className={message.tone === 'error' ? 'rounded-md border border-red-300 bg-red-50 px-3 py-2 font-semibold text-red-900' : 'rounded-md bg-emerald-50 px-3 py-2 font-semibold text-emerald-900'}>
            {message.text}
          </p>
        )}
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 className="text-xl font-bold">Items</h2>
          <p className="text-sm text-ink-600">
            Keyboard: <kbd className="rounded border px-1">Tab</kbd> moves through a line · <kbd className="rounded border px-1">Alt</kbd>+<kbd className="rounded border px-1">N</kbd> new line ·{' '}
            <kbd className="rounded border px-1">Alt</kbd>+<kbd className="rounded border px-1">S</kbd> save
          </p>
        </div>
        {editable && <ScaleControl lines={lines} onTake={change} disabled={!!busy} simulatedScaleUrl={simulatedScaleUrl} />}
        {lines.map((line, i) => (
          <div key={line.key} id={`wrap-${line.key}`} data-line-index={i}>
            <LineEditor
              index={i}
              line={line}
              onChange={change}
              onRemove={remove}
              disabled={!editable || !!busy}
              summary={{
                problem: live.perLine[i]!.problem,
                melt: live.perLine[i]!.result ? live.perLine[i]!.result!.meltValue.formatted : null,
                payout: live.perLine[i]!.result ? live.perLine[i]!.result!.payout.formatted : null,
                fineWeight: live.perLine[i]!.result ? showWeight(live.perLine[i]!.result!.fineWeightGrams, showUnit) : null,
                basis: faceValueBasisLine(live.perLine[i]!.result),
              }}
            />
          </div>
        ))}
        {editable && (
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn-quiet" onClick={() => addLine()} disabled={!!busy}>
              Add item by weight
            </button>
            <button type="button" className="btn-quiet" onClick={() => addLine({ kind: 'coin', category: 'coin' })} disabled={!!busy}>
              Add coins or bullion
            </button>
            <button type="button" className="btn-quiet" onClick={() => addLine({ kind: 'face-value', category: 'coin' })} disabled={!!busy}>
              Add coin by face value
            </button>
          </div>
        )}
        <section className="card" aria-label="Photos">
          <div className="grid gap-4 md:grid-cols-2">
            <PhotoStrip kind="item" ticketId={d.ticket.id} label="Item photos" />
            <PhotoStrip kind="id-document" sellerId={d.seller.id} label="Photo of the seller's ID" />
          </div>
        </section>
        <aside className="card border-amber-300 bg-amber-50" aria-labelledby="acid-caution" data-emphasis={anyAcid ? 'on' : 'off'}>
          <h3 id="acid-caution" className="font-bold text-amber-900">
            Testing safely
          </h3>
          <ul className="mt-1 list-disc pl-5 text-sm text-amber-950">
            {ACID_TEST_CAUTIONS.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </aside>
      </div>

      <aside className="space-y-4 xl:self-start" aria-label="Offer">
        <section className="card" aria-labelledby="offer-heading">
          <div className="flex items-center justify-between">
            <h2 id="offer-heading" className="text-lg font-bold">
              Offer
            </h2>
            <span className="rounded-full bg-ink-100 px-2 py-0.5 text-sm font-semibold" data-testid="ticket-state">
              {d.ticket.stateLabel}
            </span>
          </div>
          <dl className="mt-3 space-y-1" data-testid="live-totals">
            <div className="flex justify-between">
              <dt>Melt value</dt>
              <dd className="font-semibold" data-testid="total-melt">
                {fmt(live.totals.meltValueMinor)}
              </dd>
            </div>
            <div className="flex justify-between text-lg">
              <dt>We pay</dt>
              <dd className="font-bold" data-testid="total-payout">
                {fmt(live.totals.payoutMinor)}
              </dd>
            </div>
            <div className="flex justify-between text-ink-700">
              <dt>Store margin</dt>
              <dd data-testid="total-margin">
                {fmt(live.totals.marginMinor)}
                {marginPercent && ` (${marginPercent}%)`}
              </dd>
            </div>
          </dl>
          <p className="mt-3 rounded-md bg-crucible-50 p-2 text-sm" data-testid="margin-statement">
            Melt value {fmt(live.totals.meltValueMinor)}, we pay {fmt(live.totals.payoutMinor)}
            {payPercent ? ` (${payPercent}% of melt)` : ''}.
          </p>
          {dirty && editable && <p className="mt-2 text-sm font-semibold text-amber-800">Changes not saved yet: the server prices them when you save.</p>}
          <div className="mt-3">
            <span className="field-label">Show weights in</span>
            <div className="mt-1 flex gap-1" role="group" aria-label="Weight unit">
              {SHOW_UNITS.map((u) => (
                <button key={u.unit} type="button" aria-pressed={showUnit === u.unit} className={showUnit === u.unit ? 'btn-primary px-3 py-1' : 'btn-quiet px-3 py-1'} onClick={() => setShowUnit(u.unit)}>
                  {u.label}
                </button>
              ))}
            </div>
          </div>
          {editable && (
            <div className="mt-3">
              <label className="field-label" htmlFor="ticket-raise">
                Raise every line (points)
              </label>
              <input id="ticket-raise" className="field-input" inputMode="decimal" placeholder="0" value={ticketRaise} onChange={(e) => { setTicketRaise(e.target.value); setDirty(true); }} />
              <p className="mt-1 text-xs text-ink-600">Clerks may raise up to {d.settings.clerkRaiseLimitPoints} points; beyond that a manager approves.</p>
            </div>
          )}
        </section>

        <SpotPanel data={d} />

        {pendingApproval && (
          <section className="card border-amber-400" aria-labelledby="approval-heading">
            <h2 id="approval-heading" className="font-bold">
              Manager approval needed
            </h2>
            <p className="text-sm">A raise of {pendingApproval.raisePoints} points is over the clerk limit.</p>
            {d.role === 'clerk' ? (
              <div className="mt-2 space-y-2">
                <div>
                  <label className="field-label" htmlFor="mgr-email">
                    Manager e-mail
                  </label>
                  <input id="mgr-email" className="field-input" autoComplete="off" value={managerEmail} onChange={(e) => setManagerEmail(e.target.value)} />
                </div>
                <div>
                  <label className="field-label" htmlFor="mgr-password">
                    Manager password
                  </label>
                  <input id="mgr-password" type="password" autoComplete="off" className="field-input" value={managerPassword} onChange={(e) => setManagerPassword(e.target.value)} />
                </div>
              </div>
            ) : null}
            <div className="mt-2 flex gap-2">
              {(['approved', 'rejected'] as const).map((decision) => (
                <button
                  key={decision}
                  type="button"
                  className={decision === 'approved' ? 'btn-primary' : 'btn-quiet'}
                  disabled={!!busy}
                  onClick={() =>
                    run(
                      decision,
                      () =>
                        fetchJson(`/api/approvals/${pendingApproval.id}`, {
                          method: 'POST',
                          body: JSON.stringify({ decision, note: null, ...(d.role === 'clerk' ? { managerEmail, managerPassword } : {}) }),
                        }),
                      decision === 'approved' ? 'Raise approved.' : 'Raise rejected.',
                    ).then(() => setManagerPassword(''))
                  }
                >
                  {decision === 'approved' ? 'Approve raise' : 'Reject raise'}
                </button>
              ))}
            </div>
          </section>
        )}

        <section className="card space-y-3" aria-labelledby="next-heading">
          <h2 id="next-heading" className="font-bold">
            Next step
          </h2>
          {editable && (
            <div className="flex flex-wrap gap-2">
              <button type="button" className="btn-quiet" onClick={() => void save()} disabled={!!busy}>
                Save lines
              </button>
              {d.ticket.state === 'draft' && (
                <button type="button" className="btn-primary" onClick={() => void showOffer()} disabled={!!busy || lines.length === 0}>
                  Show offer to seller
                </button>
              )}
            </div>
          )}
          <a className="btn-quiet w-full" href={`/counter/tickets/${d.ticket.id}/seller-view`} target="cupel-seller-view">
            Open seller's screen
          </a>
          {d.ticket.state === 'quoted' && !dirty && (
            <div className="space-y-2">
              {!signing ? (
                <div className="flex flex-wrap gap-2">
                  <button type="button" className="btn-primary" onClick={() => setSigning(true)}>
                    Seller accepts
                  </button>
                  <button type="button" className="btn-quiet" disabled={!!busy} onClick={() => run('decline', () => fetchJson(`/api/tickets/${d.ticket.id}/decline`, { method: 'POST', body: JSON.stringify({ reason: null }) }), 'Offer declined; the ticket is kept.')}>
                    Seller declines
                  </button>
                </div>
              ) : (
                <div className="space-y-2" aria-label="Seller's acceptance">
                  <p className="rounded-md bg-ink-50 p-2 text-sm" data-testid="ownership-statement">
                    {d.settings.ownershipStatement}
                  </p>
                  <label className="flex items-start gap-2 text-sm">
                    <input type="checkbox" checked={agrees} onChange={(e) => setAgrees(e.target.checked)} className="mt-1" />
                    <span>The seller has read and agrees to the statement above.</span>
                  </label>
                  <SignaturePad onChange={setSignature} />
                  <button
                    type="button"
                    className="btn-primary w-full"
                    disabled={!signature || !agrees || !!busy}
                    onClick={() =>
                      run('accept', () => fetchJson(`/api/tickets/${d.ticket.id}/accept`, { method: 'POST', body: JSON.stringify({ signatureSvg: signature, agreesToOwnershipStatement: agrees }) }), 'Accepted: spot, rates and fineness are now fixed.').then((ok) => ok && setSigning(false))
                    }
                  >
                    Confirm acceptance
                  </button>
                </div>
              )}
            </div>
          )}
          {d.ticket.state === 'accepted' && (
            <div className="space-y-2">
              {pendingPayout ? (
                <p role="status" className="rounded-md bg-amber-50 p-2 font-semibold text-amber-900" data-testid="payout-pending">
                  Electronic payout of {fmt(pendingPayout.amountMinor)} on its way; waiting for the payment provider to confirm.
                  {pendingPayout.lastError && (
                    <span className="mt-1 block text-sm font-normal">
                      The provider has not answered the last try yet ({pendingPayout.lastError}). Cupel asks again with the same request, so the seller is paid once; do not pay another way.
                    </span>
                  )}
                </p>
              ) : (
                <>
                  {failedPayout && (
                    <p role="alert" className="rounded-md bg-red-50 p-2 text-sm font-semibold text-red-900" data-testid="payout-failed">
                      The electronic payout failed: {failedPayout.failureReason ?? 'no reason given'}. Pay another way or try again.
                    </p>
                  )}
                  <fieldset>
                    <legend className="field-label">Pay {fmt(d.ticket.payoutMinor)} by</legend>
                    {(['cash', 'check', 'electronic'] as const).map((m) => (
                      <label key={m} className="mr-4 inline-flex items-center gap-1">
                        <input type="radio" name="pay-method" value={m} checked={payMethod === m} onChange={() => setPayMethod(m)} /> {m === 'cash' ? 'Cash' : m === 'check' ? 'Check' : 'Electronic payout'}
                      </label>
                    ))}
                  </fieldset>
                  {payMethod === 'cash' && (
                    <p className="text-sm text-ink-700">
                      {d.drawer ? `Your drawer holds ${fmt(d.drawer.balanceMinor)}.` : 'Open your cash drawer on the counter page first.'} Cash limit per ticket: {d.settings.cashLimit} {d.ticket.currency}.
                    </p>
                  )}
                  {payMethod === 'check' && (
                    <div>
                      <label className="field-label" htmlFor="check-number">
                        Check number
                      </label>
                      <input id="check-number" className="field-input" value={checkNumber} onChange={(e) => setCheckNumber(e.target.value)} />
                    </div>
                  )}
                  {payMethod === 'electronic' && (
                    <div className="space-y-2 text-sm" data-testid="electronic-payout">
                      {d.seller.payoutAccount.onboarded ? (
                        <>
                          <p>Pays to the seller's {d.seller.payoutAccount.destination ?? 'payout account'}.</p>
                          {d.seller.payoutAccount.instantAvailable && (
                            <label className="flex items-center gap-2">
                              <input type="checkbox" checked={instant} onChange={(e) => setInstant(e.target.checked)} /> Instant payout (arrives in minutes; the provider may charge for it)
                            </label>
                          )}
                        </>
                      ) : (
                        <>
                          <p>The seller has no payout account yet. Send them the set-up link{d.seller.email ? ` (e-mailed to ${d.seller.email})` : ''}; it also shows as a QR code on the seller's screen.</p>
                          <button
                            type="button"
                            className="btn-quiet"
                            disabled={!!busy}
                            onClick={() => run('onboard', () => fetchJson(`/api/sellers/${d.seller.id}/payout-account`, { method: 'POST' }), 'Set-up link sent; it is on the seller\u2019s screen too.')}
                          >
                            Send payout set-up link
                          </button>
                          {d.seller.payoutAccount.onboardingUrl && (
                            <p className="break-all text-ink-600">
                              Link: <a className="underline" href={d.seller.payoutAccount.onboardingUrl} target="_blank" rel="noreferrer">{d.seller.payoutAccount.onboardingUrl}</a>
                            </p>
                          )}
                        </>
                      )}
                    </div>
                  )}
                  <button
                    type="button"
                    className="btn-primary w-full"
                    disabled={!!busy || (payMethod === 'electronic' && !d.seller.payoutAccount.onboarded)}
                    onClick={() =>
                      run(
                        'pay',
                        () =>
                          fetchJson(`/api/tickets/${d.ticket.id}/pay`, {
                            method: 'POST',
                            body: JSON.stringify(payMethod === 'cash' ? { method: 'cash' } : payMethod === 'check' ? { method: 'check', checkNumber } : { method: 'electronic', speed: instant ? 'instant' : 'standard' }),
                          }),
                        payMethod === 'electronic' ? 'Payout sent to the payment provider.' : 'Paid. Print the receipt and the hold tags.',
                      )
                    }
                  >
                    Pay seller
                  </button>
                </>
              )}
            </div>
          )}
          {(d.ticket.state === 'paid' || d.ticket.state === 'accepted' || d.ticket.state === 'voided') && (
            <div className="flex flex-wrap gap-2">
              <a className="btn-primary" href={`/counter/tickets/${d.ticket.id}/receipt`}>
                Receipt
              </a>
              {d.ticket.state === 'paid' && (
                <a className="btn-quiet" href={`/counter/tickets/${d.ticket.id}/tags`}>
                  Hold tags
                </a>
              )}
            </div>
          )}
          {d.ticket.state === 'paid' && d.ticket.holdUntil && <p className="text-sm">Items held until {d.ticket.holdUntil}.</p>}
          {(d.role === 'manager' || d.role === 'admin') && d.ticket.state !== 'voided' && (
            <div className="border-t border-ink-100 pt-3">
              <label className="field-label" htmlFor="void-reason">
                Void this ticket: reason
              </label>
              <input id="void-reason" className="field-input" value={voidReason} onChange={(e) => setVoidReason(e.target.value)} />
              <button type="button" className="btn-quiet mt-2" disabled={!voidReason.trim() || !!busy} onClick={() => run('void', () => fetchJson(`/api/tickets/${d.ticket.id}/void`, { method: 'POST', body: JSON.stringify({ reason: voidReason }) }), 'Ticket voided.')}>
                Void ticket
              </button>
            </div>
          )}
          {d.ticket.state === 'voided' && <p className="font-semibold text-red-800">Voided: {d.ticket.voidReason}</p>}
          {d.ticket.payments
            .filter((p) => p.kind === 'reversal' && p.state === 'pending')
            .map((p) => (
              <p key={p.id} role="status" className="rounded-md bg-amber-50 p-2 text-sm font-semibold text-amber-900" data-testid="reversal-pending">
                Reversal of {fmt(p.amountMinor)} pending: not returned until the payment provider confirms it or a manager records the recovery on the review page.
              </p>
            ))}
        </section>
      </aside>
    </div>
  );
}

function initialLines(data: WorkbenchData): GradingLine[] {
  if (data.ticket.lines.length) return data.ticket.lines.map((l) => fromCounterLine(l.input));
  return [newGradingLine()];
}

function showWeight(grams: string, unit: WeightUnit): string {
  const places = unit === 'ozt' ? 4 : unit === 'dwt' ? 3 : 2;
  return `${convertWeight(grams, 'g', unit).toFixed(places)} ${unit}`;
}

function SellerPanel({ data, fmt }: { data: WorkbenchData; fmt: (minor: number) => string }) {
  const s = data.seller;
  return (
    <section className="card" aria-labelledby="seller-heading">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 id="seller-heading" className="text-lg font-bold" data-testid="seller-name">
            {s.legalName}
          </h2>
          <p className="text-sm text-ink-600">{s.idSummary}</p>
        </div>
        {s.recentTickets.length > 1 && (
          <details className="text-sm">
            <summary className="cursor-pointer font-semibold">Recent tickets ({s.recentTickets.length})</summary>
            <ul className="mt-1">
              {s.recentTickets.map((t) => (
                <li key={t.id}>
                  <a className="underline" href={`/counter/tickets/${t.id}`}>
                    #{t.number}
                  </a>{' '}
                  {t.state} · {fmt(t.payoutMinor)} · {t.createdAt.slice(0, 10)}
                </li>
              ))}
            </ul>
          </details>
        )}
      </div>
      {s.problems.length > 0 && (
        <ul className="mt-2 space-y-1" role="alert">
          {s.problems.map((p) => (
            <li key={p.code} className="rounded bg-red-50 px-2 py-1 text-sm font-semibold text-red-900">
              {p.message}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function SpotPanel({ data }: { data: WorkbenchData }) {
  const metals = Object.entries(data.spot);
  return (
    <section className="card" aria-labelledby="spot-used-heading">
      <h2 id="spot-used-heading" className="font-bold">
        Spot in force
      </h2>
      {metals.length === 0 ? (
        <p className="text-sm text-red-800">No spot entered yet: enter today's spot on the counter page.</p>
      ) : (
        <ul className="mt-1 text-sm">
          {metals.map(([metal, s]) => (
            <li key={metal} className={s!.stale ? 'font-semibold text-red-800' : ''}>
              {metal}: {displaySpot(s!.pricePerTroyOunce)} per ozt{s!.stale ? ` · stale (older than ${data.staleAfterMinutes} min)` : ''}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
