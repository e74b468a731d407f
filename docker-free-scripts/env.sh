# Defaults for every Beadroll script; each one can be overridden from the environment so that two copies
# (a developer's `npm start` and `npm test`, or two checkouts) run side by side.
: "${PORT:=8080}"
: "${PGPORT:=55432}"
: "${SMTP_PORT:=2525}"
: "${S3_PORT:=4569}"
: "${DATA_DIR:=.data}"
: "${PGDATABASE:=beadroll}"
: "${PGUSER:=beadroll}"
: "${PGPASSWORD:=beadroll}"
: "${PGHOST:=127.0.0.1}"
ROOT_DIR="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
case "$DATA_DIR" in /*) ;; *) DATA_DIR="$ROOT_DIR/$DATA_DIR" ;; esac
export PORT PGPORT SMTP_PORT S3_PORT DATA_DIR PGDATABASE PGUSER PGPASSWORD PGHOST ROOT_DIR
export AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED=true
