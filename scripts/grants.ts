/**
 * The application's database role and its rights. Migrations run as the owner role, which owns
 * every table; the application, the worker and the seed connect as a separate role that owns
 * nothing (so it cannot DISABLE TRIGGER or change the schema) and has only the rights below.
 *
 * Applied by scripts/migrate.ts after every run, and set as the owner's default privileges, so a
 * table a later migration adds is readable and writable by the application without an edit here.
 * Only tables that must be narrower are listed.
 */
import type postgres from 'postgres';

/** The application may read these and append to them, never change or remove a row. */
export const APPEND_ONLY_TABLES = ['audit_log'] as const;
/** Written by the database itself (a trigger running as the owner); the application may only read them. */
export const READ_ONLY_TABLES = ['audit_chain'] as const;
/** Rows the application never deletes; which updates they take is for the triggers of migration 0006. */
export const NEVER_DELETED_TABLES = ['tickets', 'payments', 'photos'] as const;

export async function grantAppRole(sql: postgres.Sql, appRole: string): Promise<void> {
  const [me] = await sql<{ owner: string; database: string }[]>`select current_user as owner, current_database() as database`;
  const { owner, database } = me!;
  if (appRole === owner) {
    throw new Error(`DATABASE_URL and MIGRATION_DATABASE_URL name the same role (${owner}): the application must connect as a role of its own`);
  }
  const [role] = await sql<{ rolsuper: boolean; rolbypassrls: boolean }[]>`select rolsuper, rolbypassrls from pg_roles where rolname = ${appRole}`;
  if (!role) throw new Error(`The application's role ${appRole} does not exist: create it (docker-free-start.sh does) before migrating`);
  if (role.rolsuper || role.rolbypassrls) throw new Error(`The application's role ${appRole} is a superuser or bypasses row security: it must be an ordinary role`);
  const owned = await sql<{ name: string }[]>`
    select c.relname as name from pg_class c join pg_roles r on r.oid = c.relowner
    where r.rolname = ${appRole} and c.relnamespace = 'public'::regnamespace`;
  if (owned.length) {
    throw new Error(`The application's role ${appRole} owns ${owned.map((o) => o.name).join(', ')}: hand them to ${owner} (REASSIGN OWNED BY ${appRole} TO ${owner}, as a superuser)`);
  }

  const app = sql(appRole);
  await sql.begin(async (tx) => {
    // Nobody but the owner and the application connects; no one else creates anything.
    await tx`revoke all on database ${tx(database)} from public`;
    await tx`grant connect on database ${tx(database)} to ${app}`;
    await tx`revoke create on schema public from public`;
    await tx`grant usage on schema public to ${app}`;
    await tx`grant select, insert, update, delete on all tables in schema public to ${app}`;
    await tx`grant usage, select on all sequences in schema public to ${app}`;
    await tx`alter default privileges in schema public grant select, insert, update, delete on tables to ${app}`;
    await tx`alter default privileges in schema public grant usage, select on sequences to ${app}`;
    for (const table of APPEND_ONLY_TABLES) {
      await tx`revoke update, delete, truncate, references, trigger on table ${tx(table)} from ${app}`;
    }
    for (const table of READ_ONLY_TABLES) {
      await tx`revoke insert, update, delete, truncate, references, trigger on table ${tx(table)} from ${app}`;
    }
    for (const table of NEVER_DELETED_TABLES) {
      await tx`revoke delete, truncate on table ${tx(table)} from ${app}`;
    }
  });
}
