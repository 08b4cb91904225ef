#!/usr/bin/env bash
# Starts the built app on a throwaway demo database for the browser tests.
set -euo pipefail
port="$1"
dir="$(mktemp -d /tmp/papin-e2e.XXXXXX)"
export DATABASE_URL="file:$dir/papin.db"
export NEXTAUTH_SECRET="${NEXTAUTH_SECRET:-e2e-secret-not-for-production-0123456789}"
export NEXTAUTH_URL="http://127.0.0.1:$port"
export PAPIN_DEMO=1
node node_modules/tsx/dist/cli.mjs --tsconfig db/tsconfig.scripts.json db/prepare.ts
exec node node_modules/next/dist/bin/next start -H 127.0.0.1 -p "$port"
