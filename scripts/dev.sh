#!/usr/bin/env bash
# npm run dev: the same set-up as npm start, then the server under tsx watch
# and the Vite dev server with hot reload (http://127.0.0.1:5173, API proxied).
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres_installed
  PGPORT="${PGPORT:-54329}"
  DATA_DIR="$(reachable_data_dir "${TENTHWISE_DATA_DIR:-$ROOT/.data}" "/var/tmp/tenthwise-data-$(printf '%s' "$ROOT" | md5sum | cut -c1-8)")"
  secret_file "$DATA_DIR/pg-password" >/dev/null
  start_cluster "$DATA_DIR" "$PGPORT" password "$DATA_DIR/pg-password"
  use_local_cluster "$DATA_DIR" "$PGPORT"
  export TENTHWISE_SERVICES_DIR="$DATA_DIR"
fi
export NODE_ENV=development
npx tsx watch server/launch.ts &
SERVER=$!
npx vite --host 127.0.0.1 &
VITE=$!
trap 'kill $SERVER $VITE 2>/dev/null; wait' INT TERM
wait
