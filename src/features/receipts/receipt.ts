import { TEST_METHOD_LABELS } from '@/features/counter/counter';
import { offerPercentages } from '@/features/counter/ticket-pricing';
import { Dec } from '@/features/pricing/decimal';
import { faceValueBasisText } from '@/features/pricing/coins';
import { METAL_LABELS, isMetal } from '@/features/pricing/metals';
import { CURRENCY_CODES, currencyExponent, formatMinor, type CurrencyCode } from '@/features/pricing/money';
import { ID_TYPE_LABELS, maskIdNumber } from '@/features/sellers/sellers';

/**
 * The receipt of a purchase, worked out once and printed three ways (page, PDF, e-mail text),
 * so that every copy the seller or the store holds states the same figures.
 */

type Instant = Date | string;

/** The parts of a ticket (as getTicket returns it) that a receipt reads. */
export interface ReceiptSource {
  number: number;
  reference: string;
  state: string;
  stateLabel: string;
  currency: string;
  meltValueMinor: number;
  payoutMinor: number;
  marginMinor: number;
  acceptedAt: Instant | null;
  paidAt: Instant | null;
  voidedAt?: Instant | null;
  voidReason: string | null;
  holdUntil: string | null;
  signatureSvg: string | null;
  ownershipStatement: string | null;
  pricingBasis?: unknown;
  store: { code: string; name: string; address: string | null; phone: string | null; timeZone: string };
  clerkName: string | null;
  seller: {
    legalName: string;
    addressLine1: string;
    addressLine2: string | null;
    city: string;
    region: string;
    postalCode: string;
    country: string;
    idType: string;
    idNumber: string;
    idIssuingRegion: string;
  };
  lines: readonly ReceiptSourceLine[];
  payments: readonly ReceiptSourcePayment[];
}

export interface ReceiptSourceLine {
  position: number;
  description: string;
  input: unknown;
  testMethod: string;
  testResult: string | null;
  metal: string | null;
  markedFineness: string | null;
  paidOnFineness: string | null;
  grossWeightGrams: string | null;
  netWeightGrams: string | null;
  fineWeightGrams: string | null;
  fineWeightTroyOunces: string | null;
  spotPerTroyOunce: string | null;
  rateLabel: string | null;
  meltValueMinor: number;
  payoutMinor: number;
  marginMinor: number;
  tagNumber: string | null;
  holdUntil: string | null;
}

export interface ReceiptSourcePayment {
  kind: string;
  method: string;
  amountMinor: number;
  checkNumber: string | null;
  state: string;
  createdAt: Instant;
}

export interface ReceiptOptions {
  locale?: string;
}

export interface ReceiptLine {
  position: number;
  description: string;
  mark: string | null;
  metal: string | null;
  test: string;
  grossWeight: string | null;
  netWeight: string | null;
  /** "925/1000"; with the marked fineness after it when the two differ. */
  fineness: string | null;
  paidOnFineness: string | null;
  markedFineness: string | null;
  fineWeightGrams: string | null;
  fineWeightTroyOunces: string | null;
  spotPerTroyOunce: string | null;
  rate: string | null;
  /** For coin counted by face value: the face value and the basis that priced it. */
  basis: string | null;
  meltValue: string;
  payout: string;
  margin: string;
  meltValueMinor: number;
  payoutMinor: number;
  marginMinor: number;
  tagNumber: string | null;
  holdUntil: string | null;
}

export interface ReceiptPayment {
  kind: 'payout' | 'reversal';
  label: string;
  method: string;
  checkNumber: string | null;
  amount: string;
  amountMinor: number;
  state: string;
  at: string;
}

export interface ReceiptModel {
  title: string;
  reference: string;
  state: string;
  stateLabel: string;
  currency: CurrencyCode;
  store: { name: string; address: string | null; phone: string | null; timeZone: string };
  /** When the purchase took place: payment time, or acceptance time while payment is pending. */
  dateTime: string;
  acceptedAt: string | null;
  paidAt: string | null;
  clerk: string;
  seller: { name: string; addressLines: string[]; idDocument: string; idNumberMasked: string };
  lines: ReceiptLine[];
  totals: {
    meltValue: string;
    payout: string;
    margin: string;
    payoutPercentOfMelt: string;
    marginPercentOfMelt: string;
    meltValueMinor: number;
    payoutMinor: number;
    marginMinor: number;
  };
  marginStatement: string;
  spotsUsed: { metal: string; pricePerTroyOunce: string; enteredAt: string | null }[];
  hold: { until: string | null; untilIso: string | null; notice: string; tagNumbers: string[] };
  payments: ReceiptPayment[];
  paymentStatus: string;
  ownershipStatement: string | null;
  signature: { svg: string; dataUri: string; signedAt: string | null } | null;
  voided: { banner: string; reason: string; at: string | null } | null;
  footer: string;
}

