/**
 * Demo data: an invented chain with two stores. Every name, address and number here is made up.
 * Safe to run again: rows are matched on their natural keys and never added twice.
 */
import { eq, sql } from 'drizzle-orm';
import { createDb } from '../src/db/client';
import { sellers, stores, users } from '../src/db/schema';
import { hashPassword } from '../src/features/auth/password';
import { loadActiveUser } from '../src/features/auth/users.server';
import { saveLinesSchema } from '../src/features/counter/counter.schema';
import { enterSpot, currentSpots } from '../src/features/counter/spot.server';
import { acceptTicket, createTicket, payTicket, quoteTicket, repriceOpenTickets, saveLines } from '../src/features/counter/tickets.server';
import { tickets } from '../src/db/schema';

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

  await demoCounterActivity(storeIds, userIds);

  const [{ n: userCount } = { n: 0 }] = await db.select({ n: sql<number>`count(*)::int` }).from(users);
  const [{ n: sellerCount } = { n: 0 }] = await db.select({ n: sql<number>`count(*)::int` }).from(sellers);
  console.log(`demo data ready: ${demoStores.length} stores, ${userCount} users, ${sellerCount} sellers`);
}

/** Demo spot prices (invented figures, not market data) and two tickets: one paid by check, one offer shown. */
async function demoCounterActivity(storeIds: Record<string, string>, userIds: Record<string, string>) {
  const admin = (await loadActiveUser(db, userIds['ada.admin@northgate-assay.example']!))!;
  const clerk = (await loadActiveUser(db, userIds['clara.clerk@northgate-assay.example']!))!;
  const demoSpot = { gold: '2400.00', silver: '30.00', platinum: '950.00', palladium: '1000.00' } as const;
  for (const storeId of Object.values(storeIds)) {
    if (Object.keys(await currentSpots(db, storeId)).length > 0) continue;
    for (const [metal, price] of Object.entries(demoSpot)) {
      await enterSpot(db, admin, storeId, { metal: metal as keyof typeof demoSpot, pricePerTroyOunce: price }, repriceOpenTickets);
    }
  }
  const hbr = storeIds.HBR!;
  const [existing] = await db.select({ id: tickets.id }).from(tickets).where(eq(tickets.storeId, hbr)).limit(1);
  if (existing) return;
  const sellerRows = await db.select({ id: sellers.id, email: sellers.email }).from(sellers).where(eq(sellers.storeId, hbr));
  const sam = sellerRows.find((r) => r.email === 'sam.seller@example.net')!;
  const rosa = sellerRows.find((r) => r.email === 'rosa.seller@example.net')!;
  const signature = '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 600 180"><path d="M 40 130 C 90 40, 140 40, 180 120 S 260 160, 300 70 L 340 120 L 380 60" stroke="black" stroke-width="3" fill="none"/></svg>';

  const paid = await createTicket(db, clerk, hbr, { sellerId: sam.id, doNotBuyOverrideReason: null });
  await saveLines(
    db,
    clerk,
    paid.id,
    saveLinesSchema.parse({
      lines: [
        { item: { kind: 'weight', category: 'flatware', mark: 'STERLING', grossWeight: { value: '398.2', unit: 'g' }, deductions: [{ kind: 'grams', value: '88.0', reason: 'knife blades and handle filler' }], description: 'Sterling dinner forks and knives, 8 pieces' }, testMethod: 'acid', testResult: 'holds at 925 acid' },
        { item: { kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '6.12', unit: 'g' }, deductions: [{ kind: 'grams', value: '0.40', reason: 'three small stones' }], description: '14K ring with stones' }, testMethod: 'electronic', testResult: 'reads 14K' },
        { item: { kind: 'coin', coinType: 'us-90-quarter', count: 12 }, testMethod: 'none' },
      ],
    }),
  );
  await quoteTicket(db, clerk, paid.id);
  await acceptTicket(db, clerk, paid.id, { signatureSvg: signature });
  await payTicket(db, clerk, paid.id, { method: 'check', checkNumber: '100214' });

  const offer = await createTicket(db, clerk, hbr, { sellerId: rosa.id, doNotBuyOverrideReason: null });
  await saveLines(
    db,
    clerk,
    offer.id,
    saveLinesSchema.parse({
      lines: [
        { item: { kind: 'weight', category: 'jewelry', mark: '18K', grossWeight: { value: '4.8', unit: 'dwt' }, description: '18K chain' }, testMethod: 'acid', testResult: 'holds at 18K acid' },
        { item: { kind: 'weight', category: 'jewelry', mark: '950', grossWeight: { value: '3.1', unit: 'g' }, description: 'band marked 950' }, testMethod: 'none' },
      ],
    }),
  );
}

try {
  await main();
} finally {
  await close();
}
