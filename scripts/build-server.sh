#!/usr/bin/env bash
# Bundles the server, the local stand-in services and the job runners; npm
# packages stay external and are loaded from node_modules.
set -euo pipefail
cd "$(dirname "$0")/.."
rm -rf dist/server
npx esbuild server/index.ts server/launch.ts server/dev-services/mail-catcher.cli.ts server/dev-services/object-store.cli.ts jobs/run-reminders.cli.ts \
  --bundle --platform=node --format=esm --target=node20 --packages=external --sourcemap \
  --outdir=dist/server --outbase=. --log-level=warning
