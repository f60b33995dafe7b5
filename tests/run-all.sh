#!/usr/bin/env bash
# npm test: lint, typecheck, unit tests, the database tests and the web access matrix again on a
# throwaway PostgreSQL 15 server, then the Playwright end-to-end tests against `next start`. Installs what is missing.
set -euo pipefail
source "$(dirname "$0")/../apps/web/scripts/bootstrap.sh"
cd "$REELWRIGHT_ROOT"

step() { printf '\n\033[1m▶ %s\033[0m\n' "$*"; }
is_root() { [ "$(id -u)" = 0 ]; }
apt_updated=0
apt_install() {
  if [ "$apt_updated" = 0 ]; then apt-get update -qq; apt_updated=1; fi
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$@" >/dev/null
}

ensure_chromium() {
  export CHROMIUM_PATH="${CHROMIUM_PATH:-/usr/bin/chromium}"
  [ -x "$CHROMIUM_PATH" ] && return
  if is_root; then
    step "installing Debian's chromium for the end-to-end tests"
    apt_install chromium
  else
    echo "✗ Chromium not found at $CHROMIUM_PATH. Install it (Debian: sudo apt-get install chromium)" >&2
    echo "  or set CHROMIUM_PATH to a Chromium binary, then run npm test again." >&2
    exit 1
  fi
}

pg_bin() { ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1; }
ensure_postgres() {
  [ -n "$(pg_bin)" ] && [ -x "$(pg_bin)/initdb" ] && return
  if is_root; then
    step "installing Debian's PostgreSQL server for the second database target"
    apt_install postgresql
  else
    echo "✗ No PostgreSQL server found. Install it (Debian: sudo apt-get install postgresql) and run npm test again." >&2
    exit 1
  fi
}

pg_dir=""
pg_ctl_as() { if is_root; then runuser -u postgres -- "$@"; else "$@"; fi; }
stop_postgres() {
  if [ -n "$pg_dir" ] && [ -d "$pg_dir" ]; then
    pg_ctl_as "$(pg_bin)/pg_ctl" -D "$pg_dir" stop -m immediate >/dev/null 2>&1 || true
    rm -rf "$pg_dir"
  fi
}
start_postgres() {
  local bin port
  bin="$(pg_bin)"
  port="${REELWRIGHT_TEST_PG_PORT:-55432}"
  pg_dir="$(mktemp -d /tmp/reelwright-pg.XXXXXX)"
  if is_root; then chown postgres "$pg_dir"; fi
  pg_ctl_as "$bin/initdb" -A trust -U postgres --no-sync -D "$pg_dir" >/dev/null
  pg_ctl_as "$bin/pg_ctl" -D "$pg_dir" -w -l "$pg_dir/server.log" \
    -o "-c listen_addresses=127.0.0.1 -c port=$port -c unix_socket_directories=$pg_dir -c fsync=off" start >/dev/null
  pg_ctl_as "$bin/createdb" -h 127.0.0.1 -p "$port" -U postgres reelwright_test
  export TEST_DATABASE_URL="postgres://postgres@127.0.0.1:$port/reelwright_test"
  echo "PostgreSQL $("$bin/postgres" --version | awk '{print $3}') on 127.0.0.1:$port"
}
trap stop_postgres EXIT

ensure_pnpm
install_dependencies
ensure_chromium
ensure_postgres

step "lint (ESLint + Prettier)"
pnpm lint
pnpm format:check

step "typecheck"
pnpm typecheck

step "unit tests (embedded PGlite)"
pnpm test:unit

step "database tests, the access matrix and the job queue on a throwaway PostgreSQL server"
start_postgres
pnpm --filter @reelwright/db test
pnpm --filter @reelwright/web exec vitest run server/openapi/access-matrix.test.ts server/queue/
stop_postgres
pg_dir=""

step "build"
pnpm --filter @reelwright/web build

step "production shape: two instances on one PostgreSQL behind a round-robin balancer"
bash tests/production/two-instances.sh

step "end-to-end tests (Playwright, Chromium, next start)"
pnpm test:e2e

echo
echo "✓ all tests passed"
