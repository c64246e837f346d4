import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  boolean,
  check,
  date,
  index,
  integer,
  jsonb,
  numeric,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core';
import { ID_DOCUMENT_TYPES, METAL_VALUES, PAYMENT_METHODS, ROLES, TEST_METHODS, TICKET_STATES } from './enums';

export * from './enums';


const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();
const updatedAt = () =>
  timestamp('updated_at', { withTimezone: true })
    .notNull()
    .defaultNow()
    .$onUpdate(() => new Date());

/** A store is one buying counter; a chain may run several. Every business row carries store_id. */
export const stores = pgTable(
  'stores',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    code: text('code').notNull(),
    name: text('name').notNull(),
    chainName: text('chain_name').notNull(),
    addressLine1: text('address_line1').notNull(),
    addressLine2: text('address_line2'),
    city: text('city').notNull(),
    region: text('region').notNull(),
    postalCode: text('postal_code').notNull(),
    country: text('country').notNull(),
    phone: text('phone'),
    currency: text('currency').notNull().default('USD'),
    timeZone: text('time_zone').notNull().default('America/New_York'),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('stores_code_unique').on(t.code),
    check('stores_code_format', sql`${t.code} ~ '^[A-Z0-9]{2,12}$'`),
    check('stores_currency_format', sql`${t.currency} ~ '^[A-Z]{3}$'`),
    check('stores_country_format', sql`${t.country} ~ '^[A-Z]{2}$'`),
    check('stores_name_not_blank', sql`length(trim(${t.name})) > 0`),
  ],
);

/**
 * Staff and seller accounts. The id, name, email, email_verified and image columns are the
 * shape the Auth.js adapter expects, so the portal's e-mail sign-in can use this table as is.
 */
export const users = pgTable(
  'users',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    name: text('name').notNull(),
    email: text('email').notNull(),
    emailVerified: timestamp('email_verified', { withTimezone: true, mode: 'date' }),
    image: text('image'),
    passwordHash: text('password_hash'),
    role: text('role', { enum: ROLES }).notNull(),
    storeId: text('store_id').references(() => stores.id, { onDelete: 'restrict' }),
    active: boolean('active').notNull().default(true),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('users_email_unique').on(sql`lower(${t.email})`),
    check('users_role_valid', sql`${t.role} in ('admin', 'manager', 'clerk', 'seller')`),
    check('users_email_format', sql`${t.email} ~ '^[^@\\s]+@[^@\\s]+\\.[^@\\s]+$'`),
    check('users_store_required', sql`${t.role} = 'admin' or ${t.storeId} is not null`),
    // bcrypt hashes only: $2a$/$2b$/$2y$, cost, 53 characters of salt and digest.
    check('users_password_is_bcrypt', sql`${t.passwordHash} is null or ${t.passwordHash} ~ '^\\$2[aby]\\$[0-9]{2}\\$.{53}$'`),
    check('users_staff_have_password', sql`${t.role} = 'seller' or ${t.passwordHash} is not null`),
    index('users_store_idx').on(t.storeId),
  ],
);

/** Auth.js adapter tables, kept for the portal's e-mail link sign-in. */
export const accounts = pgTable(
  'accounts',
  {
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    type: text('type').notNull(),
    provider: text('provider').notNull(),
    providerAccountId: text('provider_account_id').notNull(),
    refresh_token: text('refresh_token'),
    access_token: text('access_token'),
    expires_at: integer('expires_at'),
    token_type: text('token_type'),
    scope: text('scope'),
    id_token: text('id_token'),
    session_state: text('session_state'),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })],
);

export const sessions = pgTable('sessions', {
  sessionToken: text('session_token').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull(),
});

