#!/usr/bin/env bash
# npm start: install what is missing, then start everything Beadroll needs and serve it on loopback.
set -euo pipefail
cd "$(dirname "$0")/.."
bash docker-free-scripts/install.sh
source docker-free-scripts/env.sh
exec node --import tsx docker-free-scripts/start.ts
