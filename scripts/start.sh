#!/usr/bin/env bash
# npm start: set everything up, build and serve.
#
# Demo (no SMTP_URL, the default): a PostgreSQL cluster inside the project, the demo team
# and catalogue, the local mail catcher and its mailbox page, served on 127.0.0.1 only.
# Team (SMTP_URL set, in the environment or .env): mail goes to that server; no demo people,
# no catcher, no mailbox. DATABASE_URL, when set, replaces the project's own cluster.
source "$(dirname "$0")/lib.sh"

STATE="$DATA/start.json"
if ! claim_checkout start; then
	where=$(node -e 'try { const s = require(process.argv[1]); console.log(`${s.url} (pid ${s.pid}, ${s.mode}, started ${s.startedAt})`) } catch { console.log("(still starting)") }' "$STATE")
	log "Junctionary is already running from this checkout: $where"
	log "Open it there, or stop it with Ctrl-C in its terminal (npm run stop also stops its PostgreSQL)."
	exit 0
fi

ensure_node_modules
load_env_file

PORT=${PORT:-3000}
MODE=demo
[ -n "${SMTP_URL:-}" ] && MODE=team
if [ "$MODE" = demo ]; then
	export HOST=${HOST:-127.0.0.1} ORIGIN=${ORIGIN:-http://127.0.0.1:$PORT}
	export MAIL_SMTP_PORT=${MAIL_SMTP_PORT:-2525} MAIL_HTTP_PORT=${MAIL_HTTP_PORT:-2526}
	export MAIL_CATCHER_URL="http://127.0.0.1:$MAIL_HTTP_PORT"
else
	if [ -z "${ORIGIN:-}" ]; then
		echo "SMTP_URL is set (team mode), so ORIGIN must say where people open Junctionary, e.g. ORIGIN=https://junctionary.example" >&2
		exit 2
	fi
	export HOST=${HOST:-0.0.0.0}
fi
export PORT BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-16M}

if [ -z "${DATABASE_URL:-}" ]; then
	PGPORT=${PGPORT:-54329}
	ensure_debian_packages postgresql curl
	start_postgres pg "$PGPORT"
	ensure_database "$PGPORT" junctionary
	export DATABASE_URL="postgres://junctionary@127.0.0.1:$PGPORT/junctionary"
else
	ensure_debian_packages curl
fi
ensure_secret

# Where this start serves, for a second npm start and for the CLI (npm run cli) to find.
write_state() {
	node -e 'const [file, url, pid, mode, db] = process.argv.slice(1);
		require("node:fs").writeFileSync(file, JSON.stringify({ url, pid: Number(pid), mode, databaseUrl: db, startedAt: new Date().toISOString() }, null, 2), { mode: 0o600 })' \
		"$STATE" "$ORIGIN" "$$" "$MODE" "$DATABASE_URL"
}
write_state

cleanup() {
	rm -f "$STATE"
	stop_stack
	exit 0
}
trap cleanup INT TERM EXIT

migrate
if [ "$MODE" = demo ]; then
	(cd "$ROOT" && npx tsx seed/index.ts)
	start_mail_catcher "$MAIL_SMTP_PORT" "$MAIL_HTTP_PORT"
fi
log "building (.data/builds/start)"
build_app "$DATA/builds/start"

if [ "$MODE" = demo ]; then
	log "Junctionary (demo) is at $ORIGIN  (mailbox: $ORIGIN/dev/mailbox; Ctrl-C stops)"
else
	log "Junctionary is at $ORIGIN, listening on $HOST:$PORT, mail through SMTP_URL (Ctrl-C stops)"
fi
node "$DATA/builds/start" &
SERVER_PID=$!
wait "$SERVER_PID"
