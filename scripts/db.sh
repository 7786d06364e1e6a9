#!/usr/bin/env bash
# PostgreSQL on loopback for Phaseloop: one persistent cluster for `npm start` and one throw-away
# cluster for `npm test`, each with its own folder and port so both can run at the same time.
#
#   scripts/db.sh start [--test]   init (first time) and start; prints `export ...` lines
#   scripts/db.sh stop  [--test]   fast shutdown (also clears a stale pid file)
#   scripts/db.sh env   [--test]   prints the `export ...` lines of a running cluster
#   scripts/db.sh status [--test]
#
# Environment: PHASELOOP_PG_DIR / PHASELOOP_PG_PORT (dev cluster, default .phaseloop/pg and 55432),
# PHASELOOP_TEST_PG_DIR (test cluster, default a folder under $TMPDIR named after this checkout).
# PostgreSQL refuses to run as root, so every server command goes through `runuser -u postgres`.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
MODE=dev
CMD="${1:-status}"
shift || true
for arg in "$@"; do
  case "$arg" in
    --test) MODE=test ;;
    *) echo "db.sh: unknown option $arg" >&2; exit 2 ;;
  esac
done

log() { echo "[db] $*" >&2; }

find_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    if [[ -x "$d/initdb" ]]; then echo "$d"; return 0; fi
  done
  return 1
}

ensure_postgres_installed() {
  if ! find_bin >/dev/null; then
    log "PostgreSQL server binaries missing: installing the Debian package"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >&2 || true
    apt-get install -y -qq postgresql >&2
  fi
}

as_pg() {
  # Run from / so that postgres never needs access to the caller's working folder.
  if [[ "$(id -u)" == "0" ]]; then (cd / && runuser -u postgres -- "$@"); else (cd / && "$@"); fi
}

# The postgres user must be able to enter every parent folder of the data directory.
pg_can_enter() {
  local dir="$1"
  if [[ "$(id -u)" != "0" ]]; then return 0; fi
  local probe="$dir"
  while [[ ! -e "$probe" ]]; do probe="$(dirname "$probe")"; done
  (cd / && runuser -u postgres -- test -x "$probe")
}

checkout_tag() { echo -n "$ROOT" | cksum | cut -d' ' -f1; }

cluster_dir() {
  local tmp="${TMPDIR:-/tmp}"
  if [[ "$MODE" == test ]]; then
    echo "${PHASELOOP_TEST_PG_DIR:-$tmp/phaseloop-test-pg-$(checkout_tag)}"
    return
  fi
  local dir="${PHASELOOP_PG_DIR:-$ROOT/.phaseloop/pg}"
  if ! pg_can_enter "$dir"; then
    local fallback="$tmp/phaseloop-pg-$(checkout_tag)"
    log "postgres cannot enter $dir; using $fallback"
    dir="$fallback"
  fi
  echo "$dir"
}

port_free() {
  ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null
}

pick_port() {
  local p="$1"
  while ! port_free "$p"; do p=$((p + 1)); done
  echo "$p"
}

# A killed postmaster can leave a pid file that PostgreSQL itself then refuses; trust /proc only.
running_pid() {
  local data="$1/data"
  [[ -f "$data/postmaster.pid" ]] || return 1
  local pid
  pid="$(head -n1 "$data/postmaster.pid" 2>/dev/null || true)"
  if [[ -n "$pid" && -r "/proc/$pid/cmdline" ]] && tr '\0' ' ' <"/proc/$pid/cmdline" | grep -q postgres; then
    echo "$pid"
    return 0
  fi
  log "removing stale pid file $data/postmaster.pid"
  rm -f "$data/postmaster.pid"
  return 1
}

print_env() {
  local dir="$1" port
  port="$(cat "$dir/port")"
  if [[ "$MODE" == test ]]; then
    echo "export PHASELOOP_TEST_PG_URL=postgres://postgres@127.0.0.1:$port/postgres"
  else
    echo "export DATABASE_URL=postgres://postgres@127.0.0.1:$port/phaseloop"
  fi
}

init_cluster() {
  local dir="$1" bin="$2"
  mkdir -p "$dir"
  chown postgres:postgres "$dir" 2>/dev/null || true
  chmod 700 "$dir"
  log "initialising cluster in $dir/data"
  as_pg "$bin/initdb" -D "$dir/data" -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >"$dir/initdb.log" 2>&1 ||
    as_pg "$bin/initdb" -D "$dir/data" -U postgres --auth=trust --encoding=UTF8 --locale=C >"$dir/initdb.log" 2>&1
  {
    echo "listen_addresses = '127.0.0.1'"
    echo "unix_socket_directories = ''"
    echo "max_connections = 200"
    if [[ "$MODE" == test ]]; then
      # Throw-away cluster: durability is worthless here, speed is not.
      echo "fsync = off"
      echo "synchronous_commit = off"
      echo "full_page_writes = off"
    fi
  } >>"$dir/data/postgresql.conf"
}

start() {
  ensure_postgres_installed
  local bin dir port
  bin="$(find_bin)"
  dir="$(cluster_dir)"
  if [[ ! -f "$dir/data/PG_VERSION" ]]; then
    init_cluster "$dir" "$bin"
  fi
  if running_pid "$dir" >/dev/null; then
    log "already running ($dir, port $(cat "$dir/port"))"
    print_env "$dir"
    return 0
  fi
  if [[ "$MODE" == test ]]; then
    port="$(pick_port "${PHASELOOP_TEST_PG_PORT:-55533}")"
  else
    port="${PHASELOOP_PG_PORT:-55432}"
    if ! port_free "$port"; then
      log "port $port is taken; set PHASELOOP_PG_PORT to another one"
      exit 1
    fi
  fi
  echo "$port" >"$dir/port"
  touch "$dir/server.log"
  chown postgres:postgres "$dir/server.log" 2>/dev/null || true
  as_pg "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -o "-p $port" -w -t 60 start >&2 || {
    tail -n 30 "$dir/server.log" >&2
    exit 1
  }
  if [[ "$MODE" == dev ]]; then
    as_pg "$bin/psql" -h 127.0.0.1 -p "$port" -U postgres -d postgres -tAc \
      "SELECT 1 FROM pg_database WHERE datname='phaseloop'" | grep -q 1 ||
      as_pg "$bin/createdb" -h 127.0.0.1 -p "$port" -U postgres phaseloop
  fi
  log "running ($dir, port $port)"
  print_env "$dir"
}

stop() {
  local bin dir
  bin="$(find_bin)" || { log "no PostgreSQL installed"; return 0; }
  dir="$(cluster_dir)"
  if running_pid "$dir" >/dev/null; then
    as_pg "$bin/pg_ctl" -D "$dir/data" -m fast -w -t 60 stop >&2 || true
  else
    log "not running ($dir)"
  fi
}

case "$CMD" in
  start) start ;;
  stop) stop ;;
  env)
    dir="$(cluster_dir)"
    running_pid "$dir" >/dev/null || { log "not running"; exit 1; }
    print_env "$dir"
    ;;
  status)
    dir="$(cluster_dir)"
    if running_pid "$dir" >/dev/null; then log "running ($dir, port $(cat "$dir/port"))"; else log "stopped ($dir)"; exit 3; fi
    ;;
  *) echo "usage: db.sh start|stop|env|status [--test]" >&2; exit 2 ;;
esac
