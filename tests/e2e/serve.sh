#!/usr/bin/env bash
# The server the end-to-end tests run against: a fresh embedded database seeded with the demo
# network, served by `next start` (the production build).
set -euo pipefail
cd "$(dirname "$0")/../.."
port="${E2E_PORT:-3100}"
data_dir="$(mktemp -d /tmp/reelwright-e2e.XXXXXX)"
trap 'rm -rf "$data_dir"' EXIT
export PGLITE_DATA_DIR="$data_dir/pglite"
export NEXTAUTH_SECRET="end-to-end-tests-only-secret-0123456789"
export NEXTAUTH_URL="http://127.0.0.1:$port"
unset DATABASE_URL
pnpm --silent --filter @reelwright/db seed
cd apps/web
pnpm exec next start --hostname 127.0.0.1 --port "$port"
