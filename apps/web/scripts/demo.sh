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
pnpm --silent --filter @reelwright/db seed

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

  Data: ${DATABASE_URL:+PostgreSQL at DATABASE_URL}${DATABASE_URL:-embedded PGlite in $PGLITE_DATA_DIR} (kept between runs)
  Stop with Ctrl-C.

MSG
cd apps/web
exec pnpm exec next start --hostname 127.0.0.1 --port "$PORT"
