#!/usr/bin/env bash
# Install what a fresh machine lacks: npm packages (from package-lock.json), Debian's PostgreSQL
# server, and with --test also Debian's Chromium (for Playwright) and ngspice (the reference
# simulator). Everything comes from the npm and Debian registries; nothing is downloaded by a tool
# of its own (no `playwright install`).
set -euo pipefail
cd "$(dirname "$0")/.."
want_test=0
[ "${1:-}" = "--test" ] && want_test=1

if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "[deps] npm ci"
  npm ci --no-audit --no-fund --loglevel=error
fi

apt_pkgs=()
[ -x /usr/lib/postgresql/15/bin/initdb ] || apt_pkgs+=(postgresql)
if [ "$want_test" = 1 ]; then
  [ -x /usr/bin/chromium ] || apt_pkgs+=(chromium)
  command -v ngspice >/dev/null 2>&1 || apt_pkgs+=(ngspice)
  command -v pdftotext >/dev/null 2>&1 || apt_pkgs+=(poppler-utils)
fi
if [ ${#apt_pkgs[@]} -gt 0 ]; then
  echo "[deps] apt-get install ${apt_pkgs[*]}"
  SUDO=(); [ "$(id -u)" = 0 ] || SUDO=(sudo)
  "${SUDO[@]}" apt-get update -qq
  DEBIAN_FRONTEND=noninteractive "${SUDO[@]}" apt-get install -y -qq --no-install-recommends "${apt_pkgs[@]}" >/dev/null
fi
