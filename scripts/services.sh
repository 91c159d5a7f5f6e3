#!/usr/bin/env bash
# Start, stop or report the local PostgreSQL and Redis that Plumbline runs on (loopback only).
# Usage: scripts/services.sh start|stop|status|env, or pg-start|pg-stop|redis-start|redis-stop for one
# service (the resilience tests restart one while the rest keeps running).
#
# Settings (environment): PG_PORT (54329), REDIS_PORT (63790), PLUMBLINE_DATA_DIR (<project>/.data),
# PG_DB (plumbline). Data directories live in the project when the postgres user can reach it,
# otherwise under the system temp directory.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PG_PORT="${PG_PORT:-54329}"
REDIS_PORT="${REDIS_PORT:-63790}"
PG_DB="${PG_DB:-plumbline}"
DATA_DIR="${PLUMBLINE_DATA_DIR:-$ROOT/.data}"
PG_OS_USER="${PG_OS_USER:-postgres}"
HOST=127.0.0.1

say() { echo "services: $*" >&2; }
is_root() { [ "$(id -u)" = 0 ]; }

find_pg_bin() {
  if [ -n "${PG_BIN:-}" ] && [ -x "$PG_BIN/initdb" ]; then echo "$PG_BIN"; return 0; fi
  local d
  for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -Vr); do
    if [ -x "$d/initdb" ]; then echo "$d"; return 0; fi
  done
  return 1
}

apt_install() {
  if is_root; then
    say "installing $* from Debian's packages"
    apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
  else
    say "missing: $*. Install it with:"
    echo "  sudo apt-get update && sudo apt-get install -y $*" >&2
    exit 1
  fi
}

ensure_binaries() {
  find_pg_bin >/dev/null || apt_install postgresql
  command -v redis-server >/dev/null && command -v redis-cli >/dev/null || apt_install redis-server
  PG_BIN="$(find_pg_bin)"
}

# As root the postgres binaries run as the postgres user, who must be able to reach the data directory.
as_pg() { if is_root; then (cd / && runuser -u "$PG_OS_USER" -- "$@"); else (cd / && "$@"); fi; }

pg_data_dir() {
  local dir="$DATA_DIR/pg-$PG_PORT"
  if is_root; then
    mkdir -p "$DATA_DIR"
    if ! runuser -u "$PG_OS_USER" -- test -x "$DATA_DIR"; then
      dir="${TMPDIR:-/tmp}/plumbline-pg-$PG_PORT"
    fi
  fi
  echo "$dir"
}

pg_start() {
  local pgdata; pgdata="$(pg_data_dir)"
  if [ ! -f "$pgdata/PG_VERSION" ]; then
    mkdir -p "$pgdata"
    if is_root; then chown "$PG_OS_USER:" "$pgdata"; fi
    chmod 700 "$pgdata"
    as_pg "$PG_BIN/initdb" -D "$pgdata" -U postgres -A trust -E UTF8 --locale=C.UTF-8 --no-instructions >/dev/null
  fi
  if as_pg "$PG_BIN/pg_ctl" -D "$pgdata" status >/dev/null 2>&1; then
    say "PostgreSQL already running on $HOST:$PG_PORT"
  else
    if ! as_pg "$PG_BIN/pg_ctl" -D "$pgdata" -l "$pgdata/server.log" -w -t 60 \
      -o "-c listen_addresses=$HOST -p $PG_PORT -k $pgdata ${PG_EXTRA_OPTS:-}" start >/dev/null; then
      say "PostgreSQL failed to start; last lines of $pgdata/server.log:"
      tail -n 30 "$pgdata/server.log" >&2 || true
      exit 1
    fi
    say "PostgreSQL started on $HOST:$PG_PORT (data: $pgdata)"
  fi
  for _ in $(seq 1 120); do "$PG_BIN/pg_isready" -q -h "$HOST" -p "$PG_PORT" && break; sleep 0.25; done
  "$PG_BIN/pg_isready" -q -h "$HOST" -p "$PG_PORT" || { say "PostgreSQL is not ready"; tail -n 30 "$pgdata/server.log" >&2; exit 1; }
  if ! "$PG_BIN/psql" -h "$HOST" -p "$PG_PORT" -U postgres -d postgres -tAc \
    "SELECT 1 FROM pg_database WHERE datname='$PG_DB'" | grep -q 1; then
    "$PG_BIN/createdb" -h "$HOST" -p "$PG_PORT" -U postgres "$PG_DB"
  fi
}

