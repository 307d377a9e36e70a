// Two app servers against one PostgreSQL, as a team runs them behind one proxy: each keeps
// its own model cache (refreshed by LISTEN/NOTIFY), runs its own outbox worker and counts
// sign-in requests in the shared database. The proxy is played by the X-Forwarded-For
// header (adapter-node's ADDRESS_HEADER / XFF_DEPTH, as a deployment behind one sets them).
import { randomInt } from 'node:crypto';
import { inArray } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { mailOutbox } from '$lib/server/db/schema';
import { enqueueMail } from '$lib/server/mail';
import { mailbox, tokenFor, unique } from './helpers';
import { forwardCsv } from './catalogue-fixtures';
import { portFrom, startServer, type RunningServer } from './servers';

const SIGN_IN_LIMIT = 4;
let a: RunningServer;
let b: RunningServer;

beforeAll(async () => {
	const env = {
		SMTP_URL: `smtp://127.0.0.1:${process.env.MAIL_SMTP_PORT}`,
		ADDRESS_HEADER: 'x-forwarded-for',
		XFF_DEPTH: '1',
		SIGNIN_PER_CLIENT: String(SIGN_IN_LIMIT),
		OUTBOX_EVERY_MS: '300'
	};
	[a, b] = await Promise.all([startServer(await portFrom('TEST_PORT_B'), env), startServer(await portFrom('TEST_PORT_C'), env)]);
});

afterAll(async () => {
	await Promise.all([a?.stop(), b?.stop()]);
});

/** An API call as the librarian (who may store runs and rank) through one of the servers. */
async function call(server: RunningServer, method: string, path: string, body?: BodyInit, headers: Record<string, string> = {}) {
	const res = await fetch(server.url + path, {
		method,
		headers: { authorization: `Bearer ${await tokenFor('librarian')}`, 'x-forwarded-for': '203.0.113.7', ...headers },
		body
	});
	return { status: res.status, body: await res.json() };
}

async function worstLeakage(server: RunningServer, partNumber: string): Promise<number | null> {
	const r = await call(server, 'POST', '/api/v1/rank', JSON.stringify({ biasV: -5, temperatureC: 25, q: partNumber }), { 'content-type': 'application/json' });
	const item = r.body.items?.find((i: { partNumber: string }) => i.partNumber === partNumber);
	return item ? item.leakageA.worst : null;
}

describe('two servers, one database', () => {
	test('a run stored through server A changes server B’s ranking within 1 s', async () => {
		const created = await call(a, 'POST', '/api/v1/junctions', JSON.stringify({ partNumber: unique('SO'), maker: 'Test Fab', kind: 'diode' }), {
			'content-type': 'application/json'
		});
		expect(created.status).toBe(201);
		const { id, partNumber } = created.body;
		const csv = { 'content-type': 'text/csv' };
		expect((await call(a, 'POST', `/api/v1/junctions/${id}/runs?sample=U1&temperatureC=25`, forwardCsv({ IS: 1e-15 }), csv)).status).toBe(201);
		let before: number | null = null;
		for (let i = 0; i < 100 && before === null; i++) {
			before = await worstLeakage(b, partNumber);
			if (before === null) await new Promise((r) => setTimeout(r, 100));
		}
		expect(before).not.toBeNull();

		// A leakier sample: the worst case over the samples grows about a hundredfold.
		const stored = await call(a, 'POST', `/api/v1/junctions/${id}/runs?sample=U2&temperatureC=25`, forwardCsv({ IS: 1e-13 }), csv);
		expect(stored.status).toBe(201);
		const acknowledged = Date.now();
		let after = before;
		while (after === before && Date.now() - acknowledged < 1000) after = await worstLeakage(b, partNumber);
		const tookMs = Date.now() - acknowledged;
		expect(after, `B still ranked the old model ${tookMs} ms after A stored the run`).not.toBe(before);
		expect(after! / before!).toBeGreaterThan(30);
		expect(tookMs).toBeLessThanOrEqual(1000);
	});

	test('with both outbox workers running, each of 50 notifications is delivered exactly once', async () => {
		const tag = unique('fanout');
		const to = Array.from({ length: 50 }, (_, i) => `${tag}-${i}@demo.test`);
		await db.transaction(async (tx) => {
			for (const address of to) await enqueueMail(tx, { to: address, subject: `Notification ${tag}`, text: `for ${address}\n`, html: `<p>for ${address}</p>` });
		});
		let pending = to.length;
		for (let i = 0; i < 150 && pending > 0; i++) {
			await new Promise((r) => setTimeout(r, 200));
			const rows = await db.select({ sentAt: mailOutbox.sentAt }).from(mailOutbox).where(inArray(mailOutbox.to, to));
			pending = rows.filter((r) => r.sentAt === null).length;
		}
		expect(pending).toBe(0);
		// Counted where the mail arrives, after a pause in which a duplicate would have come.
		await new Promise((r) => setTimeout(r, 1000));
		const caught = (await mailbox.list()).filter((m) => m.subject === `Notification ${tag}`);
		const perAddress = new Map<string, number>();
		for (const m of caught) for (const r of m.to) perAddress.set(r, (perAddress.get(r) ?? 0) + 1);
		expect(caught).toHaveLength(50);
		expect(to.every((address) => perAddress.get(address) === 1)).toBe(true);
		const attempts = await db.select({ attempts: mailOutbox.attempts }).from(mailOutbox).where(inArray(mailOutbox.to, to));
		expect(attempts.every((r) => r.attempts === 1)).toBe(true);
	});

	test('the sign-in limit per client holds across both servers', async () => {
		// RFC 5737 documentation addresses: one "client" per run, unknown to anything else.
		const client = `198.51.100.${randomInt(1, 254)}`;
		const ask = (server: RunningServer, from: string) =>
			fetch(`${server.url}/signin`, {
				method: 'POST',
				headers: { origin: server.url, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded', 'x-forwarded-for': from },
				body: new URLSearchParams({ email: `${unique('nobody')}@elsewhere.test` }),
				redirect: 'manual'
			}).then((r) => r.status);
		const statuses = [];
		for (let i = 0; i <= SIGN_IN_LIMIT; i++) statuses.push(await ask(i % 2 === 0 ? a : b, client));
		expect(statuses).toEqual([...Array(SIGN_IN_LIMIT).fill(303), 429]);
		// Still refused on the other server; another client is not held back.
		expect(await ask(b, client)).toBe(429);
		expect(await ask(b, `192.0.2.${randomInt(1, 254)}`)).toBe(303);
	});
});
