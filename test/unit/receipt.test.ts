import { describe, expect, it } from 'vitest';
import {
  buildReceipt,
  holdTags,
  perThousand,
  receiptPlainText,
  receiptUnavailableReason,
  ReceiptUnavailableError,
  svgDataUri,
  tagsUnavailableReason,
  type ReceiptSource,
  type ReceiptSourceLine,
} from '@/features/receipts/receipt';

const SIGNATURE = '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 100 40"><path d="M5 30 C 20 5, 40 5, 60 30 S 90 40, 95 10" stroke="black" fill="none"/></svg>';

function line(overrides: Partial<ReceiptSourceLine> = {}): ReceiptSourceLine {
  return {
    position: 1,
    description: 'Sterling flatware, 6 pieces',
    input: { item: { kind: 'weight', category: 'flatware', mark: 'STERLING' }, testMethod: 'acid', testResult: 'holds at 925 acid' },
    testMethod: 'acid',
    testResult: 'holds at 925 acid',
    metal: 'silver',
    markedFineness: '0.925000',
    paidOnFineness: '0.900000',
    grossWeightGrams: '412.6000',
    netWeightGrams: '316.6000',
    fineWeightGrams: '284.9400',
    fineWeightTroyOunces: '9.160990',
    spotPerTroyOunce: '30.0000',
    rateLabel: '75% of melt',
    meltValueMinor: 27483,
    payoutMinor: 20612,
    marginMinor: 6871,
    tagNumber: 'HBR-000042-01',
    holdUntil: '2025-03-19',
    ...overrides,
  };
}

const LINES: ReceiptSourceLine[] = [
  line(),
  line({
    position: 2,
    description: '14K ring with stone',
    input: { item: { kind: 'weight', category: 'jewelry', mark: '14K' } },
    testMethod: 'electronic',
    testResult: 'reads 14K',
    metal: 'gold',
    markedFineness: '0.583333',
    paidOnFineness: '0.560000',
    grossWeightGrams: '5.4200',
    netWeightGrams: '5.1100',
    fineWeightGrams: '2.8616',
    fineWeightTroyOunces: '0.092003',
    spotPerTroyOunce: '2400.0000',
    rateLabel: '80% of melt',
    meltValueMinor: 22081,
    payoutMinor: 17665,
    marginMinor: 4416,
    tagNumber: 'HBR-000042-02',
  }),
  line({
    position: 3,
    description: 'US dime, 90% silver (1964 and earlier) x 10',
    input: { item: { kind: 'coin', coinType: 'us-90-dime', count: 10 } },
    testMethod: 'none',
    testResult: null,
    metal: 'silver',
    markedFineness: '0.900000',
    paidOnFineness: '0.900000',
    grossWeightGrams: '25.0000',
    netWeightGrams: '25.0000',
    fineWeightGrams: '22.2390',
    fineWeightTroyOunces: '0.715000',
    spotPerTroyOunce: '30.0000',
    rateLabel: '90% of melt',
    meltValueMinor: 2145,
    payoutMinor: 1931,
    marginMinor: 214,
    tagNumber: 'HBR-000042-03',
  }),
];

function ticket(overrides: Partial<ReceiptSource> = {}): ReceiptSource {
  return {
    number: 42,
    reference: 'HBR-000042',
    state: 'paid',
    stateLabel: 'Paid',
    currency: 'USD',
    meltValueMinor: 51709,
    payoutMinor: 40208,
    marginMinor: 11501,
    acceptedAt: new Date('2025-03-04T19:03:10Z'),
    paidAt: new Date('2025-03-04T19:07:00Z'),
    voidedAt: null,
    voidReason: null,
    holdUntil: '2025-03-19',
    signatureSvg: SIGNATURE,
    ownershipStatement: 'I declare that I am the lawful owner of the items listed, or am authorised by their owner to sell them, that they are not stolen, and that the identification I presented is my own.',
    pricingBasis: { spot: { silver: { pricePerTroyOunce: '30.0000', enteredAt: '2025-03-04T14:00:00.000Z' }, gold: { pricePerTroyOunce: '2400.0000', enteredAt: '2025-03-04T14:00:00.000Z' } } },
    store: { code: 'HBR', name: 'Quillmere Metal Exchange', address: '18 Lantern Row, Port Alder, ME 04999', phone: '(207) 555-0142', timeZone: 'America/New_York' },
    clerkName: 'Dana Ilves',
    seller: {
      legalName: 'Morgan T. Avery',
      addressLine1: '77 Quarry Lane',
      addressLine2: 'Apt 3',
      city: 'Millbrook Falls',
      region: 'NH',
      postalCode: '03820',
      country: 'US',
      idType: 'drivers-license',
      idNumber: 'NHL44719920',
      idIssuingRegion: 'NH',
    },
    lines: LINES,
    payments: [{ kind: 'payout', method: 'check', amountMinor: 40208, checkNumber: '10457', state: 'completed', createdAt: new Date('2025-03-04T19:07:00Z') }],
    ...overrides,
  };
}

