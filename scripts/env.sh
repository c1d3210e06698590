# Sourced by the start and test scripts: one place for ports, folders and secrets.
# Every service listens on 127.0.0.1 only.
KR_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export KR_ROOT
export KR_DATA="${KR_DATA:-$KR_ROOT/.data}"
export PGPORT="${PGPORT:-54329}"
export SMTP_PORT="${SMTP_PORT:-2525}"
export MAIL_HTTP_PORT="${MAIL_HTTP_PORT:-2580}"
export S3_PORT="${S3_PORT:-4569}"
export APP_PORT="${APP_PORT:-3000}"
export KR_DB="${KR_DB:-kilorung}"
export DATABASE_URL="${DATABASE_URL:-postgres://app@127.0.0.1:$PGPORT/$KR_DB}"
export EMAIL_SERVER="${EMAIL_SERVER:-smtp://127.0.0.1:$SMTP_PORT}"
export EMAIL_FROM="${EMAIL_FROM:-Kilorung <no-reply@kilorung.test>}"
export MAIL_CATCHER_URL="${MAIL_CATCHER_URL:-http://127.0.0.1:$MAIL_HTTP_PORT}"
export S3_ENDPOINT="${S3_ENDPOINT:-http://127.0.0.1:$S3_PORT}"
export S3_BUCKET="${S3_BUCKET:-kilorung}"
export S3_ACCESS_KEY_ID="${S3_ACCESS_KEY_ID:-S3RVER}"
export S3_SECRET_ACCESS_KEY="${S3_SECRET_ACCESS_KEY:-S3RVER}"
export NEXT_TELEMETRY_DISABLED=1
mkdir -p "$KR_DATA"
# A per-checkout secret, made once and kept out of git (.data is ignored).
if [ -z "${NEXTAUTH_SECRET:-}" ]; then
  [ -s "$KR_DATA/nextauth-secret" ] || node -e "process.stdout.write(require('crypto').randomBytes(32).toString('base64url'))" > "$KR_DATA/nextauth-secret"
  NEXTAUTH_SECRET="$(cat "$KR_DATA/nextauth-secret")"
  export NEXTAUTH_SECRET
fi
