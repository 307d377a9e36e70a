// Live updates over server-sent events against the running app: a run stored by a
// librarian and a lead's decision each reach an open stream (waited for, not timed: speed is
// the benchmarks' business), read by a
// plain event-stream parser (the WHATWG HTML "server-sent events" format); anonymous
// callers are refused; a stream that goes away leaves no listener behind.
import { afterAll, describe, expect, test } from 'vitest';
import postgres from 'postgres';
import { ModelCache } from '$lib/server/model-cache';
import { LiveEvents } from '$lib/server/live-events';
import { api, APP_URL, cookieFor, tokenFor, unique } from './helpers';
import { forwardCsv } from './catalogue-fixtures';
import { makePart } from './projects-fixtures';

type Received = { event: string; data: unknown; at: number };

/** Opens the stream and collects its events as they arrive. */
async function openStream(headers: Record<string, string>) {
	const abort = new AbortController();
	const res = await fetch(`${APP_URL}/api/v1/events`, { headers: { accept: 'text/event-stream', ...headers }, signal: abort.signal });
	const events: Received[] = [];
	const comments: string[] = [];
	const waiting = new Set<() => void>();
	if (res.ok && res.body) {
		void (async () => {
			const decoder = new TextDecoder();
			let buffer = '';
			try {
				for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
					buffer += decoder.decode(chunk, { stream: true });
					let end: number;
					while ((end = buffer.indexOf('\n\n')) >= 0) {
						const block = buffer.slice(0, end);
						buffer = buffer.slice(end + 2);
						let event = 'message';
						const data: string[] = [];
						for (const line of block.split('\n')) {
							if (line.startsWith(':')) comments.push(line.slice(1).trim());
							else if (line.startsWith('event:')) event = line.slice(6).trim();
							else if (line.startsWith('data:')) data.push(line.slice(5).trim());
						}
						if (data.length) events.push({ event, data: JSON.parse(data.join('\n')), at: Date.now() });
						for (const w of [...waiting]) w();
					}
				}
			} catch {
				// Aborted by the test.
			}
		})();
	}
	/** The first event (from `since` on) that matches, or a rejection after `ms`. */
	function next(match: (e: Received) => boolean, since: number, ms = 5000): Promise<Received> {
		return new Promise((resolve, reject) => {
			const check = () => {
				const hit = events.find((e) => e.at >= since && match(e));
				if (!hit) return;
				waiting.delete(check);
				clearTimeout(timer);
				resolve(hit);
			};
			const timer = setTimeout(() => {
				waiting.delete(check);
				reject(new Error(`no matching event within ${ms} ms; got ${JSON.stringify(events)}`));
			}, ms);
			waiting.add(check);
			check();
		});
	}
	/** Resolves once the stream's opening comment arrived (the server has registered it). */
	async function connected() {
		for (let i = 0; i < 100 && !comments.includes('connected'); i++) await new Promise((r) => setTimeout(r, 20));
		expect(comments).toContain('connected');
	}
	return { res, events, next, connected, close: () => abort.abort() };
}

const REQUIREMENT = { biasV: -5, temperatureRangeC: [0, 85], leakageTargetA: 1e-9, clampCurrentA: 1e-3, maxForwardDropV: 0.8 };

describe('live updates', () => {
	test('anonymous callers are refused with 401', async () => {
		const r = await fetch(`${APP_URL}/api/v1/events`, { headers: { accept: 'text/event-stream' } });
		expect(r.status).toBe(401);
		expect(r.headers.get('content-type')).toMatch(/application\/json/);
	});

	test('a run stored by a librarian reaches a stream opened with an API token', async () => {
		const stream = await openStream({ authorization: `Bearer ${await tokenFor('designer')}` });
		try {
			expect(stream.res.status).toBe(200);
			expect(stream.res.headers.get('content-type')).toMatch(/^text\/event-stream/);
			await stream.connected();
			const part = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: unique('LV').toUpperCase(), maker: 'Tessaly Devices', kind: 'diode', ratings: { reverseV: 30 } } });
			expect(part.status).toBe(201);
			const since = Date.now();
			const run = await api('POST', `/api/v1/junctions/${part.body.id}/runs?sample=U1&temperatureC=25`, {
				as: 'librarian',
				body: forwardCsv({ IS: 1e-14, N: 1.05 }),
				headers: { 'content-type': 'text/csv' }
			});
			expect(run.status, JSON.stringify(run.body)).toBe(201);
			await stream.next((e) => e.event === 'models' && ((e.data as { partIds: number[] | null }).partIds ?? [part.body.id]).includes(part.body.id), since);
		} finally {
			stream.close();
		}
	});

	test("a lead's decision reaches a stream opened with a session cookie", async () => {
		const stream = await openStream({ cookie: await cookieFor('designer') });
		try {
			expect(stream.res.status).toBe(200);
			await stream.connected();
			const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Live front end'), requirement: REQUIREMENT } });
			expect(created.status).toBe(201);
			const id = created.body.id as number;
			const part = await makePart();
			expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: part.id } })).status).toBe(201);
			expect((await api('POST', `/api/v1/projects/${id}/review`, { as: 'designer', json: { action: 'submit', comment: 'One candidate.' } })).status).toBe(200);
			const since = Date.now();
			const decided = await api('POST', `/api/v1/projects/${id}/review`, { as: 'lead', json: { action: 'request-changes', comment: 'Add a second source.' } });
			expect(decided.status, JSON.stringify(decided.body)).toBe(200);
			const seen = await stream.next((e) => e.event === 'project' && (e.data as { projectId: number }).projectId === id, since);
			expect(seen.data).toEqual({ projectId: id });
		} finally {
			stream.close();
		}
	});

	describe('clean-up', () => {
		const client = postgres(process.env.DATABASE_URL!, { max: 2, onnotice: () => {} });
		const cache = new ModelCache(client, { rebuildDelayMs: 5, hearingCheckMs: 0 });
		afterAll(async () => {
			await cache.close();
			await client.end();
		});

		test('a stream whose reader goes away leaves no listener on the cache', async () => {
			await cache.ready();
			const hub = new LiveEvents(cache, { coalesceMs: 20 });
			expect(cache.listenerCount).toBe(0);
			const readers = [hub.open().getReader(), hub.open().getReader()];
			expect(hub.size).toBe(2);
			expect(cache.listenerCount).toBe(2);
			// A model change announced by another writer arrives on both.
			const part = await makePart();
			const decoder = new TextDecoder();
			for (const reader of readers) {
				let text = '';
				while (!text.includes('event: models')) text += decoder.decode((await reader.read()).value);
				expect(text).toMatch(new RegExp(`data: \\{"partIds":\\[[0-9,]*\\b${part.id}\\b`));
			}
			await readers[0].cancel();
			expect(hub.size).toBe(1);
			expect(cache.listenerCount).toBe(2);
			await readers[1].cancel();
			expect(hub.size).toBe(0);
			expect(cache.listenerCount).toBe(0);
		});
	});
});
