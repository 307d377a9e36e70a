// The model snapshot (GET /api/v1/rank/snapshot) ranked as the browser ranks it — decoded,
// built into the engine's CatalogueTable and listed by the shared code — against the
// server's own POST /api/v1/rank, on the demo catalogue and on one grown with the scale
// seed's invented parts: the same numbers (≤ 1e-12 relative) and the same order for every
// basis of ranking. Then the snapshot's caching and its answers of only what changed.
import { get as httpGet, type IncomingHttpHeaders } from 'node:http';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { gaussian, mulberry32 } from '../../src/lib/random';
import { SnapshotCatalogue } from '../../src/lib/rank/snapshot-catalogue';
import { decodeSnapshot } from '../../src/lib/junction/model-snapshot';
import type { RankOperatingPoint } from '../../src/lib/schemas/rank';
import { SCALE_MAKER, scalePart } from '../../seed/scale-parts';
import { api, APP_URL, personFor, tokenFor, unique } from './helpers';
import { createParts, deleteParts, rank, seen } from './rank-fixtures';
import { agreement } from './rank-agreement';

const BASES = ['bound', 'worst', 'typical'] as const;
/** Operating points across the screen's range: reverse and forward, one temperature and ranges, limits and filters. */
const POINTS: RankOperatingPoint[] = [
	{ biasV: -5, temperatureRangeC: [0, 85] },
	{ biasV: -0.5, temperatureC: 25, clampCurrentA: 1e-3 },
	{ biasV: -30, temperatureRangeC: [-40, 125], clampCurrentA: 0.01, maxForwardDropV: 0.9, reverseMarginV: 2 },
	{ biasV: -12, temperatureC: 70, leakageTargetA: 1e-9, includeOverRating: true },
	{ biasV: -3, temperatureRangeC: [25, 100], sourceResistanceOhm: 1e9, allowedErrorV: 1e-3, maxCapacitanceF: 5e-12 },
	{ biasV: 0.3, temperatureC: 40, maxNoiseA_rtHz: 1e-13 },
	{ biasV: -8, temperatureC: 85, kinds: ['diode', 'schottky'], lifecycles: ['in-use'] },
	{ biasV: -2, temperatureC: 50, coverage: 0.99, confidence: 0.95 }
];

async function snapshot(query = '', headers: Record<string, string> = {}) {
	return fetch(`${APP_URL}/api/v1/rank/snapshot${query}`, { headers: { authorization: `Bearer ${await tokenFor('designer')}`, ...headers } });
}

async function browserCatalogue(): Promise<SnapshotCatalogue> {
	const res = await snapshot();
	expect(res.status).toBe(200);
	const catalogue = new SnapshotCatalogue();
	catalogue.applyBytes(await res.arrayBuffer());
	return catalogue;
}

/** Every point on every basis, ranked by the browser's code and by the server, must agree. */
async function expectAgreement(catalogue: SnapshotCatalogue, extra: Partial<RankOperatingPoint> = {}) {
	let compared = 0;
	for (const point of POINTS)
		for (const basis of BASES) {
			const op = { ...point, ...extra, basis } as RankOperatingPoint;
			const server = await rank({ ...op, limit: 1000, withSamples: true });
			const browser = catalogue.rank(op, 1000, 0, true);
			const a = agreement(browser, server);
			expect(a.mismatch, JSON.stringify(op)).toBeNull();
			expect(a.sameOrder, JSON.stringify(op)).toBe(true);
			expect(a.maxRelative, JSON.stringify(op)).toBeLessThanOrEqual(1e-12);
			compared += server.items.length;
		}
	return compared;
}

describe('ranking over the model snapshot', () => {
	test('the demo catalogue: the same numbers and order as the server, every basis', async () => {
		const catalogue = await browserCatalogue();
		const all = await rank({ biasV: -1, temperatureC: 25, includeOverRating: true });
		expect(catalogue.size).toBe(all.evaluated);
		expect(await expectAgreement(catalogue)).toBeGreaterThan(0);
	});

	describe('a catalogue grown with the scale seed', () => {
		const maker = `${SCALE_MAKER} ${unique('s')}`;
		const ids: number[] = [];
		beforeAll(async () => {
			const catalogue = await import('../../src/lib/server/catalogue');
			const librarian = await personFor('librarian');
			const rand = mulberry32(99);
			const normal = gaussian(rand);
			for (let i = 0; i < 240; i++) {
				const created = await catalogue.create({ id: librarian.id }, { ...scalePart(i, rand, normal), maker });
				ids.push(created.id);
			}
			await seen(maker.toLowerCase(), ids.length);
		});
		// Gone from the server's cache before the next tests read the snapshot's version.
		afterAll(async () => {
			await deleteParts(ids);
			await seen(maker.toLowerCase(), 0);
		});

		test('the same numbers and order as the server, every basis, with and without a text filter', async () => {
			const catalogue = await browserCatalogue();
			expect(await expectAgreement(catalogue)).toBeGreaterThan(ids.length);
			await expectAgreement(catalogue, { q: maker.split(' ').at(-1) });
		});
	});
});

