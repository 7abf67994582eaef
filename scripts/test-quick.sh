#!/usr/bin/env bash
# For developers: run some tests against a long-lived local test cluster
# without the full `npm test` (which also typechecks and builds).
#   bash scripts/test-quick.sh tests/api/tools.api.test.ts
#   bash scripts/test-quick.sh --project unit shared/
# Browser tests need `npm run build` first. Each call migrates its own template
# database, so several developers can run this at once.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_postgres_installed
DIR="${TENTHWISE_QUICK_DIR:-/tmp/tenthwise-quick}"
PORT="${TENTHWISE_QUICK_PORT:-55439}"
mkdir -p "$DIR"; chmod 755 "$DIR"
start_cluster "$DIR" "$PORT" trust "" fast >/dev/null
TPL="tpl_$$"
export TEST_PG_URL="postgres://app@127.0.0.1:${PORT}"
export TEST_TEMPLATE_DB="$TPL"
trap 'psql -h 127.0.0.1 -p "$PORT" -U app -d postgres -qc "drop database if exists \"$TPL\" with (force)" >/dev/null 2>&1' EXIT
# The roles (owner, runtime), the template database owned by the owner, migrations run as the owner.
DATABASE_ADMIN_URL="$TEST_PG_URL/postgres" DATABASE_NAME="$TPL" npx tsx scripts/migrate.ts
npx vitest run "$@"
