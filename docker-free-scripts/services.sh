#!/usr/bin/env bash
# Starts or stops the three real parts Beadroll needs on loopback, in the background, for working on the
# API or running one test file by hand: PostgreSQL, the mail catcher and the object store.
#   bash docker-free-scripts/services.sh up | down
# Ports and the data folder come from env.sh (PGPORT, SMTP_PORT, S3_PORT, DATA_DIR).
set -euo pipefail
source "$(dirname "$0")/env.sh"
PIDFILE="$DATA_DIR/services.pid"
case "${1:-}" in
  up)
    bash "$ROOT_DIR/docker-free-scripts/pg.sh" start --fast
    if [ -f "$PIDFILE" ] && kill -0 "$(cat "$PIDFILE")" 2>/dev/null; then
      echo "beadroll: mail catcher and object store already running"
    else
      nohup node "$ROOT_DIR/node_modules/tsx/dist/cli.mjs" "$ROOT_DIR/docker-free-scripts/side-services.ts" \
        >"$DATA_DIR/side-services.log" 2>&1 &
      echo $! >"$PIDFILE"
      for _ in $(seq 1 50); do grep -q 'ready' "$DATA_DIR/side-services.log" 2>/dev/null && break; sleep 0.1; done
      cat "$DATA_DIR/side-services.log"
    fi ;;
  down)
    if [ -f "$PIDFILE" ]; then kill "$(cat "$PIDFILE")" 2>/dev/null || true; rm -f "$PIDFILE"; fi
    bash "$ROOT_DIR/docker-free-scripts/pg.sh" stop ;;
  *) echo "usage: services.sh up | down" >&2; exit 2 ;;
esac
