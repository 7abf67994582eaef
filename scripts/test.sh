#!/usr/bin/env bash
# npm test: set up a throwaway PostgreSQL cluster, then typecheck, build, and
# run unit, API and browser tests; print one closing line "N passed, N failed".
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules
ensure_postgres_installed
ensure_chromium

throwaway_cluster test
export TEST_PG_URL="postgres://app@127.0.0.1:${PORT}"
export TEST_TEMPLATE_DB="tenthwise_template"
# The roles (owner, runtime), the template database owned by the owner, migrations run as the owner.
DATABASE_ADMIN_URL="$TEST_PG_URL/postgres" DATABASE_NAME="$TEST_TEMPLATE_DB" npx tsx scripts/migrate.ts

passed=0; failed=0
step() { # name command…
  local name="$1"; shift
  say "$name…"
  if "$@"; then passed=$((passed+1)); else failed=$((failed+1)); say "FAILED: $name"; fi
}
step "typecheck" npx tsc -p tsconfig.json --noEmit
step "build" npm run --silent build

RESULTS="$TMP/vitest.json"
set +e
npx vitest run --reporter=default --reporter=json --outputFile.json="$RESULTS"
VITEST_RC=$?
set -e
if [ -s "$RESULTS" ]; then
  read -r vp vf < <(node -e 'const r=require(process.argv[1]);console.log(r.numPassedTests, r.numFailedTests + (r.numTotalTestSuites && r.testResults.filter(t=>t.status==="failed" && t.assertionResults.length===0).length))' "$RESULTS")
  passed=$((passed+vp)); failed=$((failed+vf))
fi
if [ "$VITEST_RC" != 0 ] && [ "$failed" = 0 ]; then failed=1; fi

echo "$passed passed, $failed failed"
[ "$failed" = 0 ]