export const verificationTokens = pgTable(
  'verification_tokens',
  {
    identifier: text('identifier').notNull(),
    token: text('token').notNull(),
    expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);


/** The people who sell metal at the counter. */
export const sellers = pgTable(
  'sellers',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    legalName: text('legal_name').notNull(),
    email: text('email'),
    phone: text('phone'),
    idType: text('id_type', { enum: ID_DOCUMENT_TYPES }).notNull(),
    idNumber: text('id_number').notNull(),
    idIssuingRegion: text('id_issuing_region').notNull(),
    idExpiry: date('id_expiry', { mode: 'string' }).notNull(),
    dateOfBirth: date('date_of_birth', { mode: 'string' }).notNull(),
    addressLine1: text('address_line1').notNull(),
    addressLine2: text('address_line2'),
    city: text('city').notNull(),
    region: text('region').notNull(),
    postalCode: text('postal_code').notNull(),
    country: text('country').notNull(),
    doNotBuy: boolean('do_not_buy').notNull().default(false),
    doNotBuyReason: text('do_not_buy_reason'),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('sellers_id_document_unique').on(t.storeId, t.idType, t.idIssuingRegion, t.idNumber),
    uniqueIndex('sellers_user_unique').on(t.userId),
    index('sellers_store_name_idx').on(t.storeId, t.legalName),
    check('sellers_legal_name_not_blank', sql`length(trim(${t.legalName})) > 0`),
    check('sellers_id_number_not_blank', sql`length(trim(${t.idNumber})) > 0`),
    check('sellers_id_type_valid', sql`${t.idType} in ('drivers-license', 'state-id', 'passport', 'national-id', 'residence-permit', 'military-id')`),
    check('sellers_birth_plausible', sql`${t.dateOfBirth} > '1900-01-01'`),
    check('sellers_country_format', sql`${t.country} ~ '^[A-Z]{2}$'`),
    check('sellers_do_not_buy_reason', sql`not ${t.doNotBuy} or ${t.doNotBuyReason} is not null`),
    check('sellers_contact_present', sql`${t.email} is not null or ${t.phone} is not null`),
  ],
);

export const SETTING_TYPES = ['integer', 'decimal', 'boolean', 'string', 'json'] as const;

/** Per-store settings; the key's type is declared in src/features/settings/settings.ts and repeated here as a check. */
export const storeSettings = pgTable(
  'store_settings',
  {
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    valueType: text('value_type', { enum: SETTING_TYPES }).notNull(),
    value: jsonb('value').notNull(),
    updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
    updatedAt: updatedAt(),
  },
  (t) => [
    primaryKey({ columns: [t.storeId, t.key] }),
    check('store_settings_key_format', sql`${t.key} ~ '^[a-z][a-z0-9_.]{1,63}$'`),
    check('store_settings_type_valid', sql`${t.valueType} in ('integer', 'decimal', 'boolean', 'string', 'json')`),
    check(
      'store_settings_value_matches_type',
      sql`case ${t.valueType}
        when 'integer' then jsonb_typeof(${t.value}) = 'number' and (${t.value}::text)::numeric % 1 = 0
        when 'decimal' then jsonb_typeof(${t.value}) = 'string' and (${t.value} #>> '{}') ~ '^-?[0-9]+(\\.[0-9]+)?$'
        when 'boolean' then jsonb_typeof(${t.value}) = 'boolean'
        when 'string' then jsonb_typeof(${t.value}) = 'string'
        else true end`,
    ),
  ],
);

/**
 * Append-only record of who did what; a trigger (migration 0001) refuses UPDATE and DELETE, and the
 * application's role may only read and insert. Each row is chained into audit_chain when its
 * transaction commits (migration 0006).
 */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    storeId: text('store_id').references(() => stores.id, { onDelete: 'restrict' }),
    actorUserId: text('actor_user_id').references(() => users.id, { onDelete: 'restrict' }),
    action: text('action').notNull(),
    entity: text('entity').notNull(),
    entityId: text('entity_id').notNull(),
    before: jsonb('before'),
    after: jsonb('after'),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    /** The writing transaction, so the database can check that a change to a record on file was audited with it. */
    txId: bigint('tx_id', { mode: 'number' })
      .notNull()
      .default(sql`txid_current()`),
  },
  (t) => [
    index('audit_log_entity_idx').on(t.entity, t.entityId),
    index('audit_log_store_at_idx').on(t.storeId, t.at),
    index('audit_log_tx_idx').on(t.txId),
    check('audit_log_action_format', sql`${t.action} ~ '^[a-z][a-z0-9_.-]*$'`),
  ],
);

/**
 * The audit log as a hash chain, one entry per audit row in commit order, written only by the
 * database (a deferred trigger running as the owner): hash = sha256(prev_hash | position | row).
 * `select * from audit_chain_breaks()` lists any entry that does not verify.
 */