export class ReceiptUnavailableError extends Error {}

/** Why a ticket has no receipt yet, or null when it has one: a receipt exists once the seller has accepted and signed. */
export function receiptUnavailableReason(ticket: Pick<ReceiptSource, 'reference' | 'acceptedAt' | 'stateLabel'>): string | null {
  if (ticket.acceptedAt) return null;
  return `Ticket ${ticket.reference} has no receipt: the seller has not accepted the offer (ticket status: ${ticket.stateLabel}). A receipt is issued once the seller accepts the offer and signs.`;
}

/** Why a ticket has no hold-bin tags, or null: tags are issued when a purchase is paid and stay only while it stands. */
export function tagsUnavailableReason(ticket: Pick<ReceiptSource, 'reference' | 'state' | 'stateLabel'>): string | null {
  if (ticket.state === 'paid') return null;
  if (ticket.state === 'voided') return `Ticket ${ticket.reference} was voided; its items are no longer held under it, so no hold tags are printed.`;
  return `Ticket ${ticket.reference} has no hold tags yet: tags are issued when the seller is paid (ticket status: ${ticket.stateLabel}).`;
}

const METHOD_LABELS: Record<string, string> = { cash: 'Cash', check: 'Check', electronic: 'Electronic transfer' };
const PAYMENT_STATE_LABELS: Record<string, string> = { pending: 'Pending', completed: 'Completed', failed: 'Failed' };

export function buildReceipt(ticket: ReceiptSource, options: ReceiptOptions = {}): ReceiptModel {
  const unavailable = receiptUnavailableReason(ticket);
  if (unavailable) throw new ReceiptUnavailableError(unavailable);
  const locale = options.locale ?? 'en-US';
  const currency = currencyOf(ticket.currency);
  const zone = ticket.store.timeZone;
  const money = (minor: number) => formatMinor(minor, currency, locale);
  const at = (value: Instant | null | undefined) => (value ? formatInstant(value, zone, locale) : null);

  const lines = ticket.lines.map((l) => buildLine(l, currency, locale));

  const shares = offerPercentages(ticket.payoutMinor, ticket.meltValueMinor) ?? { payout: '0.00', margin: '0.00' };
  const payoutPercent = shares.payout;
  const marginPercent = shares.margin;
  const totals = {
    meltValue: money(ticket.meltValueMinor),
    payout: money(ticket.payoutMinor),
    margin: money(ticket.marginMinor),
    payoutPercentOfMelt: `${payoutPercent}%`,
    marginPercentOfMelt: `${marginPercent}%`,
    meltValueMinor: ticket.meltValueMinor,
    payoutMinor: ticket.payoutMinor,
    marginMinor: ticket.marginMinor,
  };
  const marginStatement = `Melt value ${totals.meltValue}. We pay ${totals.payout}, which is ${totals.payoutPercentOfMelt} of melt value; the store's margin is ${totals.margin}.`;

  const tagNumbers = lines.map((l) => l.tagNumber).filter((t): t is string => Boolean(t));
  const holdUntilText = ticket.holdUntil ? formatCalendarDay(ticket.holdUntil, locale) : null;
  const voided = ticket.state === 'voided'
    ? { banner: 'VOIDED', reason: ticket.voidReason ?? 'No reason recorded', at: at(ticket.voidedAt) }
    : null;
  let holdNotice: string;
  if (voided) {
    holdNotice = tagNumbers.length
      ? `This purchase was voided, so this receipt no longer holds items under it. Tag numbers that were issued: ${tagNumbers.join(', ')}.`
      : 'This purchase was voided before payment; no items were tagged for the hold.';
  } else if (holdUntilText) {
    holdNotice = `The items bought on this ticket are held until ${holdUntilText}, as local law requires, before they are melted or resold.${tagNumbers.length ? ` Tag numbers: ${tagNumbers.join(', ')}.` : ''}`;
  } else {
    holdNotice = 'When the seller is paid, each item is tagged and held for the period local law requires before it is melted or resold.';
  }

  const payments = ticket.payments.map((p): ReceiptPayment => {
    const reversal = p.kind === 'reversal';
    return {
      kind: reversal ? 'reversal' : 'payout',
      label: reversal ? 'Payment reversed' : 'Paid to seller',
      method: METHOD_LABELS[p.method] ?? p.method,
      checkNumber: p.checkNumber,
      amount: money(reversal ? -p.amountMinor : p.amountMinor),
      amountMinor: reversal ? -p.amountMinor : p.amountMinor,
      state: PAYMENT_STATE_LABELS[p.state] ?? p.state,
      at: formatInstant(p.createdAt, zone, locale),
    };
  });
  const live = payments.find((p) => p.kind === 'payout' && p.state !== 'Failed');
  const paymentStatus = ticket.paidAt && live
    ? `Paid ${live.amount} by ${live.method.toLowerCase()}${live.checkNumber ? `, check no. ${live.checkNumber}` : ''}.`
    : ticket.paidAt
      ? 'Paid.'
      : 'Not paid yet: the offer is accepted and payment is pending.';

  const s = ticket.seller;
  const addressLines = [
    s.addressLine1,
    s.addressLine2,
    `${s.city}, ${s.region} ${s.postalCode}`.trim(),
    s.country,
  ].filter((x): x is string => Boolean(x && x.trim()));

  return {
    title: 'Purchase receipt',
    reference: ticket.reference,
    state: ticket.state,
    stateLabel: ticket.stateLabel,
    currency,
    store: { name: ticket.store.name, address: ticket.store.address, phone: ticket.store.phone, timeZone: zone },
    dateTime: at(ticket.paidAt ?? ticket.acceptedAt)!,
    acceptedAt: at(ticket.acceptedAt),
    paidAt: at(ticket.paidAt),
    clerk: ticket.clerkName ?? 'Not recorded',
    seller: {
      name: s.legalName,
      addressLines,
      idDocument: `${ID_TYPE_LABELS[s.idType] ?? s.idType}${s.idIssuingRegion ? `, ${s.idIssuingRegion}` : ''}`,
      idNumberMasked: maskIdNumber(s.idNumber),
    },
    lines,
    totals,
    marginStatement,
    spotsUsed: spotsUsed(ticket.pricingBasis, currency, zone, locale),
    hold: { until: holdUntilText, untilIso: ticket.holdUntil, notice: holdNotice, tagNumbers },
    payments,
    paymentStatus,
    ownershipStatement: ticket.ownershipStatement,
    signature: ticket.signatureSvg
      ? { svg: ticket.signatureSvg, dataUri: svgDataUri(ticket.signatureSvg), signedAt: at(ticket.acceptedAt) }
      : null,
    voided,
    footer: `Keep this receipt. Ticket ${ticket.reference}, ${ticket.store.name}${ticket.store.phone ? `, ${ticket.store.phone}` : ''}.`,
  };
}

