#!/usr/bin/env bash
# npm start: install what is missing, then start everything Beadroll needs and serve it on loopback.
set -euo pipefail
cd "$(dirname "$0")/.."
bash docker-free-scripts/install.sh
source docker-free-scripts/env.sh
exec node node_modules/tsx/dist/cli.mjs docker-free-scripts/start.ts
