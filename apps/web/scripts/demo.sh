#!/usr/bin/env bash
# npm run demo: install, build, migrate, seed the demo network if the database is empty, and serve.
set -euo pipefail
source "$(dirname "$0")/bootstrap.sh"
cd "$REELWRIGHT_ROOT"

ensure_pnpm
install_dependencies

# A session secret made once per checkout and kept out of git.
secret_file="apps/web/.env.demo"
if [ ! -s "$secret_file" ]; then
  echo "NEXTAUTH_SECRET=$(node -e "console.log(require('node:crypto').randomBytes(32).toString('base64url'))")" >"$secret_file"
  echo "› wrote a new session secret to $secret_file"
fi
set -a
# shellcheck disable=SC1090
source "$secret_file"
set +a

export PORT="${PORT:-3000}"
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://127.0.0.1:$PORT}"
export PGLITE_DATA_DIR="${PGLITE_DATA_DIR:-$REELWRIGHT_ROOT/data/pglite}"
export REELWRIGHT_DEMO=1

echo "› building"
pnpm --filter @reelwright/web build >/tmp/reelwright-demo-build.log 2>&1 || {
  tail -n 40 /tmp/reelwright-demo-build.log
  echo "✗ build failed (full log: /tmp/reelwright-demo-build.log)"
  exit 1
}

echo "› preparing the database"
# The demo's two years of work end now, so "this week" and the open jobs read as today's.
pnpm --silent --filter @reelwright/db seed --now="$(date -u +%Y-%m-%dT%H:%M:00Z)"
# Audit rounds of the last twelve whole months, planned and scored by the product itself (first run only).
pnpm --silent --filter @reelwright/web demo:audits

# Photos and e-mail: real storage / SMTP when configured, otherwise the local fakes.
[ -n "${S3_ENDPOINT:-}${S3_ACCESS_KEY_ID:-}" ] && export FAKES_S3=0
[ -n "${SMTP_URL:-}" ] && export FAKES_SMTP=0
if [ "${FAKES_S3:-1}" != 0 ] || [ "${FAKES_SMTP:-1}" != 0 ]; then
  echo "› starting the local storage and mail fakes"
  fakes_env="$(mktemp /tmp/reelwright-fakes.XXXXXX)"
  rm -f "$fakes_env"
  FAKES_S3_DIR="${FAKES_S3_DIR:-$REELWRIGHT_ROOT/data/s3}" FAKES_ENV_FILE="$fakes_env" \
    node apps/web/scripts/fakes.mjs &
  fakes_pid=$!
  for _ in $(seq 1 150); do
    [ -s "$fakes_env" ] && break
    kill -0 "$fakes_pid" 2>/dev/null || {
      echo "✗ the fakes did not start (a port in use? set FAKES_S3_PORT, FAKES_SMTP_PORT, FAKES_MAIL_HTTP_PORT)"
      exit 1
    }
    sleep 0.1
  done
  set -a
  # shellcheck disable=SC1090
  source "$fakes_env"
  set +a
  rm -f "$fakes_env"
fi

# Royalty invoices: Stripe when STRIPE_SECRET_KEY is set, otherwise the local stand-in.
if [ -z "${STRIPE_SECRET_KEY:-}${STRIPE_API_BASE:-}" ]; then
  echo "› starting the local payment fake"
  # The fake signs the events it sends with this secret and the app verifies them with it: made
  # once and kept with the demo's data, like the database it belongs to.
  if [ -z "${STRIPE_WEBHOOK_SECRET:-}" ]; then
    webhook_secret_file="$REELWRIGHT_ROOT/data/fake-stripe-webhook-secret"
    mkdir -p "$(dirname "$webhook_secret_file")"
    if [ ! -s "$webhook_secret_file" ]; then
      node -e "console.log('whsec_' + require('node:crypto').randomBytes(24).toString('base64url'))" >"$webhook_secret_file"
      chmod 600 "$webhook_secret_file"
    fi
    STRIPE_WEBHOOK_SECRET="$(cat "$webhook_secret_file")"
  fi
  export STRIPE_WEBHOOK_SECRET
  export FAKE_STRIPE_WEBHOOK_URL="${FAKE_STRIPE_WEBHOOK_URL:-http://127.0.0.1:$PORT/api/webhooks/payments}"
  stripe_env="$(mktemp /tmp/reelwright-stripe.XXXXXX)"
  rm -f "$stripe_env"
  FAKE_STRIPE_ENV_FILE="$stripe_env" node apps/web/scripts/fake-stripe.mjs &
  for _ in $(seq 1 100); do [ -s "$stripe_env" ] && break; sleep 0.1; done
  [ -s "$stripe_env" ] || { echo "✗ the payment fake did not start (port in use? set FAKE_STRIPE_PORT)"; exit 1; }
  set -a
  # shellcheck disable=SC1090
  source "$stripe_env"
  set +a
  rm -f "$stripe_env"
fi

if [ -n "${DATABASE_URL:-}" ]; then data_where="PostgreSQL at DATABASE_URL"; else data_where="embedded PGlite in $PGLITE_DATA_DIR"; fi
if [ -n "${MAIL_CATCHER_URL:-}" ]; then
  mail_where="caught locally; the owner reads it at http://127.0.0.1:$PORT/dev/mail"
else
  mail_where="sent through SMTP_URL"
fi
if [ -n "${STRIPE_API_BASE:-}" ]; then
  payments_where="the local payment fake at $STRIPE_API_BASE (it signs its webhooks to /api/webhooks/payments)"
elif [ -n "${STRIPE_WEBHOOK_SECRET:-}" ]; then
  payments_where="Stripe"
else
  payments_where="Stripe; set STRIPE_WEBHOOK_SECRET to record payments from its webhooks"
fi
cat <<MSG

  Reelwright is starting on http://127.0.0.1:$PORT

  Demo accounts (password: reelwright-demo)
    owner@saltwick.test           owner (whole network)
    manager.north@saltwick.test   regional manager, North Shore
    manager.south@saltwick.test   regional manager, South Shore
    lead.marram@saltwick.test     shop lead, Marram Point
    tech.marram@saltwick.test     technician, Marram Point
    lead.fennel@saltwick.test     shop lead, Fennel Cove
    tech.fennel@saltwick.test     technician, Fennel Cove
    auditor@saltwick.test         auditor

  Data: $data_where (kept between runs)
  Photos: ${S3_ENDPOINT:-AWS S3, region ${S3_REGION:-us-east-1}}, bucket ${S3_BUCKET:-reelwright-photos}
  E-mail: $mail_where
  Royalty invoices: $payments_where
  Stop with Ctrl-C.

MSG
cd apps/web
exec pnpm exec next start --hostname 127.0.0.1 --port "$PORT" --keepAliveTimeout 65000
