// PostgreSQL stopped and started 20 times under traffic from browsers (session cookies) and
// scripts (Bearer tokens), reading and writing: every other time an orderly shutdown, else an
// immediate one (connections cut, no checkpoint; the start replays the log, as after a crash). An outage must never pass for "who are
// you?" (401), "not allowed" (403) or a bug (500): every answer is a success or a 503 with
// the one plain message. The app recovers by itself each time, every write it acknowledged
// is in the database afterwards, and its model cache still hears changes.
import { execFileSync } from 'node:child_process';
import { inArray } from 'drizzle-orm';
import { afterAll, expect, test } from 'vitest';
import { DATABASE_UNAVAILABLE } from '$lib/server/api';
import { db } from '$lib/server/db';
import { projects } from '$lib/server/db/schema';
import { APP_URL, cookieFor, tokenFor, unique } from '../integration/helpers';
import { createParts, deleteParts } from '../integration/rank-fixtures';

const cluster = process.env.PG_CLUSTER;
const port = process.env.PGPORT;
const OUTAGES = 20;
// Short outages, long enough for the app to notice (the stop itself takes a moment too).
const DOWN_MS = 300;

function pg(action: 'start' | 'stop' | 'crash') {
	execFileSync('bash', ['scripts/pg.sh', action, cluster!, port!], { stdio: 'pipe' });
}

afterAll(() => {
	if (cluster) pg('start');
});

const range = (xs: number[]) => `${Math.min(...xs)}–${Math.max(...xs)} ms (median ${[...xs].sort((a, b) => a - b)[xs.length >> 1]})`;

type Seen = { caller: string; status: number; text: string };

test.runIf(cluster && port)(`${OUTAGES} outages under traffic: only successes and plain 503s, nothing acknowledged lost`, async () => {
	const token = await tokenFor('designer');
	const cookie = await cookieFor('designer');
	const seen: Seen[] = [];
	const failures: string[] = [];
	const acknowledged: number[] = [];
	const tag = unique('outage');
	let running = true;

	const bearer = { authorization: `Bearer ${token}` };
	const callers: Record<string, () => Promise<Response>> = {
		'token read': () => fetch(`${APP_URL}/api/v1/junctions?limit=5`, { headers: bearer }),
		'token rank': () =>
			fetch(`${APP_URL}/api/v1/rank`, { method: 'POST', headers: { ...bearer, 'content-type': 'application/json' }, body: JSON.stringify({ biasV: -5, temperatureC: 25, limit: 5 }) }),
		'token write': () =>
			fetch(`${APP_URL}/api/v1/projects`, {
				method: 'POST',
				headers: { ...bearer, 'content-type': 'application/json' },
				body: JSON.stringify({ name: `${tag} ${seen.length}`, requirement: { biasV: -1, temperatureC: 25 } })
			}),
		'cookie page': () => fetch(`${APP_URL}/catalogue`, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' }),
		'cookie api': () => fetch(`${APP_URL}/api/v1/projects`, { headers: { cookie } })
	};

	async function loop(caller: string, call: () => Promise<Response>) {
		while (running) {
			try {
				const res = await call();
				const text = await res.text();
				seen.push({ caller, status: res.status, text });
				if (caller === 'token write' && res.status === 201) acknowledged.push(JSON.parse(text).id);
			} catch (e) {
				failures.push(`${caller}: ${(e as Error).message}`);
				await new Promise((r) => setTimeout(r, 50));
			}
		}
	}
	const loops = Object.entries(callers).flatMap(([caller, call]) => [loop(caller, call), loop(caller, call)]);

	const recoveryMs: number[] = [];
	/** From the start to the first write acknowledged after it. */
	const writtenMs: number[] = [];
	const stopMs: number[] = [];
	const startMs: number[] = [];
	const timed = (into: number[], action: 'start' | 'stop' | 'crash') => {
		const t = Date.now();
		pg(action);
		into.push(Date.now() - t);
	};
	try {
		for (let i = 0; i < OUTAGES; i++) {
			timed(stopMs, i % 2 === 0 ? 'stop' : 'crash');
			await new Promise((r) => setTimeout(r, DOWN_MS));
			// The health check needs no database: it answers all through the outage.
			expect((await fetch(`${APP_URL}/api/v1/health`)).status).toBe(200);
			timed(startMs, 'start');
			// Back by itself (no restart of the app): poll an identified read quickly.
			const startedAt = Date.now();
			let status = 0;
			while (status !== 200 && Date.now() - startedAt < 30_000) {
				status = (await fetch(`${APP_URL}/api/v1/junctions?limit=1`, { headers: bearer })).status;
				if (status !== 200) await new Promise((r) => setTimeout(r, 25));
			}
			expect(status, `not recovered after outage ${i + 1}`).toBe(200);
			recoveryMs.push(Date.now() - startedAt);
			// A write acknowledged before the next outage (every other one a crash), so each
			// outage has acknowledged writes behind it that must survive it.
			const ackedBefore = acknowledged.length;
			while (acknowledged.length === ackedBefore && Date.now() - startedAt < 30_000) await new Promise((r) => setTimeout(r, 10));
			expect(acknowledged.length, `no write acknowledged after outage ${i + 1}`).toBeGreaterThan(ackedBefore);
			writtenMs.push(Date.now() - startedAt);
		}
		// A moment of traffic after the last outage.
		await new Promise((r) => setTimeout(r, 500));
	} finally {
		running = false;
		await Promise.all(loops);
	}

	const unexpected = seen.filter((s) => ![200, 201, 503].includes(s.status));
	expect(unexpected.map((s) => `${s.caller} ${s.status} ${s.text.slice(0, 160)}`)).toEqual([]);
	expect(failures).toEqual([]);
	const outages = seen.filter((s) => s.status === 503);
	// The traffic really met the outages, on every kind of caller.
	expect(new Set(outages.map((s) => s.caller))).toEqual(new Set(Object.keys(callers)));
	for (const s of outages) {
		if (s.caller === 'cookie page') expect(s.text, s.caller).toContain(DATABASE_UNAVAILABLE);
		else expect(JSON.parse(s.text), s.caller).toEqual({ error: { code: 'unavailable', message: DATABASE_UNAVAILABLE } });
	}

	expect(acknowledged.length).toBeGreaterThanOrEqual(OUTAGES);
	const stored = await db.select({ id: projects.id }).from(projects).where(inArray(projects.id, acknowledged));
	expect(stored.length).toBe(acknowledged.length);

	// The model cache still hears LISTEN/NOTIFY after all that.
	const partNumber = unique('after-outages');
	const [id] = await createParts([{ partNumber, samples: [{ IS: 1e-15, N: 1, TNOM: 27 }] }]);
	let heard = false;
	for (let i = 0; i < 100 && !heard; i++) {
		const r = await fetch(`${APP_URL}/api/v1/rank`, {
			method: 'POST',
			headers: { ...bearer, 'content-type': 'application/json' },
			body: JSON.stringify({ biasV: -5, temperatureC: 25, q: partNumber })
		});
		heard = ((await r.json()).items ?? []).length === 1;
		if (!heard) await new Promise((r) => setTimeout(r, 100));
	}
	await deleteParts([id]);
	expect(heard).toBe(true);
	console.log(
		`${OUTAGES} outages: ${seen.length} answers (${outages.length} × 503), ${acknowledged.length} acknowledged writes kept; ` +
			`stopping took ${range(stopMs)}, starting ${range(startMs)}, the app answered again ${range(recoveryMs)} and acknowledged a write ${range(writtenMs)} after the start`
	);
});