export const auditChain = pgTable(
  'audit_chain',
  {
    position: bigint('position', { mode: 'number' }).primaryKey(),
    auditId: bigint('audit_id', { mode: 'number' })
      .notNull()
      .references(() => auditLog.id, { onDelete: 'restrict' }),
    prevHash: text('prev_hash').notNull(),
    hash: text('hash').notNull(),
  },
  (t) => [
    uniqueIndex('audit_chain_audit_unique').on(t.auditId),
    check('audit_chain_position_positive', sql`${t.position} > 0`),
    check('audit_chain_hash_format', sql`${t.hash} ~ '^[0-9a-f]{64}$' and ${t.prevHash} ~ '^[0-9a-f]{64}$'`),
  ],
);

/** Failed staff sign-ins, for throttling. Keyed by normalised e-mail and by client address. */
export const signInFailures = pgTable(
  'sign_in_failures',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    emailKey: text('email_key').notNull(),
    clientAddress: text('client_address').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sign_in_failures_email_idx').on(t.emailKey, t.at), index('sign_in_failures_address_idx').on(t.clientAddress, t.at)],
);

// ---------------------------------------------------------------------------
// The counter: spot prices, tickets and their lines, approvals, drawers, payments, photos.
// Money is integer minor units (bigint, read as number); weights, fineness and prices are numeric
// and stay strings until they reach the pricing engine's decimal helpers.
// ---------------------------------------------------------------------------


/** Every spot entry is kept: who entered it, when and the value. The newest per metal is the one in force. */
export const spotPrices = pgTable(
  'spot_prices',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    metal: text('metal', { enum: METAL_VALUES }).notNull(),
    pricePerTroyOunce: numeric('price_per_troy_ounce', { precision: 14, scale: 4 }).notNull(),
    currency: text('currency').notNull(),
    enteredBy: text('entered_by')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    enteredAt: timestamp('entered_at', { withTimezone: true }).notNull().defaultNow(),
    source: text('source').notNull().default('manual'),
  },
  (t) => [
    index('spot_prices_store_metal_at_idx').on(t.storeId, t.metal, t.enteredAt),
    check('spot_prices_metal_valid', sql`${t.metal} in ('gold', 'silver', 'platinum', 'palladium')`),
    check('spot_prices_positive', sql`${t.pricePerTroyOunce} > 0`),
    check('spot_prices_currency_format', sql`${t.currency} ~ '^[A-Z]{3}$'`),
  ],
);

/** The next ticket number of each store; numbers are sequential per store and never reused. */
export const ticketCounters = pgTable('ticket_counters', {
  storeId: text('store_id')
    .primaryKey()
    .references(() => stores.id, { onDelete: 'cascade' }),
  lastNumber: integer('last_number').notNull().default(0),
});


