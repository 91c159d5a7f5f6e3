#!/usr/bin/env bash
# npm test: throwaway PostgreSQL and Redis, then every test (unit, integration, browser). Non-zero on any failure.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

export NODE_ENV=test
export PG_PORT="${TEST_PG_PORT:-54339}"
export REDIS_PORT="${TEST_REDIS_PORT:-63799}"
PLUMBLINE_DATA_DIR="$(mktemp -d "${TMPDIR:-/tmp}/plumbline-test-XXXXXX")"
chmod 755 "$PLUMBLINE_DATA_DIR"   # the postgres user must reach its data directory
export PLUMBLINE_DATA_DIR
export STORAGE_DIR="$PLUMBLINE_DATA_DIR/uploads"

cleanup() {
  bash scripts/services.sh stop >/dev/null 2>&1 || true
  rm -rf "$PLUMBLINE_DATA_DIR" "${TMPDIR:-/tmp}/plumbline-pg-$PG_PORT"
}
trap cleanup EXIT

ensure_dependencies
ensure_chromium
start_services
log "building the web app for the browser tests"
npm run build --silent -w @plumbline/web >/dev/null
log "running every test"
"$ROOT/node_modules/.bin/vitest" run "$@"
