# Database roles, backups and restores for docker-free-start.sh (sourced by it; not run on its own).
# Uses PG_BIN, PG_SOCKET, PG_PORT, PG_USER, PG_PASSWORD, PG_OWNER_USER, PG_OWNER_PASSWORD, ROOT,
# and the script's as_pg, log and die.

# psql as the cluster's superuser over its private socket (trust for local connections only).
psql_admin_in() {
  local db=$1
  shift
  as_pg "$PG_BIN/psql" -h "$PG_SOCKET" -p "$PG_PORT" -U postgres -d "$db" -v ON_ERROR_STOP=1 -qtA "$@"
}
psql_admin() { psql_admin_in postgres "$@"; }

owner_url_for() { printf 'postgres://%s:%s@127.0.0.1:%s/%s' "$PG_OWNER_USER" "$PG_OWNER_PASSWORD" "$PG_PORT" "$1"; }
app_url_for() { printf 'postgres://%s:%s@127.0.0.1:%s/%s' "$PG_USER" "$PG_PASSWORD" "$PG_PORT" "$1"; }

# An ordinary login role: no superuser, no role or database creation, no replication, no row-security bypass.
ensure_role() {
  psql_admin -v name="$1" -v password="$2" <<'SQL'
select format('create role %I', :'name') where not exists (select 1 from pg_roles where rolname = :'name') \gexec
select format('alter role %I login password %L nosuperuser nocreatedb nocreaterole noreplication nobypassrls', :'name', :'password') \gexec
SQL
}

ensure_roles() {
  ensure_role "$PG_OWNER_USER" "$PG_OWNER_PASSWORD"
  ensure_role "$PG_USER" "$PG_PASSWORD"
}

database_exists() {
  [[ "$(psql_admin -v db="$1" <<'SQL'
select 1 from pg_database where datname = :'db'
SQL
)" == "1" ]]
}

# The database belongs to the owner role, and so does everything in it. A database from before the
# two roles (owned by the application's role, or another) is handed over.
ensure_database() {
  local db=$1 current
  current="$(psql_admin -v db="$db" <<'SQL'
select pg_get_userbyid(datdba) from pg_database where datname = :'db'
SQL
)"
  if [[ -z "$current" ]]; then
    psql_admin -v db="$db" -v owner="$PG_OWNER_USER" <<'SQL'
select format('create database %I owner %I', :'db', :'owner') \gexec
SQL
    return 0
  fi
  if [[ "$current" != "$PG_OWNER_USER" ]]; then
    log "handing database $db from $current to $PG_OWNER_USER"
    psql_admin -v db="$db" -v owner="$PG_OWNER_USER" <<'SQL'
select format('alter database %I owner to %I', :'db', :'owner') \gexec
SQL
    if [[ "$current" != "postgres" ]]; then
      psql_admin_in "$db" -v old="$current" -v owner="$PG_OWNER_USER" <<'SQL'
select format('reassign owned by %I to %I', :'old', :'owner') \gexec
SQL
    fi
  fi
  psql_admin_in "$db" -v app="$PG_USER" -v owner="$PG_OWNER_USER" <<'SQL'
select format('reassign owned by %I to %I', :'app', :'owner')
where exists (select 1 from pg_class where relowner = (select oid from pg_roles where rolname = :'app')) \gexec
SQL
}

# A consistent dump (pg_dump reads every table in one snapshot, while writes go on) in PostgreSQL's
# custom format, checked by reading it back, with a checksum beside it. Prints the file's path last.
backup_database() {
  local db=$1 dir="$ROOT/.local/backups" stamp file
  mkdir -p "$dir"
  chmod 700 "$dir"
  stamp="$(date -u +%Y%m%dT%H%M%S.%3NZ)"
  file="$dir/${db}-${stamp}.dump"
  log "backing up $db on port $PG_PORT"
  if ! (umask 077 && "$PG_BIN/pg_dump" --format=custom --file "$file.partial" --dbname "$(owner_url_for "$db")"); then
    rm -f "$file.partial"
    die "pg_dump failed: no backup was written"
  fi
  if ! "$PG_BIN/pg_restore" --list "$file.partial" >/dev/null; then
    rm -f "$file.partial"
    die "The dump could not be read back: no backup was written"
  fi
  mv "$file.partial" "$file"
  (cd "$dir" && umask 077 && sha256sum "$(basename "$file")" >"$(basename "$file").sha256")
  log "backup written ($(du -h "$file" | cut -f1)); restore it with ./docker-free-start.sh restore $file"
  echo "$file"
}

# Checks the file, then makes sure the database is fresh: missing, empty, or (with --force) backed up and dropped.
prepare_restore_target() {
  local db=$1 file=$2 force=$3 relations tables
  [[ -f "$file" && -r "$file" ]] || die "No such backup file: $file"
  if [[ -f "$file.sha256" ]]; then
    (cd "$(dirname "$file")" && sha256sum --check --quiet "$(basename "$file").sha256") \
      || die "$file does not match its checksum ($file.sha256): refusing to restore it"
  fi
  "$PG_BIN/pg_restore" --list "$file" >/dev/null 2>&1 || die "$file is not a dump pg_restore can read (make one with ./docker-free-start.sh backup)"
  database_exists "$db" || return 0
  read -r relations tables < <(psql_admin_in "$db" -F ' ' -c "select count(*), count(*) filter (where c.relkind in ('r', 'p'))
    from pg_class c join pg_namespace n on n.oid = c.relnamespace where n.nspname <> 'information_schema' and n.nspname !~ '^pg_'")
  [[ "$relations" == "0" ]] && return 0
  if [[ "$force" != 1 ]]; then
    die "Database $db is not empty (it holds $tables tables): refusing to overwrite it. Restore into a fresh database with --into NAME, or pass --force to replace it (it is backed up first)."
  fi
  local saved
  saved="$(backup_database "$db" | tail -n 1)"
  log "--force: $db as it was is saved in $saved"
  log "dropping $db (connections to it are closed)"
  psql_admin -v db="$db" <<'SQL'
select format('drop database %I with (force)', :'db') \gexec
SQL
}

# Restores in one transaction as the owner, then lets migrate.ts apply any newer migrations and give
# the application's role its rights (the dump carries no owners or grants), then verifies the chain.
restore_database() {
  local db=$1 file=$2 counts breaks
  log "restoring $file into $db"
  "$PG_BIN/pg_restore" --exit-on-error --single-transaction --no-owner --no-privileges --dbname "$(owner_url_for "$db")" "$file" \
    || die "pg_restore failed; it ran in one transaction, so $db is left as it was"
  log "applying newer migrations and the application's rights"
  MIGRATION_DATABASE_URL="$(owner_url_for "$db")" DATABASE_URL="$(app_url_for "$db")" npx tsx scripts/migrate.ts
  counts="$(psql_admin_in "$db" -c "select format('%s tickets, %s payments, %s photo references, %s audit rows',
    (select count(*) from tickets), (select count(*) from payments), (select count(*) from photos), (select count(*) from audit_log))")"
  breaks="$(psql_admin_in "$db" -c "select count(*) from audit_chain_breaks()")"
  [[ "$breaks" == "0" ]] || die "Restored $db ($counts), but its audit chain does not verify: $breaks entries are broken (see select * from audit_chain_breaks())"
  log "restored $db: $counts; the audit chain verifies"
}