pg_stop() {
  local pgdata; pgdata="$(pg_data_dir)"
  if [ -f "$pgdata/PG_VERSION" ] && as_pg "$PG_BIN/pg_ctl" -D "$pgdata" status >/dev/null 2>&1; then
    as_pg "$PG_BIN/pg_ctl" -D "$pgdata" -m fast -w stop >/dev/null && say "PostgreSQL stopped"
  else
    say "PostgreSQL not running"
  fi
}

redis_dir() { echo "$DATA_DIR/redis-$REDIS_PORT"; }

redis_start() {
  local dir; dir="$(redis_dir)"; mkdir -p "$dir"
  if redis-cli -h "$HOST" -p "$REDIS_PORT" ping >/dev/null 2>&1; then
    say "Redis already running on $HOST:$REDIS_PORT"
  else
    # Appendonly keeps queued jobs across a restart; PostgreSQL stays the source of truth regardless.
    redis-server --bind "$HOST" --port "$REDIS_PORT" --protected-mode yes --save '' --appendonly yes \
      --daemonize yes --pidfile "$dir/redis.pid" --logfile "$dir/redis.log" --dir "$dir" >/dev/null
    for _ in $(seq 1 100); do redis-cli -h "$HOST" -p "$REDIS_PORT" ping >/dev/null 2>&1 && break; sleep 0.1; done
    if ! redis-cli -h "$HOST" -p "$REDIS_PORT" ping >/dev/null 2>&1; then
      say "Redis failed to start; last lines of $dir/redis.log:"; tail -n 30 "$dir/redis.log" >&2 || true; exit 1
    fi
    say "Redis started on $HOST:$REDIS_PORT (data: $dir)"
  fi
}

redis_stop() {
  if redis-cli -h "$HOST" -p "$REDIS_PORT" ping >/dev/null 2>&1; then
    redis-cli -h "$HOST" -p "$REDIS_PORT" shutdown nosave >/dev/null 2>&1 || true
    say "Redis stopped"
  else
    say "Redis not running"
  fi
}

print_env() {
  echo "DATABASE_URL=postgres://postgres@$HOST:$PG_PORT/$PG_DB"
  echo "REDIS_URL=redis://$HOST:$REDIS_PORT"
}

case "${1:-}" in
  start) ensure_binaries; pg_start; redis_start; print_env ;;
  stop) PG_BIN="$(find_pg_bin || echo /nonexistent)"; pg_stop; command -v redis-cli >/dev/null && redis_stop || true ;;
  status)
    PG_BIN="$(find_pg_bin || echo /nonexistent)"; rc=0
    if [ -x "$PG_BIN/pg_isready" ] && "$PG_BIN/pg_isready" -q -h "$HOST" -p "$PG_PORT"; then echo "postgresql: running on $HOST:$PG_PORT"; else echo "postgresql: stopped"; rc=3; fi
    if command -v redis-cli >/dev/null && redis-cli -h "$HOST" -p "$REDIS_PORT" ping >/dev/null 2>&1; then echo "redis: running on $HOST:$REDIS_PORT"; else echo "redis: stopped"; rc=3; fi
    exit $rc ;;
  env) print_env ;;
  pg-start) ensure_binaries; pg_start ;;
  pg-stop) PG_BIN="$(find_pg_bin || echo /nonexistent)"; pg_stop ;;
  redis-start) ensure_binaries; redis_start ;;
  redis-stop) redis_stop ;;
  *) echo "usage: $0 start|stop|status|env|pg-start|pg-stop|redis-start|redis-stop" >&2; exit 2 ;;
esac
