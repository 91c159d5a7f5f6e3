#!/usr/bin/env bash
# npm run test:resilience: fault and load tests on throwaway PostgreSQL and Redis of their own (the
# tests stop and start them), then the figures they measured. Non-zero on any failure.
# Settings: RESILIENCE_PG_PORT (54349), RESILIENCE_REDIS_PORT (63809); RESILIENCE_LARGE_ROWS, and the
# load test's LOAD_UPLOADS, LOAD_ROWS, LOAD_READERS, LOAD_SECONDS (see docs/reliability.md).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

export NODE_ENV=test
export PG_PORT="${RESILIENCE_PG_PORT:-54349}"
export REDIS_PORT="${RESILIENCE_REDIS_PORT:-63809}"
PLUMBLINE_DATA_DIR="$(mktemp -d "${TMPDIR:-/tmp}/plumbline-resilience-XXXXXX")"
chmod 755 "$PLUMBLINE_DATA_DIR"   # the postgres user must reach its data directory
export PLUMBLINE_DATA_DIR
export RESILIENCE_FIGURES_FILE="$PLUMBLINE_DATA_DIR/figures.txt"

cleanup() {
  bash scripts/services.sh stop >/dev/null 2>&1 || true
  rm -rf "$PLUMBLINE_DATA_DIR" "${TMPDIR:-/tmp}/plumbline-pg-$PG_PORT"
}
trap cleanup EXIT

ensure_dependencies
start_services
log "running the fault and load tests"
status=0
"$ROOT/node_modules/.bin/vitest" run --config tests/resilience/vitest.config.ts "$@" || status=$?
echo
echo "Resilience figures:"
sed 's/^/  /' "$RESILIENCE_FIGURES_FILE" 2>/dev/null || echo "  (none recorded)"
exit "$status"
