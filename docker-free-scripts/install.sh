#!/usr/bin/env bash
# Installs what Beadroll needs and is missing: node_modules (npm ci), and Debian's postgresql, chromium
# and poppler-utils. Safe to run again: it only acts on what is absent.
set -euo pipefail
cd "$(dirname "$0")/.."
want_browser="${1:-}"

as_root() { if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi; }

missing=()
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || missing+=(postgresql)
if [ "$want_browser" = "--browser" ]; then
  command -v chromium >/dev/null 2>&1 || missing+=(chromium)
  command -v pdftotext >/dev/null 2>&1 || missing+=(poppler-utils)
fi
if [ "${#missing[@]}" -gt 0 ]; then
  echo "beadroll: installing Debian packages: ${missing[*]}"
  as_root apt-get update -qq
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "beadroll: installing npm packages (npm ci)"
  npm ci --engine-strict --no-audit --no-fund --loglevel=error
fi
