import { describe, expect, it } from 'vitest';
import { barcodeSvg } from '@/features/receipts/barcode.server';
import { buildReceipt, type ReceiptSource } from '@/features/receipts/receipt';
import { renderReceiptPdf, signatureDrawing } from '@/features/receipts/receipt-pdf.server';

function ticket(overrides: Partial<ReceiptSource> = {}): ReceiptSource {
  return {
    number: 7,
    reference: 'NPT-000007',
    state: 'paid',
    stateLabel: 'Paid',
    currency: 'USD',
    meltValueMinor: 125000,
    payoutMinor: 100000,
    marginMinor: 25000,
    acceptedAt: new Date('2025-06-10T15:00:00Z'),
    paidAt: new Date('2025-06-10T15:04:00Z'),
    voidedAt: null,
    voidReason: null,
    holdUntil: '2025-06-24',
    signatureSvg: '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 300 100"><polyline points="10,80 60,20 110,70 160,30" fill="none" stroke="#000" stroke-width="3"/></svg>',
    ownershipStatement: 'I declare that I am the lawful owner of the items listed and that they are not stolen.',
    store: { code: 'NPT', name: 'Northpoint Assay Counter', address: '4 Mill Yard, Burlington, VT 05401', phone: '(802) 555-0190', timeZone: 'America/New_York' },
    clerkName: 'Ravi Okafor',
    seller: {
      legalName: 'Jo Lindqvist',
      addressLine1: '12 Birch Hollow',
      addressLine2: null,
      city: 'Essex',
      region: 'VT',
      postalCode: '05452',
      country: 'US',
      idType: 'passport',
      idNumber: 'X99881234',
      idIssuingRegion: 'US',
    },
    lines: [
      {
        position: 1,
        description: '18K chain',
        input: { item: { kind: 'weight', mark: '750' } },
        testMethod: 'xrf',
        testResult: 'reads 748',
        metal: 'gold',
        markedFineness: '0.750000',
        paidOnFineness: '0.740000',
        grossWeightGrams: '20.1000',
        netWeightGrams: '20.1000',
        fineWeightGrams: '14.8740',
        fineWeightTroyOunces: '0.478209',
        spotPerTroyOunce: '2613.9000',
        rateLabel: '80% of melt',
        meltValueMinor: 125000,
        payoutMinor: 100000,
        marginMinor: 25000,
        tagNumber: 'NPT-000007-01',
        holdUntil: '2025-06-24',
      },
    ],
    payments: [{ kind: 'payout', method: 'cash', amountMinor: 100000, checkNumber: null, state: 'completed', createdAt: new Date('2025-06-10T15:04:00Z') }],
    ...overrides,
  };
}

/** The text a PDF shows, read back from its uncompressed content streams (pdfkit writes hex strings in TJ arrays). */
function shownText(pdf: Uint8Array): string {
  const raw = Buffer.from(pdf).toString('latin1');
  const parts: string[] = [];
  for (const m of raw.matchAll(/\[([^\]]*)\]\s*TJ/g)) {
    const hex = [...m[1]!.matchAll(/<([0-9a-fA-F]*)>/g)].map((h) => h[1]).join('');
    parts.push(Buffer.from(hex, 'hex').toString('latin1'));
  }
  return parts.join('\n');
}

describe('renderReceiptPdf', () => {
  it('returns PDF bytes', async () => {
    const pdf = await renderReceiptPdf(buildReceipt(ticket()));
    expect(pdf).toBeInstanceOf(Uint8Array);
    expect(Buffer.from(pdf.subarray(0, 5)).toString('latin1')).toBe('%PDF-');
    expect(Buffer.from(pdf.subarray(-6)).toString('latin1')).toContain('%%EOF');
  });

  it('shows the reference, the payout, the margin statement and the masked ID', async () => {
    const model = buildReceipt(ticket());
    const text = shownText(await renderReceiptPdf(model, { compress: false }));
    expect(text).toContain('NPT-000007');
    expect(model.totals.payout).toBe('$1,000.00');
    expect(text).toContain('$1,000.00');
    expect(text).toContain('$1,250.00');
    expect(text).toContain('Tag NPT-000007-01');
    expect(text).toContain('\x95\x95\x95\x95\x951234');
    expect(text).not.toContain('X9988');
    expect(text.replace(/\n/g, '')).toContain(model.marginStatement);
  });

  it('embeds the tag barcode as an image and draws the signature strokes', async () => {
    const raw = Buffer.from(await renderReceiptPdf(buildReceipt(ticket()), { compress: false })).toString('latin1');
    expect(raw).toMatch(/\/Subtype \/Image/);
    expect(raw).toMatch(/10 80 m\s+60 20 l\s+110 70 l\s+160 30 l\s+S/);
  });

  it('prints VOIDED with the reason on a voided ticket', async () => {
    const text = shownText(await renderReceiptPdf(buildReceipt(ticket({ state: 'voided', stateLabel: 'Voided', voidedAt: new Date('2025-06-11T13:00:00Z', ), voidReason: 'Paid twice by mistake' })), { compress: false }));
    expect(text).toContain('VOIDED');
    expect(text).toContain('Reason: Paid twice by mistake');
  });
});

describe('signatureDrawing', () => {
  it('reads paths, polylines and lines with the viewBox', () => {
    const d = signatureDrawing('<svg viewBox="0 0 100 40"><path d="M5 30 C 20 5, 40 5, 60 30" stroke-width="2.5"/><polyline points="1,2 3,4"/><line x1="0" y1="0" x2="9" y2="9"/></svg>');
    expect(d).toEqual({ viewBox: { x: 0, y: 0, width: 100, height: 40 }, strokeWidth: 2.5, paths: ['M5 30 C 20 5, 40 5, 60 30', 'M1 2 L3 4', 'M0 0 L9 9'] });
  });

  it('falls back to width and height, and finds nothing in an empty drawing', () => {
    expect(signatureDrawing('<svg width="200" height="50"><path d="M0 0 L1 1"/></svg>')!.viewBox).toEqual({ x: 0, y: 0, width: 200, height: 50 });
    expect(signatureDrawing('<svg viewBox="0 0 10 10"></svg>')).toBeNull();
  });
});

describe('barcodeSvg', () => {
  it('draws a Code 128 barcode as SVG bars', () => {
    const svg = barcodeSvg('NPT-000007-01');
    expect(svg.trimStart().startsWith('<svg')).toBe(true);
    expect(svg).toMatch(/<(path|rect)\b/);
    expect(svg).not.toMatch(/<script/i);
  });

  it('differs for different texts', () => {
    expect(barcodeSvg('NPT-000007-01')).not.toBe(barcodeSvg('NPT-000007-02'));
  });
});
