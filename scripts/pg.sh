#!/usr/bin/env bash
# PostgreSQL on loopback for development and tests. Source this file, then call pg_up / pg_down / pg_create_db.
# Runs the server as the `postgres` OS user when invoked as root (PostgreSQL refuses to run as root).

PROJECT_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"

as_pg() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }

pg_install_if_missing() {
  if ! ls -d /usr/lib/postgresql/*/bin >/dev/null 2>&1; then
    echo "Installing Debian's PostgreSQL..."
    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
  fi
  PGBIN="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -n 1)"
  export PGBIN
}

# The data lives under .data/ in the checkout when the postgres user can reach it; otherwise (a checkout
# under a mode-700 folder such as /root) under /var/lib/chronometa, keyed by the checkout's path.
pg_base_dir() {
  local inside="$PROJECT_ROOT/.data"
  if [ "$(id -u)" != 0 ]; then echo "$inside"; return; fi
  mkdir -p "$inside"
  chmod 755 "$inside"
  if runuser -u postgres -- test -x "$inside" 2>/dev/null; then echo "$inside"; return; fi
  local key; key="$(echo -n "$PROJECT_ROOT" | sha1sum | cut -c1-12)"
  echo "/var/lib/chronometa/$key"
}

# pg_up NAME PORT [durable|scratch]: a cluster in <base>/NAME listening on 127.0.0.1:PORT.
# durable (the default, for data a user keeps) keeps fsync on; scratch (throw-away test and bench clusters)
# turns fsync and synchronous commit off for speed.
pg_up() {
  local name="$1" port="$2" durability="${3:-durable}"
  local speed=""
  [ "$durability" = scratch ] && speed="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  pg_install_if_missing
  local base; base="$(pg_base_dir)"
  PG_CLUSTER_DIR="$base/$name"
  PGDATA="$PG_CLUSTER_DIR/data"
  local sockdir="$PG_CLUSTER_DIR/socket" log="$PG_CLUSTER_DIR/postgres.log"
  mkdir -p "$PGDATA" "$sockdir"
  if [ "$(id -u)" = 0 ]; then chown -R postgres:postgres "$PG_CLUSTER_DIR"; fi
  chmod 700 "$PGDATA"
  if [ ! -s "$PGDATA/PG_VERSION" ]; then
    as_pg "$PGBIN/initdb" -D "$PGDATA" -U postgres -A trust -E UTF8 --locale=C.UTF-8 >"$PG_CLUSTER_DIR/initdb.log" 2>&1 \
      || { cat "$PG_CLUSTER_DIR/initdb.log"; return 1; }
  fi
  if ! as_pg "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; then
    as_pg "$PGBIN/pg_ctl" -D "$PGDATA" -l "$log" -w -t 60 \
      -o "-c listen_addresses=127.0.0.1 -p $port -k $sockdir $speed -c max_connections=200" start >/dev/null \
      || { tail -n 20 "$log"; return 1; }
  fi
  local i
  for i in $(seq 1 60); do
    if "$PGBIN/pg_isready" -h 127.0.0.1 -p "$port" -q; then break; fi
    sleep 0.5
  done
  "$PGBIN/pg_isready" -h 127.0.0.1 -p "$port" -q || { echo "PostgreSQL did not accept connections on $port"; return 1; }
  export PG_CLUSTER_DIR PGDATA PG_PORT="$port"
}

pg_create_db() {
  local db="$1"
  local exists
  exists="$("$PGBIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$db'")"
  if [ "$exists" != 1 ]; then
    "$PGBIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -qc "CREATE DATABASE \"$db\"" >/dev/null
  fi
}

pg_drop_db() {
  "$PGBIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -qc "DROP DATABASE IF EXISTS \"$1\" WITH (FORCE)" >/dev/null
}

pg_down() {
  if [ -n "${PGDATA:-}" ] && [ -s "$PGDATA/PG_VERSION" ]; then
    as_pg "$PGBIN/pg_ctl" -D "$PGDATA" -m fast -w stop >/dev/null 2>&1 || true
  fi
}

pg_port_in_use() {
  "$PGBIN/pg_isready" -h 127.0.0.1 -p "$1" -q
}
