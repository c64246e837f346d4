import { sql } from 'drizzle-orm';
import {
  bigserial,
  boolean,
  check,
  date,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core';

export const ROLES = ['admin', 'manager', 'clerk', 'seller'] as const;
export type Role = (typeof ROLES)[number];

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

export const ID_DOCUMENT_TYPES = ['drivers-license', 'state-id', 'passport', 'national-id', 'residence-permit', 'military-id'] as const;
export type IdDocumentType = (typeof ID_DOCUMENT_TYPES)[number];

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

/** Append-only record of who did what; a trigger (migration 0001) refuses UPDATE and DELETE. */
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
  },
  (t) => [
    index('audit_log_entity_idx').on(t.entity, t.entityId),
    index('audit_log_store_at_idx').on(t.storeId, t.at),
    check('audit_log_action_format', sql`${t.action} ~ '^[a-z][a-z0-9_.-]*$'`),
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
