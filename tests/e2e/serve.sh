#!/usr/bin/env bash
# The server the end-to-end tests run against: a fresh embedded database seeded with the demo
# network, the local S3 and SMTP fakes on free ports, served by `next start` (the production build).
set -euo pipefail
cd "$(dirname "$0")/../.."
port="${E2E_PORT:-3100}"
data_dir="$(mktemp -d /tmp/reelwright-e2e.XXXXXX)"
fakes_pid=""
stripe_pid=""
cleanup() {
  if [ -n "$fakes_pid" ]; then kill "$fakes_pid" 2>/dev/null || true; wait "$fakes_pid" 2>/dev/null || true; fi
  if [ -n "$stripe_pid" ]; then kill "$stripe_pid" 2>/dev/null || true; wait "$stripe_pid" 2>/dev/null || true; fi
  rm -rf "$data_dir"
}
trap cleanup EXIT

# Free ports, so several checkouts' test servers can run side by side.
FAKES_S3_PORT=0 FAKES_SMTP_PORT=0 FAKES_MAIL_HTTP_PORT=0 FAKES_S3_DIR="$data_dir/s3" \
  FAKES_ENV_FILE="$data_dir/fakes.env" node apps/web/scripts/fakes.mjs &
fakes_pid=$!
for _ in $(seq 1 150); do
  [ -s "$data_dir/fakes.env" ] && break
  kill -0 "$fakes_pid" 2>/dev/null || { echo "✗ the storage and mail fakes did not start" >&2; exit 1; }
  sleep 0.1
done
[ -s "$data_dir/fakes.env" ] || { echo "✗ the storage and mail fakes did not report ready" >&2; exit 1; }
set -a
# shellcheck disable=SC1091
source "$data_dir/fakes.env"
set +a
# The payment provider's stand-in for royalty invoices; the tests sign webhooks with this secret.
FAKE_STRIPE_PORT=0 FAKE_STRIPE_ENV_FILE="$data_dir/stripe.env" node apps/web/scripts/fake-stripe.mjs &
stripe_pid=$!
for _ in $(seq 1 100); do [ -s "$data_dir/stripe.env" ] && break; sleep 0.1; done
[ -s "$data_dir/stripe.env" ] || { echo "✗ the payment fake did not start" >&2; exit 1; }
set -a
# shellcheck disable=SC1091
source "$data_dir/stripe.env"
set +a
export STRIPE_WEBHOOK_SECRET="${STRIPE_WEBHOOK_SECRET:-whsec_reelwright_end_to_end_only}"
export PGLITE_DATA_DIR="$data_dir/pglite"
export NEXTAUTH_SECRET="end-to-end-tests-only-secret-0123456789"
export NEXTAUTH_URL="http://127.0.0.1:$port"
# Playwright stands in for one proxy: sessions.spec.ts throttles sign-ins from a made-up address
# (X-Forwarded-For) so the block never reaches 127.0.0.1, which every other spec signs in from.
export TRUSTED_PROXY_HOPS=1
unset DATABASE_URL
# One clock: the seed's "today" and the server's clock at start are the same instant
# (tests/e2e/clock.ts reads it too), so no spec depends on the day the suite runs.
export REELWRIGHT_NOW="${REELWRIGHT_NOW:-2026-12-01T12:00:00Z}"
pnpm --silent --filter @reelwright/db seed --now="$REELWRIGHT_NOW"
cd apps/web
# Idle connections stay open longer than a client keeps them, so a reused one is never reset.
pnpm exec next start --hostname 127.0.0.1 --port "$port" --keepAliveTimeout 65000
