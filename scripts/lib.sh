#!/usr/bin/env bash
# Shared set-up for `npm start` and `npm test`: Debian packages, npm dependencies,
# a PostgreSQL cluster inside the project on loopback, migrations, the mail catcher.
# Every step is idempotent, so running it twice is harmless.
set -euo pipefail

ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
DATA="$ROOT/.data"
PGBIN=/usr/lib/postgresql/15/bin
mkdir -p "$DATA"

log() { printf '\033[2m[junctionary]\033[0m %s\n' "$*"; }

as_root() { if [ "$(id -u)" -eq 0 ]; then "$@"; else sudo "$@"; fi; }

# Install the Debian packages that are missing (postgresql always; more for tests).
ensure_debian_packages() {
	local missing=() pkg
	for pkg in "$@"; do
		dpkg-query -W -f='${Status}' "$pkg" 2>/dev/null | grep -q 'install ok installed' || missing+=("$pkg")
	done
	[ ${#missing[@]} -eq 0 ] && return 0
	log "installing Debian packages: ${missing[*]}"
	as_root apt-get update -qq
	DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
}

ensure_node_modules() {
	if [ ! -d "$ROOT/node_modules" ] || [ "$ROOT/package-lock.json" -nt "$ROOT/node_modules/.package-lock.json" ]; then
		# npm ci replaces node_modules, which a running npm start still loads from.
		if [ "${CLAIMED:-}" != start ] && ! flock -n "$DATA/start.lock" true 2>/dev/null; then
			echo "The npm dependencies changed, but npm start is running from this checkout and uses them: stop it first." >&2
			exit 1
		fi
		log "installing npm dependencies (npm ci)"
		(cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error)
	fi
	(cd "$ROOT" && npx svelte-kit sync >/dev/null)
}

# load_env_file: settings from the git-ignored .env that the shell has not set already
# (parsed by Node's util.parseEnv, as the CLI reads the same file).
load_env_file() {
	local envfile="$ROOT/.env"
	[ -f "$envfile" ] || return 0
	eval "$(node -e '
		const { parseEnv } = require("node:util");
		const vars = parseEnv(require("node:fs").readFileSync(process.argv[1], "utf8"));
		for (const [k, v] of Object.entries(vars)) {
			if (/^[A-Za-z_][A-Za-z0-9_]*$/.test(k) && !(k in process.env)) console.log(`export ${k}=${JSON.stringify(v).replace(/[$`]/g, "\\$&")}`);
		}' "$envfile")"
}

# AUTH_SECRET is made once per clone and kept in the git-ignored .env (unless the
# environment gives one).
ensure_secret() {
	local envfile="$ROOT/.env"
	if [ -n "${AUTH_SECRET:-}" ]; then export AUTH_SECRET; return 0; fi
	if [ ! -f "$envfile" ] || ! grep -q '^AUTH_SECRET=' "$envfile"; then
		log "generating AUTH_SECRET into .env"
		echo "AUTH_SECRET=$(node -e "console.log(require('crypto').randomBytes(32).toString('base64url'))")" >>"$envfile"
		chmod 600 "$envfile"
	fi
	AUTH_SECRET=$(grep '^AUTH_SECRET=' "$envfile" | tail -n1 | cut -d= -f2-)
	export AUTH_SECRET
}

# claim_checkout NAME: one `npm start` (or test run, or benchmark) per checkout at a time.
# Holds an flock on .data/NAME.lock for as long as this script runs (the kernel releases it
# when the script ends, however it ends). Returns 1 when another run holds it.
claim_checkout() {
	exec {CLAIM_FD}>"$DATA/$1.lock"
	flock -n "$CLAIM_FD" && CLAIMED=$1
}

# build_app DIR: the production build into DIR (adapter-node's out). Builds share
# .svelte-kit/output, so they take turns; a running server's own folder is never touched.
build_app() {
	(cd "$ROOT" && BUILD_DIR="$1" flock "$DATA/build.lock" npx vite build --logLevel warn)
}

# PostgreSQL refuses to run as root. When we are root, run its tools as the postgres
# system user, keeping the capability to read folders that are not world-traversable.
as_pg() {
	if [ "$(id -u)" -eq 0 ]; then
		setpriv --reuid=postgres --regid=postgres --init-groups \
			--inh-caps=+dac_read_search --ambient-caps=+dac_read_search "$@"
	else
		"$@"
	fi
}

# start_postgres NAME PORT: a cluster in .data/NAME listening on 127.0.0.1:PORT.
start_postgres() {
	local name=$1 port=$2
	PGDATA_DIR="$DATA/$name"
	local sock="$DATA/sock-$name"
	# Unix socket paths are limited to 107 bytes; fall back to /tmp for deep clones.
	if [ ${#sock} -gt 80 ]; then sock="/tmp/junctionary-sock-$port"; fi
	mkdir -p "$PGDATA_DIR" "$sock"
	if [ "$(id -u)" -eq 0 ]; then chown postgres:postgres "$PGDATA_DIR" "$sock"; chmod 700 "$PGDATA_DIR"; fi
	if [ ! -s "$PGDATA_DIR/PG_VERSION" ]; then
		log "creating PostgreSQL cluster in ${PGDATA_DIR#$ROOT/}"
		as_pg "$PGBIN/initdb" -D "$PGDATA_DIR" -U junctionary --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
	fi
	if as_pg "$PGBIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
		log "PostgreSQL already running on 127.0.0.1:$port"
		PG_STARTED_HERE=0
	else
		log "starting PostgreSQL on 127.0.0.1:$port"
		touch "$DATA/$name.log"; [ "$(id -u)" -eq 0 ] && chown postgres:postgres "$DATA/$name.log"
		# PostgreSQL may outlive this script: it must not inherit the checkout's claim lock.
		(
			if [ -n "${CLAIM_FD:-}" ]; then eval "exec $CLAIM_FD>&-"; fi
			as_pg "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -l "$DATA/$name.log" -w -t 60 \
				-o "-p $port -k $sock -c listen_addresses=127.0.0.1 -c max_connections=300" start >/dev/null
		)
		PG_STARTED_HERE=1
	fi
	export PG_STARTED_HERE PGDATA_DIR
}

stop_postgres() {
	local dir=$1
	if [ -s "$dir/PG_VERSION" ] && as_pg "$PGBIN/pg_ctl" -D "$dir" status >/dev/null 2>&1; then
		log "stopping PostgreSQL (${dir#$ROOT/})"
		as_pg "$PGBIN/pg_ctl" -D "$dir" -m fast -w stop >/dev/null || true
	fi
}

# ensure_database PORT DBNAME [fresh]: create it (dropping it first when asked).
ensure_database() {
	local port=$1 db=$2 fresh=${3:-}
	local psql=(psql -X -q -h 127.0.0.1 -p "$port" -U junctionary -d postgres -v ON_ERROR_STOP=1)
	if [ "$fresh" = fresh ]; then "${psql[@]}" -c "DROP DATABASE IF EXISTS \"$db\" WITH (FORCE)"; fi
	if ! "${psql[@]}" -tAc "SELECT 1 FROM pg_database WHERE datname='$db'" | grep -q 1; then
		log "creating database $db"
		"${psql[@]}" -c "CREATE DATABASE \"$db\""
	fi
}

migrate() { (cd "$ROOT" && npx tsx scripts/migrate.ts); }

# start_mail_catcher SMTP_PORT HTTP_PORT: the local catcher, in the background.
start_mail_catcher() {
	local smtp=$1 http=$2
	if curl -fsS "http://127.0.0.1:$http/messages" >/dev/null 2>&1; then
		log "mail catcher already running (SMTP 127.0.0.1:$smtp)"
		CATCHER_PID=
		return
	fi
	(
		if [ -n "${CLAIM_FD:-}" ]; then eval "exec $CLAIM_FD>&-"; fi
		cd "$ROOT" && MAIL_SMTP_PORT=$smtp MAIL_HTTP_PORT=$http exec node --import tsx scripts/mail-catcher.ts
	) \
		>"$DATA/mail-catcher-$smtp.log" 2>&1 &
	CATCHER_PID=$!
	local i
	for i in $(seq 1 100); do
		curl -fsS "http://127.0.0.1:$http/messages" >/dev/null 2>&1 && break
		sleep 0.1
	done
	log "mail catcher on SMTP 127.0.0.1:$smtp (messages at http://127.0.0.1:$http)"
}

# stop_process PID: TERM the process and its children, KILL what is left after 10 s.
stop_process() {
	local pid=$1 i
	[ -n "$pid" ] || return 0
	pkill -TERM -P "$pid" 2>/dev/null || true
	kill -TERM "$pid" 2>/dev/null || return 0
	for i in $(seq 1 100); do kill -0 "$pid" 2>/dev/null || return 0; sleep 0.1; done
	pkill -KILL -P "$pid" 2>/dev/null || true
	kill -KILL "$pid" 2>/dev/null || true
	return 0
}

# wait_for_http URL: until the server answers (60 s at most).
wait_for_http() {
	local i
	for i in $(seq 1 600); do
		curl -fsS "$1" >/dev/null 2>&1 && return 0
		sleep 0.1
	done
	echo "gave up waiting for $1" >&2
	return 1
}

# start_stack CLUSTER PGPORT DB PORT SMTP_PORT HTTP_PORT: a fresh database on a project
# cluster, migrated and seeded, the mail catcher, and the environment the app reads.
# Used by npm test and the benchmarks (npm start keeps its database between runs). They
# run the demo: no SMTP_URL, so mail goes to the local catcher on SMTP_PORT.
start_stack() {
	local cluster=$1 pgport=$2 db=$3 port=$4 smtp=$5 http=$6
	ensure_node_modules
	ensure_secret
	start_postgres "$cluster" "$pgport"
	ensure_database "$pgport" "$db" fresh
	export PG_CLUSTER=$cluster PGPORT=$pgport
	export DATABASE_URL="postgres://junctionary@127.0.0.1:$pgport/$db"
	unset SMTP_URL
	export MAIL_SMTP_PORT=$smtp MAIL_HTTP_PORT=$http
	export MAIL_CATCHER_URL="http://127.0.0.1:$http"
	export BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-16M}
	export HOST=127.0.0.1 PORT=$port ORIGIN="http://127.0.0.1:$port" APP_URL="http://127.0.0.1:$port"
	export NODE_ENV=production
	# Keep idle connections open longer than clients do (as behind a proxy), so a client
	# never sends on a connection the server is just closing.
	export KEEP_ALIVE_TIMEOUT=${KEEP_ALIVE_TIMEOUT:-65} HEADERS_TIMEOUT=${HEADERS_TIMEOUT:-66}
	# Every test signs in from 127.0.0.1: lift the per-client sign-in limit (the scale-out
	# test checks it with servers of its own).
	export SIGNIN_PER_CLIENT=${SIGNIN_PER_CLIENT:-1000}
	migrate
	(cd "$ROOT" && npx tsx seed/index.ts)
	start_mail_catcher "$smtp" "$http"
}

# start_app DIR LOGFILE: build into DIR and serve it in the background (SERVER_PID), wait for it.
start_app() {
	build_app "$1" || return 1
	export BUILD_DIR=$1
	(cd "$ROOT" && exec node "$1") >"$2" 2>&1 &
	SERVER_PID=$!
	wait_for_http "$APP_URL/api/v1/health" || { tail -30 "$2"; return 1; }
}

# stop_stack: what start_stack and start_app started (called from a trap).
stop_stack() {
	trap - INT TERM EXIT
	stop_process "${SERVER_PID:-}"
	stop_process "${CATCHER_PID:-}"
	[ "${PG_STARTED_HERE:-0}" = 1 ] && stop_postgres "$PGDATA_DIR"
	return 0
}
