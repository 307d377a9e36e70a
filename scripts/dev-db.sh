#!/usr/bin/env bash
# scripts/dev-db.sh NAME: a scratch database junctionary_NAME on the development cluster
# (started by npm start), migrated and seeded. Prints the DATABASE_URL to export.
source "$(dirname "$0")/lib.sh"
PGPORT=${PGPORT:-54329}
name=${1:?usage: scripts/dev-db.sh NAME [fresh]}
start_postgres pg "$PGPORT" >/dev/null
ensure_database "$PGPORT" "junctionary_$name" "${2:-}"
export DATABASE_URL="postgres://junctionary@127.0.0.1:$PGPORT/junctionary_$name"
migrate >/dev/null
(cd "$ROOT" && npx tsx seed/index.ts >/dev/null)
echo "$DATABASE_URL"