function buildLine(l: ReceiptSourceLine, currency: CurrencyCode, locale: string): ReceiptLine {
  const item = itemOf(l.input);
  const money = (minor: number) => formatMinor(minor, currency, locale);
  const paidOn = l.paidOnFineness ? perThousand(l.paidOnFineness) : null;
  const marked = l.markedFineness ? perThousand(l.markedFineness) : null;
  const testLabel = (TEST_METHOD_LABELS as Record<string, string>)[l.testMethod] ?? l.testMethod;
  let fineness: string | null = null;
  if (paidOn) fineness = marked && marked !== paidOn ? `${paidOn} (marked ${marked})` : paidOn;
  return {
    position: l.position,
    description: l.description,
    mark: typeof item.mark === 'string' && item.mark.trim() ? item.mark.trim() : null,
    metal: l.metal && isMetal(l.metal) ? METAL_LABELS[l.metal] : l.metal,
    test: l.testResult ? `${testLabel}: ${l.testResult}` : testLabel,
    grossWeight: l.grossWeightGrams ? `${decimalWithMinPlaces(l.grossWeightGrams, 2)} g` : null,
    netWeight: l.netWeightGrams ? `${decimalWithMinPlaces(l.netWeightGrams, 2)} g` : null,
    fineness,
    paidOnFineness: paidOn,
    markedFineness: marked,
    fineWeightGrams: l.fineWeightGrams ? `${decimalWithMinPlaces(l.fineWeightGrams, 2)} g` : null,
    fineWeightTroyOunces: l.fineWeightTroyOunces ? `${decimalWithMinPlaces(l.fineWeightTroyOunces, 3)} ozt` : null,
    spotPerTroyOunce: l.spotPerTroyOunce ? `${priceOf(l.spotPerTroyOunce, currency, locale)} per ozt` : null,
    rate: l.rateLabel,
    basis: faceValueBasisOf(item),
    meltValue: money(l.meltValueMinor),
    payout: money(l.payoutMinor),
    margin: money(l.marginMinor),
    meltValueMinor: l.meltValueMinor,
    payoutMinor: l.payoutMinor,
    marginMinor: l.marginMinor,
    tagNumber: l.tagNumber,
    holdUntil: l.holdUntil ? formatCalendarDay(l.holdUntil, locale) : null,
  };
}