describe('buildReceipt', () => {
  const receipt = buildReceipt(ticket());

  it('formats every total exactly from integer minor units', () => {
    expect(receipt.totals.meltValue).toBe('$517.09');
    expect(receipt.totals.payout).toBe('$402.08');
    expect(receipt.totals.margin).toBe('$115.01');
    expect(receipt.totals.payoutPercentOfMelt).toBe('77.76%');
    expect(receipt.totals.marginPercentOfMelt).toBe('22.24%');
  });

  it('states the margin in plain words with the same figures as the totals', () => {
    expect(receipt.marginStatement).toBe("Melt value $517.09. We pay $402.08, which is 77.76% of melt value; the store's margin is $115.01.");
    for (const figure of [receipt.totals.meltValue, receipt.totals.payout, receipt.totals.margin, receipt.totals.payoutPercentOfMelt]) {
      expect(receipt.marginStatement).toContain(figure);
    }
  });

  it('has line rows that add up to the totals', () => {
    const sum = (key: 'meltValueMinor' | 'payoutMinor' | 'marginMinor') => receipt.lines.reduce((a, l) => a + l[key], 0);
    expect(sum('meltValueMinor')).toBe(receipt.totals.meltValueMinor);
    expect(sum('payoutMinor')).toBe(receipt.totals.payoutMinor);
    expect(sum('marginMinor')).toBe(receipt.totals.marginMinor);
    expect(receipt.lines.map((l) => l.payout)).toEqual(['$206.12', '$176.65', '$19.31']);
  });

  it('prints weights with units, fineness per thousand and the marked fineness only when it differs', () => {
    const [flatware, ring, dimes] = receipt.lines;
    expect(flatware).toMatchObject({
      mark: 'STERLING',
      test: 'Acid test: holds at 925 acid',
      metal: 'Silver',
      grossWeight: '412.60 g',
      netWeight: '316.60 g',
      fineness: '900/1000 (marked 925/1000)',
      fineWeightGrams: '284.94 g',
      fineWeightTroyOunces: '9.16099 ozt',
      spotPerTroyOunce: '$30.00 per ozt',
      rate: '75% of melt',
      meltValue: '$274.83',
    });
    expect(ring!.fineness).toBe('560/1000 (marked 583.3/1000)');
    expect(ring!.fineWeightGrams).toBe('2.8616 g');
    expect(ring!.spotPerTroyOunce).toBe('$2,400.00 per ozt');
    expect(dimes!.fineness).toBe('900/1000');
    expect(dimes!.test).toBe('Not tested (marked)');
    expect(dimes!.mark).toBeNull();
    expect(dimes!.fineWeightTroyOunces).toBe('0.715 ozt');
  });

  it('masks the seller ID to its last four characters', () => {
    expect(receipt.seller.idNumberMasked).toBe('•••••••9920');
    expect(receipt.seller.idNumberMasked).not.toContain('NHL4471');
    expect(receipt.seller.idDocument).toBe("Driver's license, NH");
    expect(JSON.stringify(receipt)).not.toContain('NHL44719920');
  });

  it('gives the date and time in the store time zone', () => {
    expect(receipt.dateTime).toBe('March 4, 2025 at 2:07 PM EST');
    expect(buildReceipt(ticket({ store: { ...ticket().store, timeZone: 'America/Los_Angeles' } })).dateTime).toBe('March 4, 2025 at 11:07 AM PST');
  });

  it('states the hold until date and the tag numbers, deferring to local law', () => {
    expect(receipt.hold.until).toBe('March 19, 2025');
    expect(receipt.hold.notice).toBe(
      'The items bought on this ticket are held until March 19, 2025, as local law requires, before they are melted or resold. Tag numbers: HBR-000042-01, HBR-000042-02, HBR-000042-03.',
    );
  });

  it('records the payment with method and check number', () => {
    expect(receipt.payments).toEqual([
      expect.objectContaining({ label: 'Paid to seller', method: 'Check', checkNumber: '10457', amount: '$402.08', state: 'Completed' }),
    ]);
    expect(receipt.paymentStatus).toBe('Paid $402.08 by check, check no. 10457.');
  });

  it('keeps the signature as a data URI image, never as markup to inline', () => {
    expect(receipt.signature!.dataUri.startsWith('data:image/svg+xml;base64,')).toBe(true);
    expect(Buffer.from(receipt.signature!.dataUri.split(',')[1]!, 'base64').toString('utf8')).toBe(SIGNATURE);
    expect(svgDataUri('<svg>é</svg>')).toBe(`data:image/svg+xml;base64,${Buffer.from('<svg>é</svg>').toString('base64')}`);
  });

  it('lists the spot prices the offer was priced on', () => {
    expect(receipt.spotsUsed.map((s) => `${s.metal} ${s.pricePerTroyOunce}`)).toEqual(['Silver $30.00 per ozt', 'Gold $2,400.00 per ozt']);
  });

  it('has no voided banner on a standing purchase, and a prominent one with the reason on a voided ticket', () => {
    expect(receipt.voided).toBeNull();
    const voided = buildReceipt(ticket({
      state: 'voided',
      stateLabel: 'Voided',
      voidedAt: new Date('2025-03-05T15:30:00Z'),
      voidReason: 'Seller brought the wrong bag; items returned',
      payments: [
        ...ticket().payments,
        { kind: 'reversal', method: 'check', amountMinor: 40208, checkNumber: null, state: 'completed', createdAt: new Date('2025-03-05T15:30:00Z') },
      ],
    }));
    expect(voided.voided).toEqual({ banner: 'VOIDED', reason: 'Seller brought the wrong bag; items returned', at: 'March 5, 2025 at 10:30 AM EST' });
    expect(voided.payments[1]).toMatchObject({ label: 'Payment reversed', amount: '-$402.08' });
    expect(voided.hold.notice).toMatch(/voided/);
    expect(receiptPlainText(voided)).toMatch(/^\*+\nVOIDED: Seller brought the wrong bag; items\nreturned\n/);
  });

  it('says payment is pending on an accepted ticket not yet paid', () => {
    const accepted = buildReceipt(ticket({ state: 'accepted', stateLabel: 'Accepted, awaiting payment', paidAt: null, holdUntil: null, payments: [], lines: LINES.map((l) => ({ ...l, tagNumber: null, holdUntil: null })) }));
    expect(accepted.paymentStatus).toMatch(/Not paid yet/);
    expect(accepted.hold.tagNumbers).toEqual([]);
    expect(accepted.hold.notice).toMatch(/local law requires/);
    expect(accepted.dateTime).toBe('March 4, 2025 at 2:03 PM EST');
  });

  it('refuses a ticket the seller has not accepted', () => {
    const quoted = ticket({ state: 'quoted', stateLabel: 'Offer shown', acceptedAt: null, paidAt: null });
    expect(receiptUnavailableReason(quoted)).toMatch(/HBR-000042 has no receipt: the seller has not accepted/);
    expect(() => buildReceipt(quoted)).toThrow(ReceiptUnavailableError);
  });

  it('formats other currencies with their own minor units', () => {
    const yen = buildReceipt(ticket({ currency: 'JPY', meltValueMinor: 51709, payoutMinor: 40208, marginMinor: 11501, lines: [] }));
    expect(yen.totals.payout).toBe('¥40,208');
  });
});

