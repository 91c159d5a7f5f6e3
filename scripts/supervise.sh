#!/usr/bin/env bash
# Keeps one process running: `bash scripts/supervise.sh NAME COMMAND [ARGS...]`.
# When the process exits — a crash, an out-of-memory kill, kill -9 — the supervisor logs how it ended
# and starts it again after 1 s, 2 s, 4 s … at most SUPERVISE_MAX_DELAY seconds (default 30); a run
# that lasted SUPERVISE_RESET_AFTER seconds (default 60) starts the backoff over. SIGTERM or SIGINT
# stops the process (SIGTERM, so it finishes cleanly) and then the supervisor.
set -uo pipefail

name="$1"; shift
max_delay="${SUPERVISE_MAX_DELAY:-30}"
reset_after="${SUPERVISE_RESET_AFTER:-60}"
say() { echo "supervise: $name: $*" >&2; }

child=""
stop() {
  trap - TERM INT
  if [ -n "$child" ] && kill -0 "$child" 2>/dev/null; then
    kill -TERM "$child" 2>/dev/null
    wait "$child" 2>/dev/null
  fi
  exit 0
}
trap stop TERM INT

delay=1
restarts=0
while true; do
  started=$SECONDS
  "$@" &
  child=$!
  wait "$child"
  code=$?
  ran=$((SECONDS - started))
  if [ "$code" -gt 128 ]; then
    how="was killed by signal $(kill -l $((code - 128)) 2>/dev/null || echo $((code - 128)))"
  else
    how="exited with code $code"
  fi
  [ "$ran" -ge "$reset_after" ] && delay=1
  restarts=$((restarts + 1))
  say "$how after ${ran} s; restart $restarts in ${delay} s"
  sleep "$delay" & wait $!
  delay=$((delay * 2)); [ "$delay" -gt "$max_delay" ] && delay="$max_delay"
done
