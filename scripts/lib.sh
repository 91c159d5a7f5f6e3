# Shared helpers for scripts/start.sh and scripts/test.sh (sourced, not run).
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"

log() { echo "plumbline: $*" >&2; }

# Installs dependencies when node_modules is missing or older than the lockfile.
ensure_dependencies() {
  local stamp="node_modules/.plumbline-lock.sha256"
  local want; want="$(sha256sum package-lock.json | cut -d' ' -f1)"
  if [ -d node_modules ] && [ -f "$stamp" ] && [ "$(cat "$stamp")" = "$want" ]; then return 0; fi
  log "installing dependencies (npm ci)"
  npm ci --ignore-scripts --no-audit --no-fund --loglevel=error
  echo "$want" > "$stamp"
}

# Debian's Chromium drives the browser tests; never a browser download.
ensure_chromium() {
  if [ -x /usr/bin/chromium ]; then return 0; fi
  if [ "$(id -u)" = 0 ]; then
    log "installing Debian's chromium for the browser tests"
    apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  else
    log "Chromium is missing. Install it with:"
    echo "  sudo apt-get update && sudo apt-get install -y chromium" >&2
    exit 1
  fi
}

# Starts PostgreSQL and Redis and exports DATABASE_URL and REDIS_URL.
start_services() {
  local line
  while IFS= read -r line; do export "$line"; done < <(bash scripts/services.sh start)
}

tsx_bin() { echo "$ROOT/node_modules/.bin/tsx"; }