describe('hold tags', () => {
  it('gives one tag per tagged line with its hold line', () => {
    const tags = holdTags(buildReceipt(ticket()));
    expect(tags).toHaveLength(3);
    expect(tags[1]).toEqual({
      tagNumber: 'HBR-000042-02',
      reference: 'HBR-000042',
      description: '14K ring with stone',
      metal: 'Gold',
      netWeight: '5.11 g',
      holdUntil: 'March 19, 2025',
      holdLine: 'HOLD — do not melt or sell before March 19, 2025',
    });
  });

  it('are printed only for paid tickets', () => {
    expect(tagsUnavailableReason(ticket())).toBeNull();
    expect(tagsUnavailableReason(ticket({ state: 'accepted', stateLabel: 'Accepted, awaiting payment' }))).toMatch(/issued when the seller is paid/);
    expect(tagsUnavailableReason(ticket({ state: 'voided', stateLabel: 'Voided' }))).toMatch(/voided/);
  });
});

describe('receiptPlainText', () => {
  const receipt = buildReceipt(ticket());
  const text = receiptPlainText(receipt);

  it('states the same figures as the model', () => {
    for (const figure of ['$517.09', '$402.08', '$115.01', '22.24%', '$206.12', '$176.65', '$19.31', 'HBR-000042-03', '•••••••9920', 'March 19, 2025', 'check no. 10457']) {
      expect(text).toContain(figure);
    }
    expect(text.replace(/\s+/g, ' ')).toContain(receipt.marginStatement);
    expect(text).not.toContain('NHL44719920');
  });

  it('keeps to 48 columns', () => {
    for (const row of text.split('\n')) expect(row.length, row).toBeLessThanOrEqual(48);
  });
});

