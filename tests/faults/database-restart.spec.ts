// PostgreSQL stopped under the running app: it must say so plainly (503), keep answering the
// health check, recover by itself once the database is back, and lose nothing it acknowledged.
import { execFileSync } from 'node:child_process';
import { eq } from 'drizzle-orm';
import { afterAll, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { apiTokens } from '$lib/server/db/schema';
import { APP_URL, browse, cookieFor, personFor, tokenFor } from '../integration/helpers';

const cluster = process.env.PG_CLUSTER;
const port = process.env.PGPORT;

function pg(action: 'start' | 'stop') {
	execFileSync('bash', ['scripts/pg.sh', action, cluster!, port!], { stdio: 'pipe' });
}

afterAll(() => {
	if (cluster) pg('start');
});

test.runIf(cluster && port)('503 while PostgreSQL is down, recovery after, acknowledged writes kept', async () => {
	const token = await tokenFor('designer');
	const cookie = await cookieFor('designer');
	const designer = await personFor('designer');

	// Acknowledged writes: tokens created through the app's own form.
	for (let i = 0; i < 5; i++) {
		const r = await browse('/account/tokens?/create', { as: 'designer', form: { name: `fault ${i}` } });
		expect(r.status).toBe(200);
	}
	const before = (await db.select().from(apiTokens).where(eq(apiTokens.userId, designer.id))).length;

	pg('stop');
	try {
		const api = await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } });
		expect(api.status).toBe(503);
		const body = await api.json();
		expect(body.error.code).toBe('unavailable');
		expect(body.error.message).toMatch(/database is unavailable/i);

		const page = await fetch(`${APP_URL}/`, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' });
		expect(page.status).toBe(503);
		expect(await page.text()).toMatch(/unavailable/i);

		const health = await fetch(`${APP_URL}/api/v1/health`);
		expect(health.status).toBe(200);
	} finally {
		pg('start');
	}

	// Recovery by itself: no restart of the app.
	let status = 0;
	for (let i = 0; i < 100 && status !== 200; i++) {
		status = (await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } })).status;
		if (status !== 200) await new Promise((r) => setTimeout(r, 300));
	}
	expect(status).toBe(200);
	const after = (await db.select().from(apiTokens).where(eq(apiTokens.userId, designer.id))).length;
	expect(after).toBe(before);
});
