/**
 * The fixed lists the schema checks, kept free of the ORM so browser code (forms, the counter
 * island) can import them without shipping the database layer.
 */
export const ROLES = ['admin', 'manager', 'clerk', 'seller'] as const;
export type Role = (typeof ROLES)[number];

export const ID_DOCUMENT_TYPES = ['drivers-license', 'state-id', 'passport', 'national-id', 'residence-permit', 'military-id'] as const;
export type IdDocumentType = (typeof ID_DOCUMENT_TYPES)[number];

export const METAL_VALUES = ['gold', 'silver', 'platinum', 'palladium'] as const;

export const TICKET_STATES = ['draft', 'quoted', 'accepted', 'declined', 'paid', 'voided'] as const;
export type TicketState = (typeof TICKET_STATES)[number];

export const TEST_METHODS = ['none', 'acid', 'electronic', 'xrf', 'specific-gravity', 'magnet'] as const;
export type TestMethod = (typeof TEST_METHODS)[number];

export const PAYMENT_METHODS = ['cash', 'check', 'electronic'] as const;