describe('perThousand', () => {
  it('writes fineness as the trade does', () => {
    expect(perThousand('0.925000')).toBe('925/1000');
    expect(perThousand('0.999900')).toBe('999.9/1000');
    expect(perThousand('0.416667')).toBe('416.7/1000');
  });
});

describe('coin counted by face value on the receipt', () => {
  const faceLine = (item: Record<string, unknown>) =>
    line({
      position: 1,
      description: 'US 40% silver half dollars (1965-1970), 10.00 face',
      input: { item: { kind: 'face-value', coinClass: 'us-40', faceValue: '10.00', ...item } },
      testMethod: 'none',
      testResult: null,
      markedFineness: '0.400000',
      paidOnFineness: '0.400000',
      grossWeightGrams: null,
      netWeightGrams: null,
      fineWeightGrams: '92.0040',
      fineWeightTroyOunces: '2.958000',
      rateLabel: '85% of melt',
      meltValueMinor: 8874,
      payoutMinor: 7543,
      marginMinor: 1331,
      tagNumber: null,
    });

  it('says which basis priced the line, in the model and the printed text', () => {
    const receipt = buildReceipt(ticket({ meltValueMinor: 8874, payoutMinor: 7543, marginMinor: 1331, lines: [faceLine({ basis: 'mint-weight' })] }));
    expect(receipt.lines[0]!.basis).toBe('10.00 face at 0.2958 ozt per 1.00 face, mint weight');
    const text = receiptPlainText(receipt).replace(/\s+/g, ' ');
    expect(text).toContain('Counted: 10.00 face at 0.2958 ozt per 1.00 face, mint weight');
  });

  it("reads a saved line without a basis as its class's counter basis, and 90% coin as circulated", () => {
    expect(buildReceipt(ticket({ lines: [faceLine({})] })).lines[0]!.basis).toBe('10.00 face at 0.2958 ozt per 1.00 face, mint weight');
    const ninety = faceLine({ coinClass: 'us-90', basis: 'common-practice' });
    expect(buildReceipt(ticket({ lines: [ninety] })).lines[0]!.basis).toBe('10.00 face at 0.715 ozt per 1.00 face, circulated, common practice');
  });

  it('has no basis for lines priced by weight or count', () => {
    for (const l of buildReceipt(ticket()).lines) expect(l.basis).toBeNull();
  });
});
