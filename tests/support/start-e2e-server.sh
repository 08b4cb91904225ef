#!/usr/bin/env bash
# Starts the built app on a throwaway demo database for the browser tests, with the local fake of
# Resend's API beside it so notification mail is really sent and can be read back.
set -euo pipefail
port="$1"
fake_port="$((port + 1))"
dir="$(mktemp -d /tmp/papin-e2e.XXXXXX)"
export DATABASE_URL="file:$dir/papin.db"
export NEXTAUTH_SECRET="${NEXTAUTH_SECRET:-e2e-secret-not-for-production-0123456789}"
export NEXTAUTH_URL="http://127.0.0.1:$port"
export PAPIN_DEMO=1
export RESEND_BASE_URL="http://127.0.0.1:$fake_port"
export RESEND_API_KEY="re_e2e_fake"
export FAKE_RESEND_MAILBOX="$dir/fake-mailbox.jsonl"
node node_modules/tsx/dist/cli.mjs lib/mail/fake-resend-server.ts --port "$fake_port" &
fake_pid=$!
trap 'kill $fake_pid 2>/dev/null || true' EXIT
node node_modules/tsx/dist/cli.mjs --tsconfig db/tsconfig.scripts.json db/prepare.ts --start
node node_modules/next/dist/bin/next start -H 127.0.0.1 -p "$port" &
next_pid=$!
trap 'kill $next_pid $fake_pid 2>/dev/null || true' EXIT TERM INT
wait $next_pid
