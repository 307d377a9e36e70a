#!/usr/bin/env bash
# npm test: the same set-up as npm start against a separate, fresh test database,
# then type checks, unit, integration, fault and browser tests. Ends with "N passed, N failed".
source "$(dirname "$0")/lib.sh"

if ! claim_checkout test; then
	echo "Another npm test is running from this checkout (it owns the test cluster and ports); wait for it to finish." >&2
	exit 1
fi
ensure_debian_packages postgresql curl chromium ngspice python3-scipy python3-openpyxl fonts-dejavu-core
trap stop_stack INT TERM EXIT
start_stack pg-test "${TEST_PGPORT:-54339}" junctionary_test "${TEST_PORT:-3100}" \
	"${TEST_MAIL_SMTP_PORT:-2535}" "${TEST_MAIL_HTTP_PORT:-2536}"

RESULTS="$DATA/test-results"
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

log "building and starting the app"
# Its own build folder: a running npm start (or benchmark) keeps its files.
# Without a built, running app every later test would fail for that one reason: stop here.
if ! start_app "$DATA/builds/test" "$DATA/test-server.log"; then
	echo "The app did not build or start (see above and $DATA/test-server.log); the remaining tests were not run." >&2
	node scripts/test-summary.mjs "$RESULTS" || true
	exit 1
fi

log "integration tests (PostgreSQL on :$PGPORT, app on :$PORT)"
npx vitest run --project integration --reporter=default --reporter=json --outputFile="$RESULTS/integration.json" || status=1

log "fault tests (PostgreSQL stopped and restarted under the app)"
npx vitest run --project faults --reporter=default --reporter=json --outputFile="$RESULTS/faults.json" || status=1

log "browser tests (Debian chromium)"
PLAYWRIGHT_JSON_OUTPUT_NAME="$RESULTS/e2e.json" npx playwright test --reporter=list,json || status=1

node scripts/test-summary.mjs "$RESULTS" || status=1
exit $status
