import { z } from 'zod';
import { ID_DOCUMENT_TYPES, METAL_VALUES, TEST_METHODS } from '@/db/enums';
import { quoteLineSchema, spotField } from '@/features/pricing/pricing.schema';
import { faceValueClass } from '@/features/pricing/coins';
import { optionalEmail, optionalText, requiredText } from '@/lib/zod-fields';

const isoDate = (field: string) =>
  z
    .string({ required_error: `${field} is required` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${field} must be a date written YYYY-MM-DD`)
    .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), `${field} is not a real date`);

const text = requiredText;

export const spotEntrySchema = z.object({
  metal: z.enum(METAL_VALUES, { errorMap: () => ({ message: 'metal must be gold, silver, platinum or palladium' }) }),
  pricePerTroyOunce: spotField,
});

export const sellerInputSchema = z
  .object({
    legalName: text('legalName', 160),
    email: optionalEmail(),
    phone: optionalText(40),
    idType: z.enum(ID_DOCUMENT_TYPES, { errorMap: () => ({ message: `idType must be one of ${ID_DOCUMENT_TYPES.join(', ')}` }) }),
    idNumber: text('idNumber', 60),
    idIssuingRegion: text('idIssuingRegion', 60),
    idExpiry: isoDate('idExpiry'),
    dateOfBirth: isoDate('dateOfBirth').refine((d) => d > '1900-01-01', 'dateOfBirth is not plausible'),
    addressLine1: text('addressLine1', 160),
    addressLine2: optionalText(160),
    city: text('city', 80),
    region: text('region', 80),
    postalCode: text('postalCode', 20),
    country: z.string().trim().toUpperCase().regex(/^[A-Z]{2}$/, 'country must be a two-letter code like US').default('US'),
  })
  .refine((s) => !!s.email || !!s.phone, { path: ['phone'], message: 'give an e-mail address or a phone number' });
export type SellerInput = z.infer<typeof sellerInputSchema>;

export const doNotBuySchema = z
  .object({ doNotBuy: z.boolean(), reason: optionalText(500) })
  .refine((v) => !v.doNotBuy || !!v.reason, { path: ['reason'], message: 'a reason is required to flag a seller do not buy' });

const raisePoints = z
  .union([z.string(), z.number()])
  .transform(String)
  .refine((v) => /^\d{1,2}(\.\d{1,2})?$/.test(v.trim()), 'raisePoints must be between 0 and 99.99 percentage points, like 2.5')
  .transform((v) => v.trim())
  .default('0');

/** A counter line: what the engine prices, plus what the clerk recorded about the item. */
export const counterLineSchema = z.object({
  item: quoteLineSchema,
  testMethod: z.enum(TEST_METHODS, { errorMap: () => ({ message: `testMethod must be one of ${TEST_METHODS.join(', ')}` }) }).default('none'),
  testResult: optionalText(200),
  note: optionalText(500),
  raisePoints,
}).transform((line) => {
  // A face-value line without a basis is counted on its class's counter basis; the saved line says which.
  const item = line.item;
  if (item.kind !== 'face-value' || item.basis) return line;
  return { ...line, item: { ...item, basis: faceValueClass(item.coinClass)!.counterBasis } };
});
export type CounterLineInput = z.input<typeof counterLineSchema>;

export const saveLinesSchema = z.object({
  lines: z.array(counterLineSchema).max(200, 'a ticket holds at most 200 lines'),
  ticketRaisePoints: raisePoints,
});
export type SaveLinesInput = z.output<typeof saveLinesSchema>;

export const createTicketSchema = z.object({
  sellerId: text('sellerId', 64),
  doNotBuyOverrideReason: optionalText(500),
});

export const acceptTicketSchema = z.object({
  signatureSvg: z
    .string({ required_error: 'signatureSvg is required: the seller signs on screen' })
    .max(200_000, 'signatureSvg is too large')
    .refine((s) => /^<svg[\s>][\s\S]*<\/svg>$/.test(s.trim()) && !/<script|on\w+=|javascript:|<foreignObject/i.test(s), 'signatureSvg must be a plain SVG drawing')
    .refine((s) => /<(path|polyline|line)\b/.test(s), 'signatureSvg is empty: the seller has not signed'),
  agreesToOwnershipStatement: z.literal(true, { errorMap: () => ({ message: 'the seller must agree to the statement of ownership' }) }),
});

export const payTicketSchema = z.discriminatedUnion(
  'method',
  [
    z.object({ method: z.literal('cash') }),
    z.object({ method: z.literal('check'), checkNumber: text('checkNumber', 40) }),
    z.object({ method: z.literal('electronic'), speed: z.enum(['standard', 'instant']).default('standard') }),
  ],
  { errorMap: () => ({ message: 'method must be cash, check or electronic' }) },
);

export const voidTicketSchema = z.object({ reason: text('reason', 500) });
export const declineTicketSchema = z.object({ reason: optionalText(500) });

export const moneyAmountSchema = (field: string) =>
  z
    .union([z.string(), z.number()])
    .transform(String)
    .refine((v) => /^\d{1,9}(\.\d{1,2})?$/.test(v.trim()), `${field} must be an amount like 250.00`)
    .transform((v) => v.trim());

export const openDrawerSchema = z.object({ float: moneyAmountSchema('float') });
export const closeDrawerSchema = z.object({ counted: moneyAmountSchema('counted') });

export const decideApprovalSchema = z.object({
  decision: z.enum(['approved', 'rejected'], { errorMap: () => ({ message: 'decision must be approved or rejected' }) }),
  note: optionalText(500),
  /** A manager approving on the clerk's screen signs in here instead of switching accounts. */
  managerEmail: z.string().trim().optional(),
  managerPassword: z.string().optional(),
});
