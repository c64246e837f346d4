import PDFDocument from 'pdfkit';
import { barcodePng } from './barcode.server';
import type { ReceiptLine, ReceiptModel } from './receipt';

const PAGE = { width: 612, height: 792, margin: 50 };
const CONTENT_WIDTH = PAGE.width - PAGE.margin * 2;
const INK = '#151c26';
const MUTED = '#465468';
const RULE = '#cbd3dc';
const ALERT = '#9b1c1c';

export interface ReceiptPdfOptions {
  /** Leave content streams uncompressed (tests read the text back). */
  compress?: boolean;
}

/** The receipt as a Letter-size PDF in the built-in Helvetica, with the seller's signature drawn and each tag as a Code 128 barcode. */
export async function renderReceiptPdf(model: ReceiptModel, options: ReceiptPdfOptions = {}): Promise<Uint8Array> {
  const barcodes = new Map<string, Buffer>();
  for (const tag of model.hold.tagNumbers) barcodes.set(tag, await barcodePng(tag));

  const doc = new PDFDocument({
    size: 'LETTER',
    margin: PAGE.margin,
    compress: options.compress ?? true,
    bufferPages: true,
    info: { Title: `Receipt ${model.reference}`, Subject: `${model.title}, ${model.store.name}`, Creator: 'Cupel', Producer: 'Cupel' },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<void>((resolve, reject) => {
    doc.on('end', () => resolve());
    doc.on('error', reject);
  });

  const left = PAGE.margin;
  const bottom = PAGE.height - PAGE.margin;
  const ensure = (space: number) => {
    if (doc.y + space > bottom) doc.addPage();
  };
  const rule = () => {
    ensure(14);
    doc.moveTo(left, doc.y + 4).lineTo(left + CONTENT_WIDTH, doc.y + 4).lineWidth(0.75).strokeColor(RULE).stroke();
    doc.y += 12;
  };
  const heading = (text: string) => {
    ensure(40);
    doc.font('Helvetica-Bold').fontSize(10.5).fillColor(INK).text(text.toUpperCase(), left, doc.y, { characterSpacing: 0.6 });
    doc.moveDown(0.3);
  };
  const para = (text: string, opts: { size?: number; bold?: boolean; color?: string } = {}) => {
    doc.font(opts.bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(opts.size ?? 10).fillColor(opts.color ?? INK);
    ensure(doc.heightOfString(text, { width: CONTENT_WIDTH }) + 4);
    doc.text(text, left, doc.y, { width: CONTENT_WIDTH });
  };

  if (model.voided) {
    const reason = `Reason: ${model.voided.reason}${model.voided.at ? `  ·  Voided ${model.voided.at}` : ''}`;
    const top = doc.y;
    doc.rect(left, top, CONTENT_WIDTH, 58).lineWidth(2).strokeColor(ALERT).stroke();
    doc.font('Helvetica-Bold').fontSize(24).fillColor(ALERT).text(model.voided.banner, left, top + 8, { width: CONTENT_WIDTH, align: 'center', characterSpacing: 4 });
    doc.font('Helvetica').fontSize(10).text(reason, left + 10, top + 38, { width: CONTENT_WIDTH - 20, align: 'center' });
    doc.y = top + 70;
  }

  // Store on the left, the ticket on the right.
  const top = doc.y;
  doc.font('Helvetica-Bold').fontSize(16).fillColor(INK).text(model.store.name, left, top, { width: 300 });
  doc.font('Helvetica').fontSize(9.5).fillColor(MUTED);
  if (model.store.address) doc.text(model.store.address, { width: 300 });
  if (model.store.phone) doc.text(model.store.phone, { width: 300 });
  const storeBottom = doc.y;
  const rightX = left + 310;
  const rightW = CONTENT_WIDTH - 310;
  doc.font('Helvetica').fontSize(9.5).fillColor(MUTED).text(model.title, rightX, top, { width: rightW, align: 'right' });
  doc.font('Helvetica-Bold').fontSize(14).fillColor(INK).text(model.reference, rightX, doc.y, { width: rightW, align: 'right' });
  doc.font('Helvetica').fontSize(9.5).fillColor(INK).text(model.dateTime, rightX, doc.y, { width: rightW, align: 'right' });
  doc.text(`Clerk: ${model.clerk}`, rightX, doc.y, { width: rightW, align: 'right' });
  doc.text(`Status: ${model.stateLabel}`, rightX, doc.y, { width: rightW, align: 'right' });
  doc.y = Math.max(storeBottom, doc.y) + 4;
  rule();

  heading('Seller');
  para(model.seller.name, { bold: true });
  para(model.seller.addressLines.join(', '));
  para(`ID: ${model.seller.idDocument}, number ${model.seller.idNumberMasked}`);
  rule();

  heading(`Items (${model.lines.length})`);
  for (const line of model.lines) drawLine(doc, line, barcodes, ensure);

  // Totals, right-aligned figures.
  ensure(90);
  const totalsTop = doc.y;
  doc.rect(left, totalsTop, CONTENT_WIDTH, 62).fillColor('#f4f6f8').fill();
  const totalRow = (label: string, value: string, y: number, bold = false) => {
    doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(bold ? 12 : 10).fillColor(INK);
    doc.text(label, left + 12, y, { width: 300 });
    doc.text(value, left + 12, y, { width: CONTENT_WIDTH - 24, align: 'right' });
  };
  totalRow('Melt value', model.totals.meltValue, totalsTop + 8);
  totalRow(`Payout (${model.totals.payoutPercentOfMelt} of melt value)`, model.totals.payout, totalsTop + 23, true);
  totalRow(`Store's margin (${model.totals.marginPercentOfMelt} of melt value)`, model.totals.margin, totalsTop + 42);
  doc.y = totalsTop + 70;
  para(model.marginStatement, { bold: true });
  if (model.spotsUsed.length) {
    doc.moveDown(0.3);
    para(`Spot used: ${model.spotsUsed.map((s) => `${s.metal} ${s.pricePerTroyOunce}${s.enteredAt ? ` (entered ${s.enteredAt})` : ''}`).join('; ')}.`, { size: 8.5, color: MUTED });
  }
  rule();

  heading('Hold');
  para(model.hold.notice);
  rule();

  heading('Payment');
  para(model.paymentStatus);
  for (const p of model.payments) {
    para(`${p.label}: ${p.method}${p.checkNumber ? `, check no. ${p.checkNumber}` : ''}, ${p.amount} (${p.state}, ${p.at})`, { size: 9, color: MUTED });
  }
  rule();

  // The statement and the signature under it stay on one page: the signature is the seller's agreement to that text.
  const signatureSpace = 100;
  if (model.ownershipStatement) {
    doc.font('Helvetica').fontSize(9.5);
    ensure(24 + doc.heightOfString(model.ownershipStatement, { width: CONTENT_WIDTH }) + signatureSpace);
    heading('Seller\u2019s statement of ownership');
    para(model.ownershipStatement, { size: 9.5 });
    doc.moveDown(0.5);
  }

  ensure(signatureSpace);
  const sigTop = doc.y;
  const sigBox = { x: left, y: sigTop, width: 240, height: 60 };
  if (model.signature && drawSignature(doc, model.signature.svg, sigBox)) {
    // drawn
  } else if (model.signature) {
    doc.font('Helvetica-Oblique').fontSize(9).fillColor(MUTED).text('Signed on screen; the signature is kept on file.', left, sigTop + 30, { width: 260 });
  }
  doc.moveTo(left, sigTop + sigBox.height + 4).lineTo(left + 260, sigTop + sigBox.height + 4).lineWidth(0.75).strokeColor(INK).stroke();
  doc.font('Helvetica').fontSize(8.5).fillColor(MUTED)
    .text(`Seller's signature: ${model.seller.name}${model.signature?.signedAt ? `, signed ${model.signature.signedAt}` : ''}`, left, sigTop + sigBox.height + 8, { width: 360 });
  doc.y = sigTop + sigBox.height + 30;

  para(model.footer, { size: 8.5, color: MUTED });

  const range = doc.bufferedPageRange();
  for (let i = 0; i < range.count; i++) {
    doc.switchToPage(range.start + i);
    const savedBottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.font('Helvetica').fontSize(8).fillColor(MUTED)
      .text(`${model.reference}  -  page ${i + 1} of ${range.count}`, left, PAGE.height - 32, { width: CONTENT_WIDTH, align: 'right', lineBreak: false });
    doc.page.margins.bottom = savedBottom;
  }
  doc.end();
  await done;
  return new Uint8Array(Buffer.concat(chunks));
}

function drawLine(doc: PDFKit.PDFDocument, line: ReceiptLine, barcodes: Map<string, Buffer>, ensure: (space: number) => void) {
  const left = PAGE.margin;
  const detailWidth = 330;
  const moneyX = left + detailWidth + 20;
  const moneyWidth = CONTENT_WIDTH - detailWidth - 20;
  const details: [string, string | null][] = [
    ['Mark', line.mark],
    ['Test', line.test],
    ['Metal', line.metal],
    ['Weight', line.grossWeight || line.netWeight ? `gross ${line.grossWeight ?? '-'}, net ${line.netWeight ?? '-'}` : null],
    ['Fineness paid on', line.fineness],
    ['Counted', line.basis],
    ['Fine weight', line.fineWeightGrams ? `${line.fineWeightGrams} (${line.fineWeightTroyOunces ?? '-'})` : null],
    ['Priced at', [line.spotPerTroyOunce ? `spot ${line.spotPerTroyOunce}` : null, line.rate ? `rate ${line.rate}` : null].filter(Boolean).join('; ') || null],
  ];
  const shown = details.filter((d): d is [string, string] => Boolean(d[1]));
  ensure(30 + shown.length * 11.5);
  const top = doc.y;
  doc.font('Helvetica-Bold').fontSize(10.5).fillColor(INK).text(`${line.position}. ${line.description}`, left, top, { width: detailWidth });
  doc.font('Helvetica').fontSize(8.5);
  for (const [label, value] of shown) {
    doc.fillColor(MUTED).text(`${label}: `, left + 12, doc.y, { continued: true, width: detailWidth - 12 }).fillColor(INK).text(value);
  }
  const detailBottom = doc.y;

  doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('Melt value', moneyX, top, { width: moneyWidth });
  doc.fillColor(INK).text(line.meltValue, moneyX, top, { width: moneyWidth, align: 'right' });
  doc.font('Helvetica-Bold').fontSize(10.5).text('Payout', moneyX, top + 13, { width: moneyWidth });
  doc.text(line.payout, moneyX, top + 13, { width: moneyWidth, align: 'right' });
  let rightBottom = top + 30;
  if (line.tagNumber) {
    const png = barcodes.get(line.tagNumber);
    if (png) doc.image(png, moneyX, top + 31, { width: moneyWidth, height: 24 });
    doc.font('Helvetica').fontSize(8.5).fillColor(INK).text(`Tag ${line.tagNumber}`, moneyX, top + 57, { width: moneyWidth, align: 'center' });
    if (line.holdUntil) doc.fillColor(MUTED).text(`Held until ${line.holdUntil}`, moneyX, doc.y, { width: moneyWidth, align: 'center' });
    rightBottom = doc.y;
  }
  doc.y = Math.max(detailBottom, rightBottom) + 4;
  doc.moveTo(left, doc.y).lineTo(left + CONTENT_WIDTH, doc.y).lineWidth(0.5).dash(2, { space: 2 }).strokeColor(RULE).stroke().undash();
  doc.y += 8;
}

export interface SignatureDrawing {
  viewBox: { x: number; y: number; width: number; height: number };
  strokeWidth: number;
  /** SVG path data, one entry per stroke; polylines and lines are turned into path data. */
  paths: string[];
}

/** Reads the strokes of a signature pad's SVG: <path d>, <polyline points>, <line>. Anything else is ignored. */
export function signatureDrawing(svg: string): SignatureDrawing | null {
  const attr = (tag: string, name: string) => new RegExp(`\\s${name}\\s*=\\s*("([^"]*)"|'([^']*)')`, 'i').exec(tag)?.slice(2).find((v) => v !== undefined);
  const root = /<svg\b[^>]*>/i.exec(svg)?.[0];
  if (!root) return null;
  const paths: string[] = [];
  for (const m of svg.matchAll(/<path\b[^>]*>/gi)) {
    const d = attr(m[0], 'd');
    if (d && /^[\sMmLlHhVvCcSsQqTtAaZz0-9.,eE+-]+$/.test(d)) paths.push(d);
  }
  for (const m of svg.matchAll(/<polyline\b[^>]*>/gi)) {
    const nums = (attr(m[0], 'points') ?? '').trim().split(/[\s,]+/).map(Number).filter(Number.isFinite);
    if (nums.length >= 4) {
      const pts: string[] = [];
      for (let i = 0; i + 1 < nums.length; i += 2) pts.push(`${i === 0 ? 'M' : 'L'}${nums[i]} ${nums[i + 1]}`);
      paths.push(pts.join(' '));
    }
  }
  for (const m of svg.matchAll(/<line\b[^>]*>/gi)) {
    const [x1, y1, x2, y2] = ['x1', 'y1', 'x2', 'y2'].map((n) => Number(attr(m[0], n) ?? 'NaN'));
    if ([x1, y1, x2, y2].every(Number.isFinite)) paths.push(`M${x1} ${y1} L${x2} ${y2}`);
  }
  if (!paths.length) return null;
  const vb = (attr(root, 'viewBox') ?? '').trim().split(/[\s,]+/).map(Number);
  let viewBox: SignatureDrawing['viewBox'];
  if (vb.length === 4 && vb.every(Number.isFinite) && vb[2]! > 0 && vb[3]! > 0) {
    viewBox = { x: vb[0]!, y: vb[1]!, width: vb[2]!, height: vb[3]! };
  } else {
    const w = parseFloat(attr(root, 'width') ?? '');
    const h = parseFloat(attr(root, 'height') ?? '');
    if (!(w > 0 && h > 0)) return null;
    viewBox = { x: 0, y: 0, width: w, height: h };
  }
  const strokeWidth = Number(/stroke-width\s*[=:]\s*["']?([0-9.]+)/i.exec(svg)?.[1] ?? '2');
  return { viewBox, strokeWidth: strokeWidth > 0 ? strokeWidth : 2, paths };
}

function drawSignature(doc: PDFKit.PDFDocument, svg: string, box: { x: number; y: number; width: number; height: number }): boolean {
  const drawing = signatureDrawing(svg);
  if (!drawing) return false;
  const { viewBox } = drawing;
  const k = Math.min(box.width / viewBox.width, box.height / viewBox.height);
  doc.save();
  doc.rect(box.x, box.y, box.width, box.height).clip();
  doc.translate(box.x, box.y).scale(k).translate(-viewBox.x, -viewBox.y);
  doc.lineWidth(Math.max(drawing.strokeWidth, 1.2 / k)).lineCap('round').lineJoin('round').strokeColor(INK);
  for (const d of drawing.paths) doc.path(d).stroke();
  doc.restore();
  return true;
}
