#!/usr/bin/env bash
# PostgreSQL from Debian's package, in $DATA_DIR/pg, on 127.0.0.1:$PGPORT only, with its unix socket
# inside the data directory. The server refuses to run as root, so as root it runs as the `postgres`
# system user. Usage: pg.sh start [--fast] | stop | status | reset-db NAME
set -euo pipefail
source "$(dirname "$0")/env.sh"
PGBIN="$(dirname "$(ls -d /usr/lib/postgresql/*/bin/initdb | sort -V | tail -n 1)")"
PGDATA="$DATA_DIR/pg"
LOG="$DATA_DIR/pg.log"

run_pg() {
  if [ "$(id -u)" = 0 ]; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

ensure_traversable() {
  # Every parent of the data directory must be searchable by the postgres user.
  [ "$(id -u)" = 0 ] || return 0
  local d="$DATA_DIR"
  while [ "$d" != "/" ]; do
    if ! runuser -u postgres -- test -x "$d" 2>/dev/null; then chmod o+x "$d"; fi
    d="$(dirname "$d")"
  done
}

psql_admin() {
  run_pg "$PGBIN/psql" -X -q -v ON_ERROR_STOP=1 -h "$PGDATA" -p "$PGPORT" -U postgres -d postgres "$@"
}

start() {
  mkdir -p "$DATA_DIR"
  ensure_traversable
  if [ ! -s "$PGDATA/PG_VERSION" ]; then
    mkdir -p "$PGDATA"
    [ "$(id -u)" = 0 ] && chown postgres:postgres "$PGDATA"
    chmod 700 "$PGDATA"
    run_pg "$PGBIN/initdb" -D "$PGDATA" --auth-local=trust --auth-host=scram-sha-256 -U postgres -E UTF8 --locale=C.UTF-8 >/dev/null
  fi
  touch "$LOG"; [ "$(id -u)" = 0 ] && chown postgres:postgres "$LOG"
  if run_pg "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; then
    echo "beadroll: PostgreSQL already running on 127.0.0.1:$PGPORT"
  else
    local opts="-c listen_addresses=127.0.0.1 -c port=$PGPORT -c unix_socket_directories=$PGDATA"
    if [ "${1:-}" = "--fast" ]; then opts="$opts -c fsync=off -c synchronous_commit=off -c full_page_writes=off"; fi
    run_pg "$PGBIN/pg_ctl" -D "$PGDATA" -l "$LOG" -o "$opts" -w -t 60 start >/dev/null
    echo "beadroll: PostgreSQL started on 127.0.0.1:$PGPORT"
  fi
  # Role and database for the app: password auth over TCP (trust is only for the local socket owner).
  psql_admin -c "DO \$\$ BEGIN IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = '$PGUSER') THEN CREATE ROLE \"$PGUSER\" LOGIN PASSWORD '$PGPASSWORD' CREATEDB; END IF; END \$\$;"
  if [ -z "$(psql_admin -tAc "SELECT 1 FROM pg_database WHERE datname = '$PGDATABASE'")" ]; then
    psql_admin -c "CREATE DATABASE \"$PGDATABASE\" OWNER \"$PGUSER\""
  fi
}

stop() {
  if [ -s "$PGDATA/PG_VERSION" ] && run_pg "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; then
    run_pg "$PGBIN/pg_ctl" -D "$PGDATA" -m fast -w stop >/dev/null
    echo "beadroll: PostgreSQL stopped"
  fi
}

case "${1:-}" in
  start) shift; start "$@" ;;
  stop) stop ;;
  status) run_pg "$PGBIN/pg_ctl" -D "$PGDATA" status ;;
  reset-db)
    name="${2:?database name}"
    psql_admin -c "DROP DATABASE IF EXISTS \"$name\" WITH (FORCE)" -c "CREATE DATABASE \"$name\" OWNER \"$PGUSER\"" ;;
  *) echo "usage: pg.sh start [--fast] | stop | status | reset-db NAME" >&2; exit 2 ;;
esac
