#!/usr/bin/env bash
# npm run restore -- FILE: replaces the npm start database and stored files with those in the archive
# (stop `npm start` first, or let it reconnect: it answers 503 while the database is replaced). With
# DATABASE_ADMIN_URL (and S3_*) set, restores into that cluster and bucket instead.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
[ -n "${1:-}" ] || die "Usage: npm run restore -- FILE"
[ -f "$1" ] || die "no such backup file: $1"
ensure_node_modules
ensure_postgres_installed
STARTED=""
if [ -z "${DATABASE_ADMIN_URL:-}" ]; then
  PGPORT="${PGPORT:-54329}"
  DATA_DIR="$(reachable_data_dir "${TENTHWISE_DATA_DIR:-$ROOT/.data}" "/var/tmp/tenthwise-data-$(printf '%s' "$ROOT" | md5sum | cut -c1-8)")"
  secret_file "$DATA_DIR/pg-password" >/dev/null
  if ! as_pg "$PGBIN/pg_ctl" -D "$DATA_DIR/pg" status >/dev/null 2>&1; then STARTED=1; fi
  start_cluster "$DATA_DIR" "$PGPORT" password "$DATA_DIR/pg-password"
  use_local_cluster "$DATA_DIR" "$PGPORT"
  export TENTHWISE_SERVICES_DIR="$DATA_DIR"
fi
export PG_BIN="${PG_BIN:-$PGBIN}"
set +e
npx tsx scripts/restore.ts "$1"
RC=$?
set -e
if [ -n "$STARTED" ]; then stop_cluster "$DATA_DIR"; fi
exit $RC
