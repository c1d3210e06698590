#!/usr/bin/env bash
# `npm run bench:canvas [-- --no-build]`: the editor's speed in Debian's Chromium against the
# production build and the real PostgreSQL on loopback (database `kilorung_bench`, migrated and
# seeded here). Builds first unless --no-build; starts and stops its own `next start`.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/env.sh
BENCH_PORT="${BENCH_PORT:-3190}"
build=1
for a in "$@"; do [ "$a" = "--no-build" ] && build=0; done

started_pg=0; web_pid=""
cleanup() {
  [ -n "$web_pid" ] && kill "$web_pid" 2>/dev/null || true
  [ "$started_pg" = 1 ] && bash scripts/pg-down.sh || true
}
trap cleanup EXIT

bash scripts/ensure-deps.sh --test
PGDATA_PATH="$(cat "$KR_DATA/pgdata-path" 2>/dev/null || true)"
if [ -z "$PGDATA_PATH" ] || [ ! -f "$PGDATA_PATH/postmaster.pid" ]; then started_pg=1; fi
bash scripts/pg-up.sh kilorung_bench
export DATABASE_URL="postgres://app@127.0.0.1:$PGPORT/kilorung_bench"
npx tsx scripts/migrate.ts up >/dev/null
npx tsx scripts/seed.ts >/dev/null

if [ "$build" = 1 ] || [ ! -f .next/BUILD_ID ]; then
  echo "[bench:canvas] building"
  npx next build >"$KR_DATA/bench-build.log" 2>&1 || { tail -40 "$KR_DATA/bench-build.log"; exit 1; }
fi
export NEXTAUTH_URL="http://127.0.0.1:$BENCH_PORT"
node node_modules/next/dist/bin/next start -H 127.0.0.1 -p "$BENCH_PORT" >"$KR_DATA/bench-web.log" 2>&1 &
web_pid=$!
for _ in $(seq 1 120); do
  curl -fsS -o /dev/null "http://127.0.0.1:$BENCH_PORT/api/health" 2>/dev/null && break
  kill -0 "$web_pid" 2>/dev/null || { echo "[bench:canvas] the web server exited"; tail -20 "$KR_DATA/bench-web.log"; exit 1; }
  sleep 0.5
done
BENCH_URL="http://127.0.0.1:$BENCH_PORT" npx tsx scripts/bench-canvas.ts
