#!/usr/bin/env bash
# npm test: install what is missing (with Chromium for the browser tests), then run every suite against
# real services on ports of its own.
set -euo pipefail
cd "$(dirname "$0")/.."
bash docker-free-scripts/install.sh --browser
# The test run's own ports and data folder, so that it runs beside a developer's `npm start`.
export PORT="${TEST_PORT:-18080}" PGPORT="${TEST_PGPORT:-55433}" SMTP_PORT="${TEST_SMTP_PORT:-12525}" \
  S3_PORT="${TEST_S3_PORT:-14569}" DATA_DIR="${TEST_DATA_DIR:-.data-test}" PGDATABASE=beadroll_test
source docker-free-scripts/env.sh
exec node --import tsx docker-free-scripts/test.ts "$@"
