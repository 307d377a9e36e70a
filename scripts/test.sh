#!/usr/bin/env bash
# npm test: the same set-up as npm start against a separate, fresh test database,
# then type checks, unit, integration and browser tests. Ends with "N passed, N failed".
source "$(dirname "$0")/lib.sh"

PGPORT=${TEST_PGPORT:-54339}
PORT=${TEST_PORT:-3100}
MAIL_SMTP_PORT=${TEST_MAIL_SMTP_PORT:-2535}
MAIL_HTTP_PORT=${TEST_MAIL_HTTP_PORT:-2536}
RESULTS="$DATA/test-results"

ensure_debian_packages postgresql curl chromium ngspice fonts-dejavu-core
ensure_node_modules
ensure_secret
start_postgres pg-test "$PGPORT"
ensure_database "$PGPORT" junctionary_test fresh

export DATABASE_URL="postgres://junctionary@127.0.0.1:$PGPORT/junctionary_test"
export SMTP_URL="smtp://127.0.0.1:$MAIL_SMTP_PORT"
export MAIL_CATCHER_URL="http://127.0.0.1:$MAIL_HTTP_PORT"
export DEV_MAILBOX=1
export BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-16M}
export HOST=127.0.0.1 PORT ORIGIN="http://127.0.0.1:$PORT" APP_URL="http://127.0.0.1:$PORT"
export NODE_ENV=production

cleanup() {
	trap - INT TERM EXIT
	[ -n "${SERVER_PID:-}" ] && kill "$SERVER_PID" 2>/dev/null && wait "$SERVER_PID" 2>/dev/null
	[ -n "${CATCHER_PID:-}" ] && kill "$CATCHER_PID" 2>/dev/null
	[ "${PG_STARTED_HERE:-0}" = 1 ] && stop_postgres "$PGDATA_DIR"
}
trap cleanup INT TERM EXIT

migrate
(cd "$ROOT" && npx tsx seed/index.ts)
start_mail_catcher "$MAIL_SMTP_PORT" "$MAIL_HTTP_PORT"

rm -rf "$RESULTS" && mkdir -p "$RESULTS"
status=0
cd "$ROOT"

log "type check (svelte-check)"
if npx svelte-check --tsconfig ./tsconfig.json --fail-on-warnings --output machine >"$RESULTS/check.txt" 2>&1; then
	echo "svelte-check: 0 errors" >"$RESULTS/check.status"
else
	status=1; grep -E 'ERROR|WARNING' "$RESULTS/check.txt" | head -40; echo fail >"$RESULTS/check.status"
fi

log "unit tests"
npx vitest run --project unit --reporter=default --reporter=json --outputFile="$RESULTS/unit.json" || status=1

log "building"
npx vite build --logLevel warn || status=1
node build >"$DATA/test-server.log" 2>&1 &
SERVER_PID=$!
wait_for_http "$APP_URL/api/v1/health" || { status=1; tail -30 "$DATA/test-server.log"; }

log "integration tests (PostgreSQL on :$PGPORT, app on :$PORT)"
npx vitest run --project integration --reporter=default --reporter=json --outputFile="$RESULTS/integration.json" || status=1

log "fault tests (PostgreSQL stopped and restarted under the app)"
PG_CLUSTER=pg-test PGPORT=$PGPORT npx vitest run --project faults --reporter=default --reporter=json --outputFile="$RESULTS/faults.json" || status=1

log "browser tests (Debian chromium)"
PLAYWRIGHT_JSON_OUTPUT_NAME="$RESULTS/e2e.json" npx playwright test --reporter=list,json || status=1

node scripts/test-summary.mjs "$RESULTS" || status=1
exit $status