describe('the snapshot endpoint', () => {
	test('is versioned and cached: an ETag the browser revalidates, 304 while nothing changed', async () => {
		const res = await snapshot();
		expect(res.headers.get('content-type')).toBe('application/octet-stream');
		expect(res.headers.get('cache-control')).toContain('no-cache');
		const etag = res.headers.get('etag');
		expect(etag).toMatch(/^"[A-Za-z0-9_-]+"$/);
		expect(decodeSnapshot(await res.arrayBuffer()).version).toBe(res.headers.get('x-snapshot-version'));
		const again = await snapshot('', { 'if-none-match': etag! });
		expect(again.status).toBe(304);
		expect(await again.text()).toBe('');
	});

	test('is sent gzipped to a client that takes gzip, the same bytes once inflated, under its own tag', async () => {
		// node:http, which (unlike fetch) hands over the body as sent.
		const raw = (acceptEncoding: string) =>
			tokenFor('designer').then(
				(token) =>
					new Promise<{ headers: IncomingHttpHeaders; body: Buffer }>((resolve, reject) => {
						const req = httpGet(`${APP_URL}/api/v1/rank/snapshot`, { headers: { authorization: `Bearer ${token}`, 'accept-encoding': acceptEncoding } }, (res) => {
							const chunks: Buffer[] = [];
							res.on('data', (c: Buffer) => chunks.push(c));
							res.on('end', () => resolve({ headers: res.headers, body: Buffer.concat(chunks) }));
						});
						req.on('error', reject);
					})
			);
		const plain = await raw('identity');
		const zipped = await raw('gzip, deflate');
		expect(plain.headers['content-encoding']).toBeUndefined();
		expect(zipped.headers['content-encoding']).toBe('gzip');
		expect(zipped.headers.vary).toContain('Accept-Encoding');
		expect(gunzipSync(zipped.body).equals(plain.body)).toBe(true);
		expect(zipped.body.length).toBeLessThan(plain.body.length / 2);
		expect(zipped.headers.etag).not.toBe(plain.headers.etag);
		const again = await snapshot('', { 'accept-encoding': 'gzip', 'if-none-match': zipped.headers.etag! });
		expect(again.status).toBe(304);
	});

	test('answers only what changed: ?since= and ?parts=, and notices a part taken out', async () => {
		const full = await browserCatalogue();
		const before = full.version!;
		const q = unique('snap');
		const [id] = await createParts([{ partNumber: `${q}-1`, samples: [{ IS: 2e-14, N: 1.05, RS: 1 }, { IS: 3e-14, N: 1.05, RS: 1 }] }]);
		await seen(q, 1);
		const since = await snapshot(`?since=${before}`);
		const delta = decodeSnapshot(await since.clone().arrayBuffer());
		expect(delta.partial).toBe(true);
		expect(delta.parts.map((p) => p.id)).toEqual([id]);
		expect(delta.catalogueIds).toContain(id);
		full.applyBytes(await since.arrayBuffer());
		const op: RankOperatingPoint = { biasV: -5, temperatureC: 85, q };
		expect(agreement(full.rank(op), await rank(op)).sameOrder).toBe(true);
		expect(full.rank(op).items.map((i) => i.id)).toEqual([id]);

		const named = decodeSnapshot(await (await snapshot(`?parts=${id},99999999`)).arrayBuffer());
		expect(named.parts.map((p) => p.id)).toEqual([id]);

		await deleteParts([id]);
		await seen(q, 0);
		const gone = await snapshot(`?parts=${id}`);
		full.applyBytes(await gone.arrayBuffer());
		expect(full.rank(op).items).toEqual([]);
		const fresh = await browserCatalogue();
		expect(fresh.size).toBe(full.size);
		expect(fresh.version).toBe(full.version);
	});

	test('an unknown version is answered with everything', async () => {
		const res = await snapshot('?since=no-such-version');
		const s = decodeSnapshot(await res.arrayBuffer());
		expect(s.partial).toBe(false);
		expect(s.parts.length).toBeGreaterThan(0);
	});

	test('a query it cannot read is a 400 naming the parameter', async () => {
		const bad = await api('GET', '/api/v1/rank/snapshot?parts=12,abc', { as: 'designer' });
		expect(bad.status).toBe(400);
		expect(JSON.stringify(bad.body)).toContain('parts');
		const both = await api('GET', '/api/v1/rank/snapshot?parts=1&since=abc', { as: 'designer' });
		expect(both.status).toBe(400);
		expect(JSON.stringify(both.body)).toMatch(/since or parts/);
		const other = await api('GET', '/api/v1/rank/snapshot?everything=1', { as: 'designer' });
		expect(other.status).toBe(400);
	});
});
