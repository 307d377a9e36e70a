#!/usr/bin/env bash
# npm start: set everything up, load the demo, build and serve on 127.0.0.1.
source "$(dirname "$0")/lib.sh"

PGPORT=${PGPORT:-54329}
PORT=${PORT:-3000}
MAIL_SMTP_PORT=${MAIL_SMTP_PORT:-2525}
MAIL_HTTP_PORT=${MAIL_HTTP_PORT:-2526}

ensure_debian_packages postgresql curl
ensure_node_modules
ensure_secret
start_postgres pg "$PGPORT"
ensure_database "$PGPORT" junctionary

export DATABASE_URL="postgres://junctionary@127.0.0.1:$PGPORT/junctionary"
export SMTP_URL="smtp://127.0.0.1:$MAIL_SMTP_PORT"
export MAIL_CATCHER_URL="http://127.0.0.1:$MAIL_HTTP_PORT"
export DEV_MAILBOX=${DEV_MAILBOX:-1}
export HOST=127.0.0.1 PORT ORIGIN="http://127.0.0.1:$PORT" BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-16M}

cleanup() {
	stop_stack
	exit 0
}
trap cleanup INT TERM EXIT

migrate
(cd "$ROOT" && npx tsx seed/index.ts)
start_mail_catcher "$MAIL_SMTP_PORT" "$MAIL_HTTP_PORT"
log "building"
(cd "$ROOT" && npx vite build --logLevel warn)

log "Junctionary is at $ORIGIN  (mailbox: $ORIGIN/dev/mailbox; Ctrl-C stops)"
node "$ROOT/build" &
SERVER_PID=$!
wait "$SERVER_PID"
