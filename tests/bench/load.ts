/**
 * Load and fault benchmark against the built server and the real PostgreSQL (loopback):
 *  1. 200 connections for LOAD_SECONDS (60) across ranking, catalogue search and part pages,
 *     with 4 more asking the health check meanwhile (load-p50-vs-health-during), then the
 *     same 200 connections on the health check alone (load-p50-vs-health: ratio of p50s);
 *  2. PostgreSQL stopped and restarted during a lighter run while a writer creates projects:
 *     the app must answer 503 while it is down, recover by itself, and keep every write it
 *     acknowledged; outage-recovery-s is the time from PostgreSQL accepting connections
 *     again (pg_ctl start -w has returned) to the writer's first acknowledged write.
 * Run through `npm run bench:load` (or `npm run bench`), which set up the stack first.
 */
import { execFileSync } from 'node:child_process';
import { designerMix, runLoad, type LoadSummary } from './http-load';
import { record } from './results';

const APP_URL = process.env.APP_URL ?? 'http://127.0.0.1:3200';
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 200);
/** Connections that ask the health check beside the mix (a few: they add little load). */
const PROBE_CONNECTIONS = 4;

function describe(s: LoadSummary): string {
	return `${s.requests} requests, ${s.rps.toFixed(0)}/s, p50 ${s.p50Ms} ms, p99 ${s.p99Ms} ms, errors ${s.errors}, timeouts ${s.timeouts}, non-2xx ${s.non2xx} (${JSON.stringify(s.statusCodes)})`;
}

