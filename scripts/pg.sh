#!/usr/bin/env bash
# scripts/pg.sh start|stop|crash NAME PORT — start or stop one of the project's clusters
# (the fault tests stop and restart the test cluster under a running app). crash stops it
# as a power cut would: no shutdown checkpoint, connections cut; the next start recovers.
source "$(dirname "$0")/lib.sh"
case "${1:-}" in
	start) start_postgres "$2" "$3" ;;
	stop) stop_postgres "$DATA/$2" ;;
	crash) as_pg "$PGBIN/pg_ctl" -D "$DATA/$2" -m immediate -w stop >/dev/null ;;
	*) echo "usage: scripts/pg.sh start|stop|crash NAME PORT" >&2; exit 2 ;;
esac
