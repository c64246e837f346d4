import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { createDb } from '../src/db/client';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set');
  process.exit(1);
}
const handle = createDb(url, { max: 1 });
try {
  await migrate(handle.db, { migrationsFolder: new URL('../migrations', import.meta.url).pathname });
  console.log('migrations applied');
} finally {
  await handle.close();
}