export async function runLoadBenchmarks() {
	const tokens = await import('../../src/lib/server/tokens');
	const people = await import('../../src/lib/server/people');
	const { db } = await import('../../src/lib/server/db');
	const { parts, projects } = await import('../../src/lib/server/db/schema');
	const { inArray } = await import('drizzle-orm');

	const designer = await people.findByEmail('designer@demo.test');
	if (!designer) throw new Error('demo designer missing: run the seed first');
	const { token } = await tokens.create(designer.id, 'load benchmark', null);
	const ids = (await db.select({ id: parts.id }).from(parts).limit(2000)).map((r) => r.id);

	// 1. Sustained load.
	console.log(`load: ${CONNECTIONS} connections for ${SECONDS} s over ${ids.length}+ parts…`);
	// A few more connections ask the health check while the mix runs: its p50 under the same load.
	const healthMix = [{ method: 'GET' as const, path: '/api/v1/health' }];
	const [load, healthDuring] = await Promise.all([
		runLoad({ url: APP_URL, token, mix: designerMix(ids), connections: CONNECTIONS, seconds: SECONDS }),
		runLoad({ url: APP_URL, token, mix: healthMix, connections: PROBE_CONNECTIONS, seconds: SECONDS })
	]);
	console.log('load:', describe(load));
	console.log('health during the load:', describe(healthDuring));
	const failed = load.errors + load.timeouts + load.non2xx;
	record('load-error-rate', failed / Math.max(1, load.requests), 0, `${CONNECTIONS} connections × ${SECONDS} s: ${describe(load)}`);
	// The same connections on the health check alone: what the machine and the HTTP layer give.
	const healthSeconds = Math.min(SECONDS, 15);
	const health = await runLoad({ url: APP_URL, token, mix: healthMix, connections: CONNECTIONS, seconds: healthSeconds });
	record(
		'load-p50-vs-health',
		load.p50Ms / Math.max(health.p50Ms, 0.5),
		3,
		`p50 of the mixed load ${load.p50Ms} ms vs the health check alone ${health.p50Ms} ms, both at ${CONNECTIONS} connections (${SECONDS} s and ${healthSeconds} s; ${load.rps.toFixed(0)} vs ${health.rps.toFixed(0)} req/s; health errors ${health.errors + health.timeouts}, non-2xx ${health.non2xx})`
	);

	// Two readings of "the health check under the same load": alone at the same connections
	// (above), and asked beside the mix while it runs (here); the mix is judged against each.
	record(
		'load-p50-vs-health-during',
		load.p50Ms / Math.max(healthDuring.p50Ms, 0.5),
		3,
		`p50 of the mixed load ${load.p50Ms} ms vs the health check asked on ${PROBE_CONNECTIONS} more connections during it ${healthDuring.p50Ms} ms (p99 ${healthDuring.p99Ms} ms, ${healthDuring.requests} requests, errors ${healthDuring.errors + healthDuring.timeouts}, non-2xx ${healthDuring.non2xx})`
	);

	// 2. Database outage under load, with a writer.
	const cluster = process.env.PG_CLUSTER;
	const port = process.env.PGPORT;
	if (!cluster || !port) {
		console.log('faults: skipped (PG_CLUSTER and PGPORT not set)');
		return;
	}
	const acknowledged: number[] = [];
	/** When each acknowledged write was answered. */
	const acknowledgedAt: number[] = [];
	const statuses: Record<number, number> = {};
	let writing = true;
	const writer = (async () => {
		for (let i = 0; writing; i++) {
			try {
				const res = await fetch(`${APP_URL}/api/v1/projects`, {
					method: 'POST',
					headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
					body: JSON.stringify({ name: `outage writer ${Date.now()}-${i}`, requirement: { biasV: -1, temperatureC: 25 } })
				});
				statuses[res.status] = (statuses[res.status] ?? 0) + 1;
				if (res.status === 201) {
					acknowledged.push((await res.json()).id);
					acknowledgedAt.push(Date.now());
				}
				else await res.arrayBuffer();
			} catch {
				statuses[0] = (statuses[0] ?? 0) + 1;
			}
			await new Promise((r) => setTimeout(r, 20));
		}
	})();
	const background = runLoad({ url: APP_URL, token, mix: designerMix(ids), connections: 20, seconds: 20 });
	await new Promise((r) => setTimeout(r, 5000));
	const pg = (a: string) => execFileSync('bash', ['scripts/pg.sh', a, cluster, port], { stdio: 'pipe' });
	pg('stop');
	const downAt = Date.now();
	await new Promise((r) => setTimeout(r, 5000));
	const duringOutage = await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } });
	pg('start');
	const upAt = Date.now();
	let recoveredMs = -1;
	for (let i = 0; i < 200; i++) {
		const r = await fetch(`${APP_URL}/api/v1/junctions?limit=1`, { headers: { authorization: `Bearer ${token}` } });
		await r.arrayBuffer();
		if (r.status === 200) {
			recoveredMs = Date.now() - downAt;
			break;
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	const outage = await background;
	writing = false;
	await writer;
	const firstWrite = acknowledgedAt.find((t) => t >= upAt);
	// No write at all after the start counts as the longest outage the run could show.
	const writeRecoveryS = firstWrite === undefined ? 999 : (firstWrite - upAt) / 1000;
	const stored = acknowledged.length
		? (await db.select({ id: projects.id }).from(projects).where(inArray(projects.id, acknowledged))).length
		: 0;
	const lost = acknowledged.length - stored;
	const detail = `PostgreSQL down ~5 s under 20 connections: during the outage the API answered ${duringOutage.status}; recovered ${recoveredMs} ms after the stop without a restart; writer statuses ${JSON.stringify(statuses)}; ${acknowledged.length} acknowledged writes, ${stored} found afterwards; load ${describe(outage)}`;
	console.log('faults:', detail);
	record('fault-acknowledged-writes-lost', lost / Math.max(1, acknowledged.length), 0, detail);
	record(
		'outage-recovery-s',
		writeRecoveryS,
		5,
		`from PostgreSQL accepting connections again to the first acknowledged write: ${firstWrite === undefined ? 'none within the run' : `${writeRecoveryS.toFixed(2)} s`} (a read answered 200 ${recoveredMs >= 0 ? `${((recoveredMs - (upAt - downAt)) / 1000).toFixed(2)} s after the start` : 'never'}); the writer posts a project every 20 ms`
	);
}

if (import.meta.url === `file://${process.argv[1]}`) {
	await runLoadBenchmarks();
	const { writeReport } = await import('./results');
	const { client } = await import('../../src/lib/server/db');
	await client.end();
	console.log('\n' + writeReport());
}
