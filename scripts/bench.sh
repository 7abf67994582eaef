#!/usr/bin/env bash
# npm run bench [-- --tools 20000 --rounds 3 --duration 5 --no-growth]: a throwaway PostgreSQL cluster,
# the built app, a floor server, and the measures of docs/performance.md. A benchmark, not a test.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules
ensure_postgres_installed
if [ "${BENCH_SKIP_BUILD:-}" = 1 ] && [ -f dist/server/server/index.js ]; then
  say "using the existing build in dist/"
else
  say "building the app…"
  npm run --silent build >/dev/null
fi
# The cluster gets the cache npm start gives the shop's (scripts/lib.sh pg_memory_opts).
export PG_SIZED=1
if [ -n "${BENCH_DIR:-}" ]; then
  # A kept cluster (with --reuse, a filled database of the same scale is measured again without refilling).
  TMP="$BENCH_DIR"; mkdir -p "$TMP"; chmod 755 "$TMP"
  [ -s "$TMP/port" ] || free_port > "$TMP/port"
  PORT="$(cat "$TMP/port")"
  say "keeping the cluster in $TMP (port $PORT); stop it with: pg_ctl -D $TMP/pg stop"
  start_cluster "$TMP" "$PORT" trust "" fast
else
  throwaway_cluster bench
fi
export BENCH_PG_URL="postgres://app@127.0.0.1:${PORT}"
npx tsx scripts/bench.ts "$@"
