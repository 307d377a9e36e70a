#!/usr/bin/env bash
# npm run bench / npm run bench:load: a benchmark stack (its own cluster, a fresh database
# seeded with the demo and scaled to BENCH_PARTS parts, the built server), then the
# benchmarks. Ratios go to tests/bench/results.json and tests/bench/REPORT.md.
source "$(dirname "$0")/lib.sh"

what=${1:-all}
if ! claim_checkout bench; then
	echo "Another benchmark is running from this checkout; wait for it to finish." >&2
	exit 1
fi
ensure_debian_packages postgresql curl chromium
trap stop_stack INT TERM EXIT
start_stack pg-bench "${BENCH_PGPORT:-54349}" junctionary_bench "${BENCH_PORT:-3200}" \
	"${BENCH_MAIL_SMTP_PORT:-2545}" "${BENCH_MAIL_HTTP_PORT:-2546}"
(cd "$ROOT" && npx tsx seed/scale.ts "${BENCH_PARTS:-10000}")
# The load test makes hundreds of connections' worth of requests: give the pool room.
export DB_POOL_MAX=${DB_POOL_MAX:-20} OUTBOX_WORKER=0
start_app "$DATA/builds/bench" "$DATA/bench-server.log"
cd "$ROOT"
case "$what" in
	load) npx tsx tests/bench/load.ts ;;
	*)
		npx tsx tests/bench/run.ts
		# Hostile input at benchmark strength: FUZZ_RUNS cases per property (≥ 1,000 in all).
		export FUZZ_RUNS=${FUZZ_RUNS:-100}
		npx vitest run --project integration tests/integration/hostile.spec.ts \
			--reporter=default --reporter=json --outputFile="$DATA/bench-fuzz.json" || true
		npx tsx tests/bench/fuzz-record.ts "$DATA/bench-fuzz.json" "$FUZZ_RUNS"
		;;
esac
