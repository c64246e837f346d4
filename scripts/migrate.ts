/**
 * Applies the migrations as the owner role (MIGRATION_DATABASE_URL), then gives the application's
 * role (the user of DATABASE_URL) its rights: see scripts/grants.ts.
 */
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { createDb } from '../src/db/client';
import { grantAppRole } from './grants';

const ownerUrl = process.env.MIGRATION_DATABASE_URL;
const appUrl = process.env.DATABASE_URL;
if (!ownerUrl || !appUrl) {
  console.error('Set MIGRATION_DATABASE_URL (the owner role, which runs migrations) and DATABASE_URL (the application\u2019s role)');
  process.exit(1);
}
const appRole = decodeURIComponent(new URL(appUrl).username);
const handle = createDb(ownerUrl, { max: 1 });
try {
  await migrate(handle.db, { migrationsFolder: new URL('../migrations', import.meta.url).pathname });
  await grantAppRole(handle.sql, appRole);
  console.log(`migrations applied; ${appRole} has the application's rights`);
} finally {
  await handle.close();
}
