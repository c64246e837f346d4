/**
 * Demo data: an invented chain with two stores. Every name, address and number here is made up.
 * Safe to run again: rows are matched on their natural keys and never added twice.
 */
import { eq, sql } from 'drizzle-orm';
import { createDb } from '../src/db/client';
import { sellers, stores, users } from '../src/db/schema';
import { hashPassword } from '../src/features/auth/password';

export const DEMO_PASSWORD = 'cupel-demo-2026';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set');
const { db, close } = createDb(url, { max: 2 });

const chainName = 'Northgate Assay & Exchange';
const demoStores = [
  {
    code: 'HBR',
    name: 'Harbor Street',
    chainName,
    addressLine1: '214 Harbor Street',
    city: 'Port Alder',
    region: 'ME',
    postalCode: '04999',
    country: 'US',
    phone: '+1 207 555 0142',
  },
  {
    code: 'MLB',
    name: 'Millbrook',
    chainName,
    addressLine1: '9 Tannery Row, Unit 3',
    city: 'Millbrook Falls',
    region: 'VT',
    postalCode: '05999',
    country: 'US',
    phone: '+1 802 555 0178',
  },
];

async function main() {
  const storeIds: Record<string, string> = {};
  for (const s of demoStores) {
    await db.insert(stores).values(s).onConflictDoNothing({ target: stores.code });
    const [row] = await db.select({ id: stores.id }).from(stores).where(eq(stores.code, s.code));
    storeIds[s.code] = row!.id;
  }

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const demoUsers = [
    { name: 'Ada Lindqvist', email: 'ada.admin@northgate-assay.example', role: 'admin' as const, store: 'HBR' },
    { name: 'Marek Hollis', email: 'marek.manager@northgate-assay.example', role: 'manager' as const, store: 'HBR' },
    { name: 'Clara Whitcombe', email: 'clara.clerk@northgate-assay.example', role: 'clerk' as const, store: 'HBR' },
    { name: 'Cole Varga', email: 'cole.clerk@northgate-assay.example', role: 'clerk' as const, store: 'MLB' },
    { name: 'Sam Ortega-Blythe', email: 'sam.seller@example.net', role: 'seller' as const, store: 'HBR' },
    { name: 'Rosa Quillfeather', email: 'rosa.seller@example.net', role: 'seller' as const, store: 'HBR' },
    { name: 'Theo Marchetti', email: 'theo.seller@example.net', role: 'seller' as const, store: 'MLB' },
  ];
  const userIds: Record<string, string> = {};
  for (const u of demoUsers) {
    const [existing] = await db.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = ${u.email}`);
    if (existing) {
      userIds[u.email] = existing.id;
      continue;
    }
    const [created] = await db
      .insert(users)
      .values({ name: u.name, email: u.email, role: u.role, storeId: storeIds[u.store]!, passwordHash, emailVerified: new Date() })
      .returning({ id: users.id });
    userIds[u.email] = created!.id;
  }

  const demoSellers = [
    {
      legalName: 'Samuel Ortega-Blythe',
      email: 'sam.seller@example.net',
      phone: '+1 207 555 0191',
      idType: 'drivers-license' as const,
      idNumber: 'D-4471-9920',
      idIssuingRegion: 'ME',
      idExpiry: '2029-06-30',
      dateOfBirth: '1971-03-14',
      addressLine1: '52 Gull Lane',
      city: 'Port Alder',
      region: 'ME',
      postalCode: '04999',
      country: 'US',
      store: 'HBR',
    },
    {
      legalName: 'Rosa Quillfeather',
      email: 'rosa.seller@example.net',
      phone: '+1 207 555 0133',
      idType: 'passport' as const,
      idNumber: 'X00918273',
      idIssuingRegion: 'US',
      idExpiry: '2031-11-02',
      dateOfBirth: '1988-09-02',
      addressLine1: '7 Lantern Court, Apt 2B',
      city: 'Port Alder',
      region: 'ME',
      postalCode: '04998',
      country: 'US',
      store: 'HBR',
    },
    {
      legalName: 'Theodore Marchetti',
      email: 'theo.seller@example.net',
      phone: '+1 802 555 0164',
      idType: 'state-id' as const,
      idNumber: 'VT-2038-5561',
      idIssuingRegion: 'VT',
      idExpiry: '2026-02-28',
      dateOfBirth: '1959-12-20',
      addressLine1: '310 Old Mill Road',
      city: 'Millbrook Falls',
      region: 'VT',
      postalCode: '05999',
      country: 'US',
      store: 'MLB',
    },
  ];
  for (const { store, ...s } of demoSellers) {
    await db
      .insert(sellers)
      .values({ ...s, storeId: storeIds[store]!, userId: userIds[s.email] ?? null })
      .onConflictDoNothing();
  }

  const [{ n: userCount } = { n: 0 }] = await db.select({ n: sql<number>`count(*)::int` }).from(users);
  const [{ n: sellerCount } = { n: 0 }] = await db.select({ n: sql<number>`count(*)::int` }).from(sellers);
  console.log(`demo data ready: ${demoStores.length} stores, ${userCount} users, ${sellerCount} sellers`);
}

try {
  await main();
} finally {
  await close();
}