export const tickets = pgTable(
  'tickets',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    number: integer('number').notNull(),
    sellerId: text('seller_id')
      .notNull()
      .references(() => sellers.id, { onDelete: 'restrict' }),
    clerkId: text('clerk_id')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    state: text('state', { enum: TICKET_STATES }).notNull().default('draft'),
    currency: text('currency').notNull(),
    /** A raise of every line's rate, in percentage points of melt, asked for by the clerk. */
    ticketRaisePoints: numeric('ticket_raise_points', { precision: 6, scale: 2 }).notNull().default('0'),
    doNotBuyOverrideBy: text('do_not_buy_override_by').references(() => users.id, { onDelete: 'restrict' }),
    doNotBuyOverrideReason: text('do_not_buy_override_reason'),
    /** What the quote was priced on: spot entries (id, value, time), rates and assumed finenesses. Frozen at acceptance. */
    pricingBasis: jsonb('pricing_basis'),
    meltValueMinor: bigint('melt_value_minor', { mode: 'number' }).notNull().default(0),
    payoutMinor: bigint('payout_minor', { mode: 'number' }).notNull().default(0),
    marginMinor: bigint('margin_minor', { mode: 'number' }).notNull().default(0),
    quotedAt: timestamp('quoted_at', { withTimezone: true }),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    declinedAt: timestamp('declined_at', { withTimezone: true }),
    paidAt: timestamp('paid_at', { withTimezone: true }),
    voidedAt: timestamp('voided_at', { withTimezone: true }),
    voidedBy: text('voided_by').references(() => users.id, { onDelete: 'restrict' }),
    voidReason: text('void_reason'),
    signatureSvg: text('signature_svg'),
    ownershipStatement: text('ownership_statement'),
    holdUntil: date('hold_until', { mode: 'string' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('tickets_store_number_unique').on(t.storeId, t.number),
    index('tickets_seller_idx').on(t.sellerId, t.createdAt),
    index('tickets_store_state_idx').on(t.storeId, t.state),
    check('tickets_state_valid', sql`${t.state} in ('draft', 'quoted', 'accepted', 'declined', 'paid', 'voided')`),
    check('tickets_number_positive', sql`${t.number} > 0`),
    check('tickets_amounts_sane', sql`${t.meltValueMinor} >= 0 and ${t.payoutMinor} >= 0 and ${t.marginMinor} = ${t.meltValueMinor} - ${t.payoutMinor}`),
    check('tickets_accepted_has_signature', sql`${t.acceptedAt} is null or (${t.signatureSvg} is not null and ${t.ownershipStatement} is not null and ${t.pricingBasis} is not null)`),
    check('tickets_state_times', sql`(${t.state} <> 'quoted' or ${t.quotedAt} is not null)
      and (${t.state} <> 'accepted' or ${t.acceptedAt} is not null)
      and (${t.state} <> 'declined' or ${t.declinedAt} is not null)
      and (${t.state} <> 'paid' or (${t.paidAt} is not null and ${t.acceptedAt} is not null and ${t.holdUntil} is not null))
      and (${t.state} <> 'voided' or (${t.voidedAt} is not null and ${t.voidedBy} is not null and ${t.voidReason} is not null))`),
    check('tickets_override_reason', sql`${t.doNotBuyOverrideBy} is null or ${t.doNotBuyOverrideReason} is not null`),
  ],
);


export const ticketLines = pgTable(
  'ticket_lines',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    ticketId: text('ticket_id')
      .notNull()
      .references(() => tickets.id, { onDelete: 'cascade' }),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    position: integer('position').notNull(),
    /** The line as the pricing engine takes it (weights, mark, fineness, coin type and count, deductions). */
    input: jsonb('input').notNull(),
    description: text('description').notNull(),
    testMethod: text('test_method', { enum: TEST_METHODS }).notNull().default('none'),
    testResult: text('test_result'),
    note: text('note'),
    /** Raise of this line's rate, in percentage points of melt, asked for by the clerk. */
    raisePoints: numeric('raise_points', { precision: 6, scale: 2 }).notNull().default('0'),
    // Priced by the server with the shared engine; kept for queries, receipts and review.
    metal: text('metal', { enum: METAL_VALUES }),
    markedFineness: numeric('marked_fineness', { precision: 10, scale: 6 }),
    paidOnFineness: numeric('paid_on_fineness', { precision: 10, scale: 6 }),
    grossWeightGrams: numeric('gross_weight_grams', { precision: 14, scale: 4 }),
    netWeightGrams: numeric('net_weight_grams', { precision: 14, scale: 4 }),
    fineWeightGrams: numeric('fine_weight_grams', { precision: 14, scale: 4 }),
    fineWeightTroyOunces: numeric('fine_weight_troy_ounces', { precision: 14, scale: 6 }),
    spotPerTroyOunce: numeric('spot_per_troy_ounce', { precision: 14, scale: 4 }),
    rateLabel: text('rate_label'),
    meltValueMinor: bigint('melt_value_minor', { mode: 'number' }).notNull().default(0),
    payoutMinor: bigint('payout_minor', { mode: 'number' }).notNull().default(0),
    marginMinor: bigint('margin_minor', { mode: 'number' }).notNull().default(0),
    /** Null while the line cannot be priced (a mark that needs a test, a spot missing). */
    pricingProblem: text('pricing_problem'),
    tagNumber: text('tag_number'),
    holdUntil: date('hold_until', { mode: 'string' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('ticket_lines_position_unique').on(t.ticketId, t.position),
    uniqueIndex('ticket_lines_tag_unique').on(t.storeId, t.tagNumber),
    check('ticket_lines_test_method_valid', sql`${t.testMethod} in ('none', 'acid', 'electronic', 'xrf', 'specific-gravity', 'magnet')`),
    check('ticket_lines_amounts_sane', sql`${t.meltValueMinor} >= 0 and ${t.payoutMinor} >= 0 and ${t.marginMinor} = ${t.meltValueMinor} - ${t.payoutMinor}`),
    check('ticket_lines_fineness_range', sql`${t.paidOnFineness} is null or (${t.paidOnFineness} > 0 and ${t.paidOnFineness} <= 1)`),
    check('ticket_lines_description_not_blank', sql`length(trim(${t.description})) > 0`),
  ],
);

export const APPROVAL_STATES = ['pending', 'approved', 'rejected'] as const;

/** A rate raise beyond the clerk's limit waits here for a manager. */
export const rateApprovals = pgTable(
  'rate_approvals',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    ticketId: text('ticket_id')
      .notNull()
      .references(() => tickets.id, { onDelete: 'cascade' }),
    lineId: text('line_id').references(() => ticketLines.id, { onDelete: 'cascade' }),
    requestedBy: text('requested_by')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    raisePoints: numeric('raise_points', { precision: 6, scale: 2 }).notNull(),
    state: text('state', { enum: APPROVAL_STATES }).notNull().default('pending'),
    decidedBy: text('decided_by').references(() => users.id, { onDelete: 'restrict' }),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
    note: text('note'),
    createdAt: createdAt(),
  },
  (t) => [
    index('rate_approvals_store_state_idx').on(t.storeId, t.state),
    check('rate_approvals_state_valid', sql`${t.state} in ('pending', 'approved', 'rejected')`),
    check('rate_approvals_decided', sql`(${t.state} = 'pending') = (${t.decidedBy} is null)`),
    check('rate_approvals_points_positive', sql`${t.raisePoints} > 0`),
  ],
);

/** A clerk's cash drawer: opened with a float, every cash payout recorded against it, closed with a count. */
export const cashDrawers = pgTable(
  'cash_drawers',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    clerkId: text('clerk_id')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    currency: text('currency').notNull(),
    floatMinor: bigint('float_minor', { mode: 'number' }).notNull(),
    openedAt: timestamp('opened_at', { withTimezone: true }).notNull().defaultNow(),
    closedAt: timestamp('closed_at', { withTimezone: true }),
    closedBy: text('closed_by').references(() => users.id, { onDelete: 'restrict' }),
    countedMinor: bigint('counted_minor', { mode: 'number' }),
    expectedMinor: bigint('expected_minor', { mode: 'number' }),
  },
  (t) => [
    uniqueIndex('cash_drawers_one_open_per_clerk').on(t.clerkId).where(sql`${t.closedAt} is null`),
    check('cash_drawers_float_nonnegative', sql`${t.floatMinor} >= 0`),
    check('cash_drawers_closed_complete', sql`(${t.closedAt} is null) = (${t.countedMinor} is null and ${t.closedBy} is null and ${t.expectedMinor} is null)`),
  ],
);

