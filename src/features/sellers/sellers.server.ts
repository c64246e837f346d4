import { eq } from 'drizzle-orm';
import { sellers, stores } from '@/db/schema';
import type { DbOrTx } from '@/db/client';

/** The seller records linked to a portal account (one per store the person sells at). */
export async function sellerRecordsForUser(db: DbOrTx, userId: string) {
  return db
    .select({
      id: sellers.id,
      legalName: sellers.legalName,
      email: sellers.email,
      phone: sellers.phone,
      idType: sellers.idType,
      idNumber: sellers.idNumber,
      idExpiry: sellers.idExpiry,
      addressLine1: sellers.addressLine1,
      addressLine2: sellers.addressLine2,
      city: sellers.city,
      region: sellers.region,
      postalCode: sellers.postalCode,
      storeName: stores.name,
    })
    .from(sellers)
    .innerJoin(stores, eq(stores.id, sellers.storeId))
    .where(eq(sellers.userId, userId));
}
