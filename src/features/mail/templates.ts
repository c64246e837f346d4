import type { ReceiptModel } from '@/features/receipts/receipt';
import { receiptPlainText } from '@/features/receipts/receipt';

/** Pure renderers for Cupel's e-mails: each gives a subject, a plain-text part and an HTML part. */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function frame(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${esc(title)}</title></head>
<body style="margin:0;padding:24px;background:#f4f6f8;font-family:'Source Sans 3',Arial,sans-serif;color:#151c26">
<div style="max-width:640px;margin:0 auto;background:#fff;border:1px solid #cbd3dc;border-radius:8px;padding:24px">${body}</div></body></html>`;
}

/** The receipt e-mail states the same figures as the printed receipt: it is built from the same model. */
export function receiptMail(model: ReceiptModel): MailContent {
  const rows = model.lines
    .map(
      (l) => `<tr>
  <td style="padding:6px 4px;border-top:1px solid #e6eaef">${l.position}. ${esc(l.description)}<br><span style="color:#465468;font-size:13px">${esc(
    [l.mark && `mark ${l.mark}`, l.test, l.netWeight && `net ${l.netWeight}`, l.fineness && `paid on ${l.fineness}`, l.fineWeightGrams && `fine ${l.fineWeightGrams}`, l.basis && `counted ${l.basis}`, l.spotPerTroyOunce && `spot ${l.spotPerTroyOunce}`, l.rate, l.tagNumber && `tag ${l.tagNumber}`]
      .filter(Boolean)
      .join(' · '),
  )}</span></td>
  <td style="padding:6px 4px;border-top:1px solid #e6eaef;text-align:right">${esc(l.meltValue)}</td>
  <td style="padding:6px 4px;border-top:1px solid #e6eaef;text-align:right;font-weight:600">${esc(l.payout)}</td>
</tr>`,
    )
    .join('');
  const html = frame(
    `${model.title} ${model.reference}`,
    `${model.voided ? `<p style="padding:12px;border:2px solid #b91c1c;color:#7f1d1d;font-weight:700">${esc(model.voided.banner)}: ${esc(model.voided.reason)}</p>` : ''}
<p style="margin:0;color:#7b410f;font-weight:700;text-transform:uppercase;font-size:13px">${esc(model.store.name)}</p>
<h1 style="margin:4px 0 0;font-size:24px">${esc(model.title)} ${esc(model.reference)}</h1>
<p style="margin:4px 0 16px;color:#465468">${esc(model.dateTime)} · clerk ${esc(model.clerk)}</p>
<p style="margin:0 0 16px">${esc(model.seller.name)}<br>${model.seller.addressLines.map(esc).join('<br>')}<br>${esc(model.seller.idDocument)} ${esc(model.seller.idNumberMasked)}</p>
<table style="width:100%;border-collapse:collapse;font-size:15px"><thead><tr style="color:#465468;text-align:left"><th>Item</th><th style="text-align:right">Melt value</th><th style="text-align:right">Payout</th></tr></thead><tbody>${rows}</tbody>
<tfoot><tr><td style="padding:8px 4px;border-top:2px solid #151c26">Total</td><td style="padding:8px 4px;border-top:2px solid #151c26;text-align:right">${esc(model.totals.meltValue)}</td><td style="padding:8px 4px;border-top:2px solid #151c26;text-align:right;font-weight:700">${esc(model.totals.payout)}</td></tr></tfoot></table>
<p style="margin:16px 0;padding:12px;background:#fdf5ec;border-radius:6px;font-weight:600">${esc(model.marginStatement)}</p>
${model.spotsUsed.length ? `<p style="color:#465468;font-size:13px">Spot used: ${model.spotsUsed.map((s) => `${esc(s.metal)} ${esc(s.pricePerTroyOunce)} per ozt`).join('; ')}</p>` : ''}
<h2 style="font-size:16px;margin:16px 0 4px">Hold</h2><p style="margin:0">${esc(model.hold.notice)}</p>
<h2 style="font-size:16px;margin:16px 0 4px">Payment</h2><p style="margin:0">${esc(model.paymentStatus)}</p>
${model.ownershipStatement ? `<h2 style="font-size:16px;margin:16px 0 4px">Your statement of ownership</h2><p style="margin:0">${esc(model.ownershipStatement)}</p>` : ''}
<p style="margin-top:24px;color:#465468;font-size:13px">${esc(model.footer)} The receipt is attached as a PDF.</p>`,
  );
  return { subject: `Your receipt ${model.reference} from ${model.store.name}: ${model.totals.payout}`, text: receiptPlainText(model), html };
}

export function payoutConfirmationMail(input: { storeName: string; reference: string; amount: string; destination: string }): MailContent {
  const text = `${input.storeName}\n\nYour payout of ${input.amount} for ticket ${input.reference} has been paid to ${input.destination}.\nDepending on your bank it may take a short while to show.\n\nYou can see your settlements in the seller portal.`;
  return {
    subject: `Paid: ${input.amount} for ticket ${input.reference}`,
    text,
    html: frame('Payout paid', `<h1 style="font-size:22px;margin:0">Your payout has been paid</h1><p>Your payout of <strong>${esc(input.amount)}</strong> for ticket ${esc(input.reference)} has been paid to ${esc(input.destination)}.</p><p style="color:#465468">Depending on your bank it may take a short while to show. You can see your settlements in the seller portal.</p>`),
  };
}

export function onboardingLinkMail(input: { storeName: string; sellerName: string; url: string }): MailContent {
  const text = `Hello ${input.sellerName},\n\n${input.storeName} can pay you electronically. To receive payouts, set up your payout account here:\n${input.url}\n\nThe link expires; ask at the counter for a new one if it has.`;
  return {
    subject: `Set up your payout account with ${input.storeName}`,
    text,
    html: frame('Set up your payout account', `<p>Hello ${esc(input.sellerName)},</p><p>${esc(input.storeName)} can pay you electronically. To receive payouts, set up your payout account:</p><p><a href="${esc(input.url)}" style="display:inline-block;background:#9a5214;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:700">Set up payout account</a></p><p style="color:#465468;font-size:13px">Or open this address: ${esc(input.url)}. The link expires; ask at the counter for a new one if it has.</p>`),
  };
}

export function signInLinkMail(input: { url: string }): MailContent {
  const text = `Sign in to your Cupel seller portal:\n${input.url}\n\nThe link works once and expires in 24 hours. If you did not ask for it, ignore this e-mail.`;
  return {
    subject: 'Your sign-in link for the seller portal',
    text,
    html: frame('Sign in', `<h1 style="font-size:22px;margin:0">Sign in to the seller portal</h1><p><a href="${esc(input.url)}" style="display:inline-block;background:#9a5214;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:700">Sign in</a></p><p style="color:#465468;font-size:13px">The link works once and expires in 24 hours. If you did not ask for it, ignore this e-mail.</p>`),
  };
}
