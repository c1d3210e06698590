#!/usr/bin/env bash
# Start the local fakes (SMTP catcher + S3) in the background unless they already answer.
# Prints the PID it started (empty when it reused running fakes).
set -euo pipefail
source "$(dirname "$0")/env.sh"
if curl -fsS -o /dev/null "$MAIL_CATCHER_URL/api/messages" 2>/dev/null; then
  echo ""
  exit 0
fi
node "$KR_ROOT/node_modules/tsx/dist/cli.mjs" "$KR_ROOT/scripts/fakes.ts" >"$KR_DATA/fakes.log" 2>&1 &
pid=$!
for _ in $(seq 1 60); do
  if curl -fsS -o /dev/null "$MAIL_CATCHER_URL/api/messages" 2>/dev/null; then echo "$pid"; exit 0; fi
  kill -0 "$pid" 2>/dev/null || { cat "$KR_DATA/fakes.log" >&2; exit 1; }
  sleep 0.5
done
echo "fakes did not start" >&2; cat "$KR_DATA/fakes.log" >&2; exit 1