/** "10.00 face at 0.2958 ozt per 1.00 face, mint weight": the basis the saved line was priced on. */
function faceValueBasisOf(item: Record<string, unknown>): string | null {
  if (item.kind !== 'face-value' || typeof item.coinClass !== 'string' || typeof item.faceValue !== 'string') return null;
  const text = faceValueBasisText(item.coinClass, typeof item.basis === 'string' ? item.basis : undefined);
  return text ? `${item.faceValue} face at ${text}` : null;
}

function itemOf(input: unknown): Record<string, unknown> {
  const item = (input as { item?: unknown } | null)?.item;
  return item && typeof item === 'object' ? (item as Record<string, unknown>) : {};
}

function currencyOf(code: string): CurrencyCode {
  if (!(CURRENCY_CODES as string[]).includes(code)) throw new RangeError(`currency ${code} is not one Cupel prints`);
  return code as CurrencyCode;
}

/** A stored decimal with trailing zeros dropped, but at least `minPlaces` decimals: "316.6000" -> "316.60". */
export function decimalWithMinPlaces(decimal: string, minPlaces: number): string {
  const trimmed = new Dec(decimal).toFixed();
  const places = trimmed.includes('.') ? trimmed.length - trimmed.indexOf('.') - 1 : 0;
  return places >= minPlaces ? trimmed : new Dec(decimal).toFixed(minPlaces);
}

/** Fineness in parts per thousand, as the trade writes it: "0.925000" -> "925/1000", 14/24 stored as "0.583333" -> "583.3/1000". */
export function perThousand(fineness: string): string {
  return `${new Dec(fineness).mul(1000).toDecimalPlaces(1, Dec.ROUND_HALF_UP).toFixed()}/1000`;
}

/** A price per ounce as stored (up to 4 decimals, in major units), formatted from its decimal string. */
function priceOf(decimal: string, currency: CurrencyCode, locale: string): string {
  const exponent = currencyExponent(currency);
  const f = new Intl.NumberFormat(locale, {
    style: 'currency',
    currency,
    minimumFractionDigits: exponent,
    maximumFractionDigits: Math.max(exponent, 4),
  }) as Intl.NumberFormat & { format(value: string): string };
  return f.format(new Dec(decimal).toFixed());
}

export function formatInstant(value: Instant, timeZone: string, locale = 'en-US'): string {
  const date = typeof value === 'string' ? new Date(value) : value;
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    year: 'numeric',
    month: 'long',
    day: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
    timeZoneName: 'short',
  })
    .format(date)
    // ICU puts a narrow no-break space before AM/PM; printers' built-in fonts and plain-text mail lack it.
    .replace(/[\u202f\u00a0]/g, ' ');
}

/** A calendar day (YYYY-MM-DD) is already the store's day: formatted as is, with no time-zone shift. */
export function formatCalendarDay(day: string, locale = 'en-US'): string {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Intl.DateTimeFormat(locale, { timeZone: 'UTC', year: 'numeric', month: 'long', day: 'numeric' }).format(new Date(Date.UTC(y, m - 1, d)));
}

function spotsUsed(basis: unknown, currency: CurrencyCode, zone: string, locale: string): ReceiptModel['spotsUsed'] {
  const spot = (basis as { spot?: Record<string, { pricePerTroyOunce?: unknown; enteredAt?: unknown }> } | null)?.spot;
  if (!spot || typeof spot !== 'object') return [];
  return Object.entries(spot)
    .filter(([metal, v]) => isMetal(metal) && typeof v?.pricePerTroyOunce === 'string')
    .map(([metal, v]) => ({
      metal: METAL_LABELS[metal as keyof typeof METAL_LABELS],
      pricePerTroyOunce: `${priceOf(v.pricePerTroyOunce as string, currency, locale)} per ozt`,
      enteredAt: v.enteredAt instanceof Date || typeof v.enteredAt === 'string' ? formatInstant(v.enteredAt, zone, locale) : null,
    }));
}

