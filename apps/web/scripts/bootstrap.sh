# Sourced by `npm run demo` and `npm test`: puts pnpm 12.4.2 on PATH and installs dependencies.
# Needs only Node 20 and npm on the machine.
REELWRIGHT_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../../.." && pwd)"
PNPM_VERSION=12.4.2
export TURBO_TELEMETRY_DISABLED=1 NEXT_TELEMETRY_DISABLED=1

ensure_pnpm() {
  if command -v pnpm >/dev/null 2>&1 && [ "$(pnpm --version 2>/dev/null)" = "$PNPM_VERSION" ]; then
    return
  fi
  # A private copy, so the machine's own pnpm (if any) is left alone.
  local prefix="${XDG_CACHE_HOME:-$HOME/.cache}/reelwright/pnpm-$PNPM_VERSION"
  if [ ! -x "$prefix/node_modules/.bin/pnpm" ]; then
    echo "› installing pnpm $PNPM_VERSION into $prefix"
    npm install --silent --no-audit --no-fund --prefix "$prefix" "pnpm@$PNPM_VERSION" >/dev/null
  fi
  export PATH="$prefix/node_modules/.bin:$PATH"
}

install_dependencies() {
  echo "› installing dependencies (frozen lockfile)"
  (cd "$REELWRIGHT_ROOT" && pnpm install --frozen-lockfile --reporter=append-only | tail -n 3)
}
