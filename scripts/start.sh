#!/usr/bin/env bash
# npm start: set everything up on a fresh machine and run Plumbline on the demo network.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

export PORT="${PORT:-5180}"
export NODE_ENV="${NODE_ENV:-development}"

ensure_dependencies
services_were_running=0
bash scripts/services.sh status >/dev/null 2>&1 && services_were_running=1
start_services

mkdir -p .data
if [ -z "${JWT_SECRET:-}" ]; then
  [ -s .data/jwt-secret ] || (umask 077 && node -e "process.stdout.write(require('crypto').randomBytes(48).toString('hex'))" > .data/jwt-secret)
  chmod 600 .data/jwt-secret
  JWT_SECRET="$(cat .data/jwt-secret)"; export JWT_SECRET
fi
export STORAGE_DIR="${STORAGE_DIR:-$ROOT/.data/uploads}"

log "applying migrations"
"$(tsx_bin)" packages/db/src/migrate.ts
log "seeding the demo network when the database is empty"
"$(tsx_bin)" packages/db/src/seed/run.ts
log "building the web app"
npm run build --silent -w @plumbline/web >/dev/null

pids=()
cleanup() {
  trap - INT TERM EXIT
  log "stopping"
  for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done
  wait 2>/dev/null || true
  if [ "$services_were_running" = 0 ]; then bash scripts/services.sh stop || true; fi
}
trap cleanup INT TERM EXIT

# Each process runs under the supervisor: a crash restarts it (with backoff, logged), never the stack.
# `node --import tsx` (not the tsx command, which runs node as a child of its own) so the supervised
# process is the server itself: a kill reaches it and its exit is what the supervisor sees.
bash scripts/supervise.sh api node --import tsx apps/api/src/main.ts & pids+=($!)
# The worker streams files; a bounded heap keeps its memory predictable on a shared machine. It runs
# at a lower CPU priority (WORKER_NICE), so storing uploads never starves the API's readers.
NODE_OPTIONS="${WORKER_NODE_OPTIONS:---max-old-space-size=384}" nice -n "${WORKER_NICE:-10}" \
  bash scripts/supervise.sh worker node --import tsx apps/worker/src/main.ts & pids+=($!)

for _ in $(seq 1 100); do curl -fs "http://127.0.0.1:$PORT/api/health" >/dev/null 2>&1 && break; sleep 0.2; done
cat <<MSG

  Plumbline is running at http://127.0.0.1:$PORT
  Demo accounts (password: plumbline-demo, or the value of DEMO_PASSWORD at first seeding):
$("$(tsx_bin)" packages/db/src/seed/accounts.ts 2>/dev/null | sed 's/^/    /')

  Press Ctrl-C to stop.
MSG
wait -n "${pids[@]}" || true
