#!/usr/bin/env bash
# A project-local PostgreSQL cluster on 127.0.0.1, as root or as a normal user.
#
#   bash scripts/pg.sh init|start|run|stop|status|createdb [NAME]|psql [ARGS...]|bin
#
#   init      create the data directory (once; a no-op when it exists)
#   start     start the server in the background (pg_ctl; a no-op when it runs)
#   run       run the server in the foreground (used by the supervisor of `npm start`/`npm test`)
#   stop      fast shutdown (pg_ctl stop -m fast; a no-op when it is stopped)
#   status    exit 0 when the server runs, 3 when not
#   createdb  create database NAME (default: tributary) unless it exists
#   psql      psql connected to $PGDATABASE (default: tributary); extra arguments go to psql
#   bin       print the directory of the server binaries (installing them when missing)
#
# Environment: PGDATA_DIR (default .data/pg), PGPORT (default 54329), PGSOCK_DIR (default: pgsock next to
# the data dir), PGLOG (default: logs/pg.log next to the data dir, used by `start` only),
# PG_EXTRA_OPTS (extra `-c name=value` server options, e.g. fsync=off for throwaway clusters).
#
# PostgreSQL refuses to run as root. As root the server binaries run inside a user namespace in which
# root appears as the `postgres` user (files stay owned by root, works in any folder); if user namespaces
# are refused, it falls back to `runuser -u postgres` after handing the data directory to that user.
set -euo pipefail

ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
abs() { case "$1" in /*) printf '%s\n' "$1" ;; *) printf '%s\n' "$ROOT/$1" ;; esac; }

PGDATA_DIR=$(abs "${PGDATA_DIR:-.data/pg}")
PGPORT=${PGPORT:-54329}
BASE_DIR=$(dirname "$PGDATA_DIR")
PGSOCK_DIR=$(abs "${PGSOCK_DIR:-$BASE_DIR/pgsock}")
PGLOG=$(abs "${PGLOG:-$BASE_DIR/logs/pg.log}")
PG_EXTRA_OPTS=${PG_EXTRA_OPTS:-}

say() { printf '[pg] %s\n' "$*" >&2; }
die() { printf '[pg] %s\n' "$*" >&2; exit 1; }

# --- server binaries --------------------------------------------------------------------------------
find_bin() {
  local dir
  dir=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
  if [[ -n "$dir" && -x "$dir/initdb" && -x "$dir/postgres" ]]; then printf '%s\n' "$dir"; fi
}

PGBIN=$(find_bin)
if [[ -z "$PGBIN" ]]; then
  if [[ $(id -u) -eq 0 ]]; then SUDO=()
  elif command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then SUDO=(sudo -n)
  else
    die "PostgreSQL's server binaries were not found in /usr/lib/postgresql/*/bin.
[pg] Install them once as an administrator, then run this again:
[pg]     sudo apt-get update && sudo apt-get install -y postgresql"
  fi
  say "PostgreSQL server binaries missing: installing Debian's postgresql package with apt-get"
  "${SUDO[@]}" env DEBIAN_FRONTEND=noninteractive apt-get update -q >&2
  "${SUDO[@]}" env DEBIAN_FRONTEND=noninteractive apt-get install -y -q postgresql >&2
  PGBIN=$(find_bin)
  [[ -n "$PGBIN" ]] || die "apt-get install postgresql finished but /usr/lib/postgresql/*/bin is still missing"
fi

# --- how to run server binaries (never as root) ------------------------------------------------------
AS=()
FALLBACK_RUNUSER=0
if [[ $(id -u) -eq 0 ]]; then
  if id postgres >/dev/null 2>&1; then PGUSER_OS=postgres; else PGUSER_OS=nobody; fi
  if unshare --user --map-user="$PGUSER_OS" --map-group="$PGUSER_OS" true 2>/dev/null; then
    AS=(unshare --user --map-user="$PGUSER_OS" --map-group="$PGUSER_OS")
  elif [[ $PGUSER_OS == postgres ]] && command -v runuser >/dev/null 2>&1; then
    AS=(runuser -u postgres --)
    FALLBACK_RUNUSER=1
  else
    die "running as root, but user namespaces are refused (unshare --user) and there is no 'postgres' user for runuser.
[pg] Run as a normal user, or install the postgresql package (it creates the postgres user)."
  fi
fi

# Server binaries run from / so that a user who cannot read the caller's directory does not complain.
as_server() { (cd / && "${AS[@]}" "$@"); }

hand_over() { # only for the runuser fallback: the postgres user must own what the server writes
  if [[ $FALLBACK_RUNUSER -eq 1 ]]; then chown -R postgres: "$@"; fi
}

server_opts() {
  local sock="$PGSOCK_DIR"
  # Unix socket paths are limited to 107 bytes: with a deep project folder, listen on TCP only.
  if (( ${#sock} > 90 )); then sock=""; fi
  printf -- "-c listen_addresses=127.0.0.1 -p %s -k '%s' %s" "$PGPORT" "$sock" "$PG_EXTRA_OPTS"
}

is_running() { as_server "$PGBIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; }

wait_ready() {
  local i
  for i in $(seq 1 120); do
    if "$PGBIN/pg_isready" -q -h 127.0.0.1 -p "$PGPORT" -U postgres; then return 0; fi
    sleep 0.5
  done
  die "PostgreSQL on 127.0.0.1:$PGPORT did not accept connections within 60 s (log: $PGLOG)"
}

cmd_init() {
  if [[ -f "$PGDATA_DIR/PG_VERSION" ]]; then return 0; fi
  mkdir -p "$PGDATA_DIR" "$PGSOCK_DIR" "$(dirname "$PGLOG")"
  chmod 700 "$PGDATA_DIR"
  hand_over "$PGDATA_DIR" "$PGSOCK_DIR"
  say "initialising a cluster in $PGDATA_DIR ($("$PGBIN/postgres" --version))"
  as_server "$PGBIN/initdb" -D "$PGDATA_DIR" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
}

cmd_start() {
  cmd_init
  if is_running; then say "already running on 127.0.0.1:$PGPORT"; return 0; fi
  mkdir -p "$PGSOCK_DIR" "$(dirname "$PGLOG")"
  touch "$PGLOG"
  hand_over "$PGSOCK_DIR" "$PGLOG"
  as_server "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -l "$PGLOG" -w -t 60 -o "$(server_opts)" start >/dev/null \
    || die "PostgreSQL did not start; see $PGLOG"
  wait_ready
  say "running on 127.0.0.1:$PGPORT (data $PGDATA_DIR)"
}

cmd_run() {
  cmd_init
  if is_running; then die "a server already runs on $PGDATA_DIR; stop it first: bash scripts/pg.sh stop"; fi
  mkdir -p "$PGSOCK_DIR"
  hand_over "$PGSOCK_DIR"
  local opts
  opts=$(server_opts)
  # eval keeps the quoted empty socket dir ('') a single argument.
  cd /
  eval "exec ${AS[*]:-} \"\$PGBIN/postgres\" -D \"\$PGDATA_DIR\" $opts"
}

cmd_stop() {
  if ! is_running; then return 0; fi
  as_server "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -m fast -w -t 60 stop >/dev/null
  say "stopped (127.0.0.1:$PGPORT)"
}

cmd_createdb() {
  local name=${1:-tributary}
  [[ $name =~ ^[a-z_][a-z0-9_]*$ ]] || die "invalid database name: $name"
  local exists
  exists=$("$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -XtAq \
    -c "select 1 from pg_database where datname = '$name'")
  if [[ $exists == 1 ]]; then return 0; fi
  "$PGBIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U postgres "$name"
  say "created database $name"
}

case "${1:-}" in
  init) cmd_init ;;
  start) cmd_start ;;
  run) cmd_run ;;
  stop) cmd_stop ;;
  status)
    if is_running; then echo "running on 127.0.0.1:$PGPORT (data $PGDATA_DIR)"; exit 0; fi
    echo "stopped (data $PGDATA_DIR)"; exit 3 ;;
  createdb) shift; cmd_createdb "${1:-tributary}" ;;
  psql) shift; exec "$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d "${PGDATABASE:-tributary}" "$@" ;;
  bin) printf '%s\n' "$PGBIN" ;;
  *) echo "usage: bash scripts/pg.sh init|start|run|stop|status|createdb [NAME]|psql [ARGS...]|bin" >&2; exit 2 ;;
esac
