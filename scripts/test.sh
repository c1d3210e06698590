#!/usr/bin/env bash
# `npm test`: install what is missing, start PostgreSQL and the fakes, then lint, typecheck, unit
# and reference tests (engine vs published values and ngspice), route tests against the real
# PostgreSQL, the production build and the end-to-end tests in Debian's Chromium. Exits non-zero
# on the first failure and stops whatever it started.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/env.sh
T0=$(date +%s)
step() { echo; echo "==== $1 ($(( $(date +%s) - T0 )) s)"; }

started_pg=0; fakes_pid=""
cleanup() {
  [ -n "$fakes_pid" ] && kill "$fakes_pid" 2>/dev/null || true
  [ "$started_pg" = 1 ] && bash scripts/pg-down.sh || true
}
trap cleanup EXIT

step "dependencies"
bash scripts/ensure-deps.sh --test

step "lint"
npx eslint --max-warnings=0 .

step "typecheck"
npx tsc --noEmit

step "services"
PGDATA_PATH="$(cat "$KR_DATA/pgdata-path" 2>/dev/null || true)"
if [ -z "$PGDATA_PATH" ] || [ ! -f "$PGDATA_PATH/postmaster.pid" ]; then started_pg=1; fi
bash scripts/pg-up.sh kilorung_test
/usr/lib/postgresql/15/bin/psql -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -qc "DROP DATABASE IF EXISTS kilorung_e2e WITH (FORCE)" >/dev/null
bash scripts/pg-up.sh kilorung_e2e
fakes_pid="$(bash scripts/fakes-up.sh)"

step "unit, reference and route tests (vitest)"
DATABASE_URL="postgres://app@127.0.0.1:$PGPORT/kilorung_test" npx vitest run

step "build"
npx next build

step "end-to-end database"
export E2E_DATABASE_URL="postgres://app@127.0.0.1:$PGPORT/kilorung_e2e"
DATABASE_URL="$E2E_DATABASE_URL" npx tsx scripts/migrate.ts up
DATABASE_URL="$E2E_DATABASE_URL" npx tsx scripts/seed.ts

step "end-to-end tests (Playwright, Debian Chromium)"
npx playwright test

step "all checks passed in $(( $(date +%s) - T0 )) s"
