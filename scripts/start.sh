#!/usr/bin/env bash
# npm start: install what is missing, start PostgreSQL and the local stand-ins
# for mail and object storage, migrate, seed the demo on first run, build and
# serve. Ctrl-C stops everything this command started.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules

STARTED_PG=""
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres_installed
  PGPORT="${PGPORT:-54329}"
  DATA_DIR="$(reachable_data_dir "${TENTHWISE_DATA_DIR:-$ROOT/.data}" "/var/tmp/tenthwise-data-$(printf '%s' "$ROOT" | md5sum | cut -c1-8)")"
  secret_file "$DATA_DIR/pg-password" >/dev/null
  SESSION_SECRET="${SESSION_SECRET:-$(secret_file "$DATA_DIR/session-secret")}"; export SESSION_SECRET
  if ! as_pg "$PGBIN/pg_ctl" -D "$DATA_DIR/pg" status >/dev/null 2>&1; then STARTED_PG="$DATA_DIR"; fi
  start_cluster "$DATA_DIR" "$PGPORT" password "$DATA_DIR/pg-password"
  # server/launch.ts creates the owner and runtime roles and the database, migrates as the owner and
  # serves as the runtime role.
  use_local_cluster "$DATA_DIR" "$PGPORT"
  export TENTHWISE_SERVICES_DIR="$DATA_DIR"
else
  export TENTHWISE_SERVICES_DIR="${TENTHWISE_DATA_DIR:-$ROOT/.data}"
  mkdir -p "$TENTHWISE_SERVICES_DIR"
fi

# TENTHWISE_SKIP_BUILD=1 reuses dist/ when it is there (the tests of this command; a second start).
if [ "${TENTHWISE_SKIP_BUILD:-}" = 1 ] && [ -f dist/server/server/launch.js ]; then
  say "using the existing build in dist/"
else
  say "building the app…"
  npm run --silent build >/dev/null
fi

export NODE_ENV=production
# shellcheck disable=SC2086 # the flags are words
node $SERVER_NODE_FLAGS dist/server/server/launch.js &
APP=$!
CLEANED=""
cleanup() {
  [ -n "$CLEANED" ] && return
  CLEANED=1
  kill -TERM "$APP" 2>/dev/null || true
  wait "$APP" 2>/dev/null || true
  if [ -n "$STARTED_PG" ]; then say "stopping PostgreSQL"; stop_cluster "$STARTED_PG"; fi
}
trap cleanup INT TERM
wait "$APP" || true
trap - INT TERM
cleanup