export const PAYMENT_KINDS = ['payout', 'reversal'] as const;
export const PAYMENT_STATES = ['pending', 'completed', 'failed'] as const;

/** Money paid to a seller, and its reversal when a paid ticket is voided. Never deleted. */
export const payments = pgTable(
  'payments',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    ticketId: text('ticket_id')
      .notNull()
      .references(() => tickets.id, { onDelete: 'restrict' }),
    kind: text('kind', { enum: PAYMENT_KINDS }).notNull().default('payout'),
    reversesPaymentId: text('reverses_payment_id'),
    method: text('method', { enum: PAYMENT_METHODS }).notNull(),
    state: text('state', { enum: PAYMENT_STATES }).notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    drawerId: text('drawer_id').references(() => cashDrawers.id, { onDelete: 'restrict' }),
    checkNumber: text('check_number'),
    /** Electronic payouts: the provider's transfer and payout, and the connected account paid. */
    providerAccountId: text('provider_account_id'),
    providerTransferId: text('provider_transfer_id'),
    providerPayoutId: text('provider_payout_id'),
    payoutSpeed: text('payout_speed', { enum: ['standard', 'instant'] }),
    failureReason: text('failure_reason'),
    /**
     * Electronic payments and reversals while they are being sent: the lease (one sender at a time;
     * a crashed sender's lease runs out), how many sends were tried, when the worker may try again
     * and the last provider error. A failed call leaves the payment pending; only the provider's
     * answer fails it.
     */
    sendingSince: timestamp('sending_since', { withTimezone: true }),
    sendAttempts: integer('send_attempts').notNull().default(0),
    nextSendAt: timestamp('next_send_at', { withTimezone: true }),
    lastError: text('last_error'),
    /** A reversal of an electronic payout: the provider's transfer reversal, or a manager's record of money recovered another way. */
    providerReversalId: text('provider_reversal_id'),
    recoveryNote: text('recovery_note'),
    completedBy: text('completed_by').references(() => users.id, { onDelete: 'restrict' }),
    completedAt: timestamp('completed_at', { withTimezone: true }),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    // A ticket is paid once: at most one payout that is pending or completed, enforced by the database.
    uniqueIndex('payments_one_live_payout_per_ticket').on(t.ticketId).where(sql`${t.kind} = 'payout' and ${t.state} in ('pending', 'completed')`),
    uniqueIndex('payments_one_reversal_per_payment').on(t.reversesPaymentId),
    index('payments_drawer_idx').on(t.drawerId),
    uniqueIndex('payments_provider_payout_unique').on(t.providerPayoutId),
    check('payments_electronic_has_account', sql`${t.method} <> 'electronic' or ${t.kind} <> 'payout' or ${t.providerAccountId} is not null`),
    check('payments_kind_valid', sql`${t.kind} in ('payout', 'reversal')`),
    check('payments_method_valid', sql`${t.method} in ('cash', 'check', 'electronic')`),
    check('payments_state_valid', sql`${t.state} in ('pending', 'completed', 'failed')`),
    check('payments_amount_positive', sql`${t.amountMinor} > 0`),
    check('payments_cash_has_drawer', sql`${t.method} <> 'cash' or ${t.drawerId} is not null`),
    check('payments_check_has_number', sql`${t.method} <> 'check' or ${t.kind} <> 'payout' or ${t.checkNumber} is not null`),
    check('payments_reversal_refers', sql`(${t.kind} = 'reversal') = (${t.reversesPaymentId} is not null)`),
    // The books never show electronic money returned that the provider did not confirm or a manager did not record.
    check(
      'payments_electronic_reversal_confirmed',
      sql`${t.kind} <> 'reversal' or ${t.method} <> 'electronic' or ${t.state} <> 'completed' or ${t.providerReversalId} is not null or ${t.recoveryNote} is not null`,
    ),
    index('payments_due_send_idx').on(t.state, t.nextSendAt),
  ],
);

