#!/usr/bin/env bash
# scripts/pg.sh start|stop NAME PORT — start or stop one of the project's clusters
# (the fault tests stop and restart the test cluster under a running app).
source "$(dirname "$0")/lib.sh"
case "${1:-}" in
	start) start_postgres "$2" "$3" ;;
	stop) stop_postgres "$DATA/$2" ;;
	*) echo "usage: scripts/pg.sh start|stop NAME PORT" >&2; exit 2 ;;
esac
