#!/usr/bin/env bash
# The production shape, small: a throwaway PostgreSQL 15, the local storage, mail and payment
# fakes, two `next start` instances of the built app on one database, and a round-robin balancer
# in front (in two-instances.mjs). Run after `pnpm --filter @reelwright/web build`.
#   bash tests/production/two-instances.sh          (REELWRIGHT_TEST_PG_PORT picks the port)
set -euo pipefail
cd "$(dirname "$0")/../.."
root="$PWD"
work="$(mktemp -d /tmp/reelwright-two.XXXXXX)"
pids=()
pg_dir=""
bin="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)"
as_pg() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }
cleanup() {
  for pid in "${pids[@]}"; do kill -- "-$pid" 2>/dev/null || kill "$pid" 2>/dev/null || true; done
  for pid in "${pids[@]}"; do wait "$pid" 2>/dev/null || true; done
  if [ -n "$pg_dir" ]; then as_pg "$bin/pg_ctl" -D "$pg_dir" -m immediate stop >/dev/null 2>&1 || true; fi
  rm -rf "$work" "$pg_dir"
}
trap cleanup EXIT

free_port() { node -e 's=require("net").createServer().listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})'; }

port="${REELWRIGHT_TEST_PG_PORT:-55432}"
pg_dir="$(mktemp -d /tmp/reelwright-two-pg.XXXXXX)"
if [ "$(id -u)" = 0 ]; then chown postgres "$pg_dir"; fi
as_pg "$bin/initdb" -A trust -U postgres --no-sync -D "$pg_dir" >/dev/null
as_pg "$bin/pg_ctl" -D "$pg_dir" -w -l "$pg_dir/server.log" \
  -o "-c listen_addresses=127.0.0.1 -c port=$port -c unix_socket_directories=$pg_dir -c fsync=off -c max_connections=100" start >/dev/null
as_pg "$bin/createdb" -h 127.0.0.1 -p "$port" -U postgres reelwright_two
export DATABASE_URL="postgres://postgres@127.0.0.1:$port/reelwright_two"

FAKES_S3_PORT=0 FAKES_SMTP_PORT=0 FAKES_MAIL_HTTP_PORT=0 FAKES_S3_DIR="$work/s3" \
  FAKES_ENV_FILE="$work/fakes.env" node apps/web/scripts/fakes.mjs >"$work/fakes.log" 2>&1 &
pids+=($!)
FAKE_STRIPE_PORT=0 FAKE_STRIPE_ENV_FILE="$work/stripe.env" node apps/web/scripts/fake-stripe.mjs >"$work/stripe.log" 2>&1 &
pids+=($!)
for _ in $(seq 1 150); do [ -s "$work/fakes.env" ] && [ -s "$work/stripe.env" ] && break; sleep 0.1; done
set -a
# shellcheck disable=SC1091
source "$work/fakes.env"
# shellcheck disable=SC1091
source "$work/stripe.env"
set +a
export STRIPE_WEBHOOK_SECRET="${STRIPE_WEBHOOK_SECRET:-whsec_reelwright_two_instances_only}"
export REELWRIGHT_NOW="${REELWRIGHT_NOW:-2026-12-01T12:00:00Z}"
export NEXTAUTH_SECRET="two-instances-test-only-secret-0123456789"
export TRUSTED_PROXY_HOPS=1
pnpm --silent --filter @reelwright/db seed --now="$REELWRIGHT_NOW" >/dev/null

balancer_port="$(free_port)"
export NEXTAUTH_URL="http://127.0.0.1:$balancer_port"
ports=()
for i in 1 2; do
  p="$(free_port)"
  ports+=("$p")
  # Both at once: migrations take their advisory lock, the queue its own.
  # Its own process group, so that the test can kill -9 the whole instance.
  setsid bash -c "cd apps/web && exec pnpm exec next start --hostname 127.0.0.1 --port $p" >"$work/instance-$i.log" 2>&1 &
  pids+=($!)
  echo "instance $i: pid $! port $p"
done
export TWO_BALANCER_PORT="$balancer_port" TWO_PORTS="${ports[*]}" TWO_PIDS="${pids[2]} ${pids[3]}" TWO_LOGS="$work"
node tests/production/two-instances.mjs || { tail -n 30 "$work"/instance-*.log; exit 1; }
