#!/usr/bin/env bash
# Start a project-local PostgreSQL 15 (Debian's server) on 127.0.0.1:$PGPORT with its data in
# .data/pg, installing Debian's server first if it is missing. Idempotent. Creates database $1
# (default $KR_DB) if absent.
set -euo pipefail
source "$(dirname "$0")/env.sh"
PGBIN=/usr/lib/postgresql/15/bin
if [ ! -x "$PGBIN/initdb" ]; then
  echo "[pg] installing Debian's PostgreSQL server"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
fi
PGDATA_DIR="${PGDATA_DIR:-$KR_DATA/pg}"
if [ "$(id -u)" = 0 ]; then
  id postgres >/dev/null 2>&1 || useradd --system --home-dir /var/lib/postgresql --shell /bin/bash postgres
  # the server runs as 'postgres', which must traverse every parent folder of its data dir
  if ! runuser -u postgres -- test -x "$KR_DATA"; then PGDATA_DIR="/tmp/kilorung-$(echo "$KR_ROOT" | md5sum | cut -c1-8)-pg"; fi
  AS=(runuser -u postgres --)
else
  AS=()
fi
if [ ! -s "$PGDATA_DIR/PG_VERSION" ]; then
  rm -rf "$PGDATA_DIR"; mkdir -p "$PGDATA_DIR"
  if [ "$(id -u)" = 0 ]; then chown postgres:postgres "$PGDATA_DIR"; fi
  chmod 700 "$PGDATA_DIR"
  "${AS[@]}" "$PGBIN/initdb" -D "$PGDATA_DIR" -U app --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
fi
echo "$PGDATA_DIR" > "$KR_DATA/pgdata-path"
if ! "${AS[@]}" "$PGBIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
  # -k /tmp keeps the unix socket out of the project tree (a socket there breaks next build)
  "${AS[@]}" "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -l "$PGDATA_DIR/server.log" -w -t 60 \
    -o "-p $PGPORT -h 127.0.0.1 -k /tmp -c max_connections=200" start >/dev/null
  echo "[pg] started on 127.0.0.1:$PGPORT ($PGDATA_DIR)"
fi
DB="${1:-$KR_DB}"
"$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -qAtc "SELECT 1 FROM pg_database WHERE datname='$DB'" | grep -q 1 \
  || "$PGBIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U app "$DB"