export const PAYMENT_EXCEPTION_KINDS = ['payout-on-closed-ticket'] as const;

/**
 * Something about money that a manager must look at, raised instead of being settled silently: a
 * payout the provider completed on a ticket that is no longer accepted (voided after the payout
 * was sent, or changed by hand). Shown on the review page until a manager resolves it.
 */
export const paymentExceptions = pgTable(
  'payment_exceptions',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    ticketId: text('ticket_id')
      .notNull()
      .references(() => tickets.id, { onDelete: 'restrict' }),
    paymentId: text('payment_id')
      .notNull()
      .references(() => payments.id, { onDelete: 'restrict' }),
    kind: text('kind', { enum: PAYMENT_EXCEPTION_KINDS }).notNull(),
    message: text('message').notNull(),
    raisedAt: timestamp('raised_at', { withTimezone: true }).notNull().defaultNow(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedBy: text('resolved_by').references(() => users.id, { onDelete: 'restrict' }),
    resolutionNote: text('resolution_note'),
  },
  (t) => [
    uniqueIndex('payment_exceptions_once').on(t.paymentId, t.kind),
    index('payment_exceptions_open_idx').on(t.storeId, t.resolvedAt),
    check('payment_exceptions_kind_valid', sql`${t.kind} in ('payout-on-closed-ticket')`),
    check('payment_exceptions_resolved_complete', sql`(${t.resolvedAt} is null) = (${t.resolvedBy} is null and ${t.resolutionNote} is null)`),
  ],
);

export const PHOTO_KINDS = ['id-document', 'item'] as const;

/** Photos of ID documents and items, stored privately in S3-compatible storage. */
export const photos = pgTable(
  'photos',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    kind: text('kind', { enum: PHOTO_KINDS }).notNull(),
    sellerId: text('seller_id').references(() => sellers.id, { onDelete: 'restrict' }),
    ticketId: text('ticket_id').references(() => tickets.id, { onDelete: 'restrict' }),
    lineId: text('line_id').references(() => ticketLines.id, { onDelete: 'set null' }),
    objectKey: text('object_key').notNull(),
    contentType: text('content_type').notNull(),
    byteSize: integer('byte_size').notNull(),
    sha256: text('sha256').notNull(),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('photos_object_key_unique').on(t.objectKey),
    check('photos_kind_valid', sql`${t.kind} in ('id-document', 'item')`),
    check('photos_content_type_valid', sql`${t.contentType} in ('image/jpeg', 'image/png', 'image/webp')`),
    check('photos_size_limit', sql`${t.byteSize} > 0 and ${t.byteSize} <= 10485760`),
    check('photos_belongs', sql`${t.sellerId} is not null or ${t.ticketId} is not null`),
  ],
);

