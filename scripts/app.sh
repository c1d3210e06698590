#!/usr/bin/env bash
# `npm run app`: install what is missing, start PostgreSQL (project-local, loopback), migrate, seed
# the demo data (idempotent), start the mail catcher and the S3 fake, build and serve Kilorung, and
# start the background worker for analysis runs (scripts/worker.ts; log in .data/worker.log).
# Ctrl-C stops everything this script started.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/env.sh

started_pg=0; fakes_pid=""; web_pid=""; worker_pid=""
cleanup() {
  trap - EXIT INT TERM
  echo; echo "[app] stopping"
  [ -n "$web_pid" ] && kill "$web_pid" 2>/dev/null || true
  # SIGTERM: the worker finishes its current point, puts its run back on the queue and exits.
  if [ -n "$worker_pid" ]; then
    kill "$worker_pid" 2>/dev/null || true
    for _ in $(seq 1 40); do kill -0 "$worker_pid" 2>/dev/null || break; sleep 0.5; done
  fi
  [ -n "$fakes_pid" ] && kill "$fakes_pid" 2>/dev/null || true
  [ "$started_pg" = 1 ] && bash scripts/pg-down.sh || true
  exit 0
}
trap cleanup EXIT INT TERM

bash scripts/ensure-deps.sh
PGDATA_PATH="$(cat "$KR_DATA/pgdata-path" 2>/dev/null || true)"
if [ -z "$PGDATA_PATH" ] || [ ! -f "$PGDATA_PATH/postmaster.pid" ]; then started_pg=1; fi
bash scripts/pg-up.sh "$KR_DB"
npx tsx scripts/migrate.ts up
npx tsx scripts/seed.ts
fakes_pid="$(bash scripts/fakes-up.sh)"
# The analysis worker as one node process (the tsx command line would SIGKILL a busy worker on
# SIGTERM instead of letting it stop gracefully; see scripts/worker.ts).
node --import tsx scripts/worker.ts >>"$KR_DATA/worker.log" 2>&1 &
worker_pid=$!

# A second copy may be running: take the next free port rather than fail.
port_busy() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
while port_busy "$APP_PORT"; do APP_PORT=$((APP_PORT + 1)); done
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://127.0.0.1:$APP_PORT}"

echo "[app] building (about a minute)"
npx next build >"$KR_DATA/build.log" 2>&1 || { tail -40 "$KR_DATA/build.log"; exit 1; }
node node_modules/next/dist/bin/next start -H 127.0.0.1 -p "$APP_PORT" &
web_pid=$!
for _ in $(seq 1 120); do
  curl -fsS -o /dev/null "http://127.0.0.1:$APP_PORT/api/health" 2>/dev/null && break
  kill -0 "$web_pid" 2>/dev/null || { echo "[app] the web server exited"; exit 1; }
  sleep 0.5
done
kill -0 "$worker_pid" 2>/dev/null || { echo "[app] the analysis worker exited:"; tail -20 "$KR_DATA/worker.log"; exit 1; }
cat <<MSG

  Kilorung is up:        http://127.0.0.1:$APP_PORT
  Caught e-mail:         $MAIL_CATCHER_URL
  Analysis worker log:   $KR_DATA/worker.log
  Demo sign-ins (team Tallgrass Instruments), password kilorung-demo-1:
    owner     ada.owner@tallgrass.test
    designer  dev.designer@tallgrass.test
    reviewer  rue.reviewer@tallgrass.test
    viewer    val.viewer@tallgrass.test
  Ctrl-C stops the app, the worker, the fakes and the database this script started.

MSG
wait "$web_pid"