/** A data: URI of the signature, so pages show it as an image and never as live markup. */
export function svgDataUri(svg: string): string {
  const bytes = new TextEncoder().encode(svg);
  let binary = '';
  for (const b of bytes) binary += String.fromCharCode(b);
  return `data:image/svg+xml;base64,${btoa(binary)}`;
}

export interface HoldTag {
  tagNumber: string;
  reference: string;
  description: string;
  metal: string | null;
  netWeight: string | null;
  holdUntil: string;
  holdLine: string;
}

/** One hold-bin tag per tagged line, from the same model as the receipt. */
export function holdTags(model: ReceiptModel): HoldTag[] {
  return model.lines
    .filter((l) => l.tagNumber)
    .map((l) => {
      const until = l.holdUntil ?? model.hold.until ?? 'the date local law sets';
      return {
        tagNumber: l.tagNumber!,
        reference: model.reference,
        description: l.description,
        metal: l.metal,
        netWeight: l.netWeight,
        holdUntil: until,
        holdLine: `HOLD — do not melt or sell before ${until}`,
      };
    });
}

/** The receipt as plain text (monospace, 48 columns), for the e-mail's text part. */
export function receiptPlainText(model: ReceiptModel): string {
  const width = 48;
  const rule = '-'.repeat(width);
  const out: string[] = [];
  const para = (text: string, indent = '') => out.push(...wrap(text, width - indent.length).map((l) => indent + l));
  const pair = (label: string, value: string) => {
    const gap = width - label.length - value.length;
    if (gap >= 1) out.push(`${label}${' '.repeat(gap)}${value}`);
    else {
      para(label);
      out.push(value.padStart(width));
    }
  };
  if (model.voided) {
    out.push('*'.repeat(width));
    para(`${model.voided.banner}: ${model.voided.reason}`);
    if (model.voided.at) para(`Voided ${model.voided.at}`);
    out.push('*'.repeat(width));
  }
  para(model.store.name);
  if (model.store.address) para(model.store.address);
  if (model.store.phone) para(model.store.phone);
  out.push(rule, `${model.title.toUpperCase()} ${model.reference}`);
  para(model.dateTime);
  para(`Clerk: ${model.clerk}`);
  out.push(rule, 'Seller');
  for (const row of [model.seller.name, ...model.seller.addressLines, `${model.seller.idDocument} ${model.seller.idNumberMasked}`]) para(row);
  out.push(rule);
  const indent = '   ';
  for (const l of model.lines) {
    para(`${l.position}. ${l.description}`);
    const details: [string, string | null][] = [
      ['Mark', l.mark],
      ['Test', l.test],
      ['Metal', l.metal],
      ['Weight', l.grossWeight || l.netWeight ? `gross ${l.grossWeight ?? '-'}, net ${l.netWeight ?? '-'}` : null],
      ['Fineness paid on', l.fineness],
      ['Counted', l.basis],
      ['Fine weight', l.fineWeightGrams ? `${l.fineWeightGrams} (${l.fineWeightTroyOunces ?? '-'})` : null],
      ['Spot', l.spotPerTroyOunce],
      ['Rate', l.rate],
      ['Tag', l.tagNumber],
    ];
    for (const [label, value] of details) if (value) para(`${label}: ${value}`, indent);
    pair(`${indent}Melt value`, l.meltValue);
    pair(`${indent}Payout`, l.payout);
  }
  out.push(rule);
  pair('Melt value', model.totals.meltValue);
  pair('Payout', model.totals.payout);
  pair(`Margin (${model.totals.marginPercentOfMelt} of melt)`, model.totals.margin);
  out.push('');
  para(model.marginStatement);
  out.push(rule, 'Hold');
  para(model.hold.notice);
  out.push(rule, 'Payment');
  para(model.paymentStatus);
  for (const p of model.payments) {
    pair(`${p.label} (${p.state})`, p.amount);
    para(`${p.method}${p.checkNumber ? `, check no. ${p.checkNumber}` : ''}, ${p.at}`, indent);
  }
  if (model.ownershipStatement) {
    out.push(rule, 'Seller\u2019s statement of ownership');
    para(model.ownershipStatement);
  }
  if (model.signature) {
    para(`Signed by ${model.seller.name} on screen${model.signature.signedAt ? `, ${model.signature.signedAt}` : ''}; the signature is kept on file.`);
  }
  out.push(rule);
  para(model.footer);
  return out.join('\n');
}

function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let current = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (current && current.length + 1 + word.length > width) {
      lines.push(current);
      current = word;
    } else {
      current = current ? `${current} ${word}` : word;
    }
  }
  if (current) lines.push(current);
  return lines;
}
