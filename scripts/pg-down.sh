#!/usr/bin/env bash
# Stop the project-local PostgreSQL (fast shutdown). A no-op when it is not running.
set -euo pipefail
source "$(dirname "$0")/env.sh"
PGBIN=/usr/lib/postgresql/15/bin
PGDATA_DIR="$(cat "$KR_DATA/pgdata-path" 2>/dev/null || echo "$KR_DATA/pg")"
[ -f "$PGDATA_DIR/postmaster.pid" ] || exit 0
if [ "$(id -u)" = 0 ]; then AS=(runuser -u postgres --); else AS=(); fi
"${AS[@]}" "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -m fast -w -t 60 stop >/dev/null && echo "[pg] stopped"