// ---------------------------------------------------------------------------
// Settlement: sellers' payout accounts at the payment provider, webhook events, the mail outbox.
// ---------------------------------------------------------------------------

/** A seller's connected account at the payment provider, for electronic payouts. */
export const sellerPayoutAccounts = pgTable(
  'seller_payout_accounts',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id')
      .notNull()
      .references(() => stores.id, { onDelete: 'restrict' }),
    sellerId: text('seller_id')
      .notNull()
      .references(() => sellers.id, { onDelete: 'restrict' }),
    providerAccountId: text('provider_account_id').notNull(),
    payoutsEnabled: boolean('payouts_enabled').notNull().default(false),
    externalAccountKind: text('external_account_kind', { enum: ['card', 'bank_account'] }),
    externalAccountLast4: text('external_account_last4'),
    externalAccountLabel: text('external_account_label'),
    instantAvailable: boolean('instant_available').notNull().default(false),
    /** The latest onboarding link, shown as a QR code on the seller-facing screen until it expires. */
    onboardingUrl: text('onboarding_url'),
    onboardingUrlExpiresAt: timestamp('onboarding_url_expires_at', { withTimezone: true }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('seller_payout_accounts_seller_unique').on(t.sellerId),
    uniqueIndex('seller_payout_accounts_provider_unique').on(t.providerAccountId),
    check('seller_payout_accounts_last4', sql`${t.externalAccountLast4} is null or ${t.externalAccountLast4} ~ '^[0-9]{4}$'`),
  ],
);

export const INBOX_STATES = ['received', 'applied', 'dead'] as const;

/**
 * The webhook inbox, the outbox's mirror: every provider event is stored (by its id, so a repeated
 * delivery is stored once) and applied in one transaction with its state set to applied. An event
 * whose application failed or never ran (a crash) stays received; the worker applies it later.
 */
export const providerEvents = pgTable(
  'provider_events',
  {
    eventId: text('event_id').primaryKey(),
    type: text('type').notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    /** The verified event as the provider sent it (text, parsed once when applied). */
    payload: text('payload'),
    state: text('state', { enum: INBOX_STATES }).notNull().default('received'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    lastError: text('last_error'),
    appliedAt: timestamp('applied_at', { withTimezone: true }),
  },
  (t) => [
    index('provider_events_due_idx').on(t.state, t.nextAttemptAt),
    check('provider_events_state_valid', sql`${t.state} in ('received', 'applied', 'dead')`),
    check('provider_events_received_has_payload', sql`${t.state} <> 'received' or ${t.payload} is not null`),
  ],
);

export const OUTBOX_KINDS = ['receipt', 'payout-confirmation', 'onboarding-link', 'portal-sign-in'] as const;
export const OUTBOX_STATES = ['pending', 'sent', 'dead'] as const;

/**
 * E-mail waiting to be sent. Written in the same transaction as the change that causes it; a worker
 * sends it and retries with backoff, so nothing is lost while the mail server is down.
 */
export const outboxMessages = pgTable(
  'outbox_messages',
  {
    id: text('id').primaryKey().$defaultFn(() => crypto.randomUUID()),
    storeId: text('store_id').references(() => stores.id, { onDelete: 'restrict' }),
    kind: text('kind', { enum: OUTBOX_KINDS }).notNull(),
    toAddress: text('to_address').notNull(),
    subject: text('subject').notNull(),
    textBody: text('text_body').notNull(),
    htmlBody: text('html_body').notNull(),
    /** What to attach, rendered at send time (e.g. the receipt PDF of a ticket). */
    attachTicketReceiptId: text('attach_ticket_receipt_id').references(() => tickets.id, { onDelete: 'restrict' }),
    state: text('state', { enum: OUTBOX_STATES }).notNull().default('pending'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    lastError: text('last_error'),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    index('outbox_due_idx').on(t.state, t.nextAttemptAt),
    check('outbox_kind_valid', sql`${t.kind} in ('receipt', 'payout-confirmation', 'onboarding-link', 'portal-sign-in')`),
    check('outbox_state_valid', sql`${t.state} in ('pending', 'sent', 'dead')`),
    check('outbox_sent_has_time', sql`(${t.state} = 'sent') = (${t.sentAt} is not null)`),
  ],
);
