#!/usr/bin/env bash
# Installs what Beadroll needs and is missing: node_modules (npm ci), and Debian's postgresql, plus for
# the tests chromium, poppler-utils and nginx (the load balancer of the two-instance test; never started
# as a system service: the test runs it in the foreground on loopback). Safe to run again: it only acts
# on what is absent.
set -euo pipefail
cd "$(dirname "$0")/.."
want_browser="${1:-}"

as_root() { if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi; }

missing=()
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || missing+=(postgresql)
if [ "$want_browser" = "--browser" ]; then
  command -v chromium >/dev/null 2>&1 || missing+=(chromium)
  command -v pdftotext >/dev/null 2>&1 || missing+=(poppler-utils)
  [ -x /usr/sbin/nginx ] || missing+=(nginx)
fi
if [ "${#missing[@]}" -gt 0 ]; then
  echo "beadroll: installing Debian packages: ${missing[*]}"
  as_root apt-get update -qq
  # Debian's nginx package would start a system service on port 80 when installed; Beadroll only runs
  # nginx itself, on loopback. A policy-rc.d that refuses service starts holds it back for this install.
  policy=""
  if [ ! -e /usr/sbin/policy-rc.d ]; then
    policy=/usr/sbin/policy-rc.d
    printf '#!/bin/sh\nexit 101\n' | as_root tee "$policy" >/dev/null && as_root chmod +x "$policy"
  fi
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
  [ -z "$policy" ] || as_root rm -f "$policy"
fi

if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "beadroll: installing npm packages (npm ci)"
  npm ci --engine-strict --no-audit --no-fund --loglevel=error
fi
