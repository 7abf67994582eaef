#!/usr/bin/env bash
# npm run demo:reset -- --yes: throws away the demo shop of the npm start data folder (its database and
# its stored files) so that the next `npm start` seeds it afresh. Only a database the demo seed made (it
# carries the seed's marker) is dropped, only while no app is connected to it, and only with --yes.
# It never touches a database named by DATABASE_URL, DATABASE_OWNER_URL or DATABASE_ADMIN_URL.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
[ "${1:-}" = "--yes" ] || die "This deletes every record of the demo shop in the npm start data folder and seeds nothing until the next npm start. To go on: npm run demo:reset -- --yes"
if [ -n "${DATABASE_URL:-}${DATABASE_OWNER_URL:-}${DATABASE_ADMIN_URL:-}" ]; then
  die "refused: a database of your own is configured (DATABASE_URL / DATABASE_OWNER_URL / DATABASE_ADMIN_URL); demo:reset only resets the npm start demo"
fi
ensure_node_modules
ensure_postgres_installed
PGPORT="${PGPORT:-54329}"
DATA_DIR="$(reachable_data_dir "${TENTHWISE_DATA_DIR:-$ROOT/.data}" "/var/tmp/tenthwise-data-$(printf '%s' "$ROOT" | md5sum | cut -c1-8)")"
[ -s "$DATA_DIR/pg-password" ] || die "no npm start data in $DATA_DIR: nothing to reset (npm start seeds the demo on its first run)"
STARTED=""
if ! as_pg "$PGBIN/pg_ctl" -D "$DATA_DIR/pg" status >/dev/null 2>&1; then STARTED=1; fi
start_cluster "$DATA_DIR" "$PGPORT" password "$DATA_DIR/pg-password"
use_local_cluster "$DATA_DIR" "$PGPORT"
set +e
npx tsx scripts/demo-reset.ts
RC=$?
set -e
if [ -n "$STARTED" ]; then stop_cluster "$DATA_DIR"; fi
# The stored files (certificates, photos) of the dropped demo go with it; a kept database keeps them.
if [ "$RC" = 0 ] && [ -z "${S3_ENDPOINT:-}" ] && [ -d "$DATA_DIR/objects" ]; then
  rm -rf -- "$DATA_DIR/objects"
  say "removed the demo's stored files ($DATA_DIR/objects)"
fi
[ "$RC" = 0 ] && say "demo reset: run npm start to seed the demo shop afresh"
exit $RC
