// Hostile input: property-based bodies (fast-check) for every JSON API, CSV junk for uploads,
// injection strings in text fields, oversized bodies. Never a 5xx, never a partial write.
import { request as httpRequest } from 'node:http';
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import { beforeAll, describe, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { APP_URL, api, browse, tokenFor, unique } from './helpers';

/** Cases per endpoint: a few dozen here; the benchmark run sets FUZZ_RUNS (scripts/bench.sh). */
const RUNS = Number(process.env.FUZZ_RUNS ?? 40);

const TABLES = ['parts', 'samples', 'runs', 'fits', 'part_models', 'part_capacitance', 'projects', 'shortlist_entries', 'review_events', 'audit_log', 'mail_outbox'];

async function counts(): Promise<Record<string, number>> {
	const row = (await db.execute(sql.raw(`select ${TABLES.map((t) => `(select count(*) from ${t})::int as ${t}`).join(', ')}`)))[0];
	return row as Record<string, number>;
}

const INJECTIONS = [
	"Robert'); DROP TABLE parts;--",
	'" OR 1=1 --',
	'<script>alert(1)</script>',
	'<img src=x onerror=alert(1)>',
	'{{7*7}}',
	'${process.exit()}',
	'\u0000',
	'\u202e',
	'😀'.repeat(50),
	'a'.repeat(5000)
];

// Values that sit near the edges of what a field accepts, and well beyond them.
const nasty = fc.oneof(
	fc.constantFrom(...INJECTIONS, 'NaN', 'Infinity', '-0', '1e309', '10p', '-5 V', '', ' '),
	fc.double(),
	fc.integer(),
	fc.constantFrom(0, -1, 1e-300, 1e300, Number.MAX_SAFE_INTEGER, -273.16, 1e-15),
	fc.boolean(),
	fc.constant(null),
	fc.string(),
	fc.array(fc.double(), { maxLength: 5 }),
	fc.constantFrom('cv', 'iv'),
	fc.array(fc.record({ voltageV: fc.double(), capacitanceF: fc.double() }), { maxLength: 8 }),
	fc.dictionary(fc.string({ maxLength: 5 }), fc.jsonValue({ maxDepth: 2 }), { maxKeys: 3 })
);

/** Objects built from the endpoint's own field names with hostile values, or any JSON at all. */
function bodies(fields: string[]) {
	const shaped = fc.record(Object.fromEntries(fields.map((f) => [f, nasty])), { requiredKeys: [] });
	return fc.oneof(shaped, fc.jsonValue({ maxDepth: 3 }), fc.string().map((s) => ({ __raw: s })));
}

type Target = { method: 'POST' | 'PATCH' | 'DELETE'; label: string; path: () => string; as: 'designer' | 'librarian' | 'lead'; fields: string[] };

let partId = 0;
let projectId = 0;

beforeAll(async () => {
	// Tokens are made (and audited) up front, so row counts around each call see only that call.
	for (const who of ['designer', 'librarian', 'lead'] as const) await tokenFor(who);
	const part = await api('POST', '/api/v1/junctions', {
		as: 'librarian',
		json: { partNumber: unique('FZ').toUpperCase(), maker: 'Fuzzwerk Halbleiter', kind: 'diode', model: { IS: 1e-14, N: 1.3, RS: 2 } }
	});
	expect(part.status).toBe(201);
	partId = part.body.id;
	const project = await api('POST', '/api/v1/projects', {
		as: 'designer',
		json: { name: unique('fuzz project'), requirement: { biasV: -1, temperatureC: 40 } }
	});
	expect(project.status).toBe(201);
	projectId = project.body.id;
});

const targets: Target[] = [
	{ method: 'POST', label: '/api/v1/junctions', path: () => '/api/v1/junctions', as: 'librarian', fields: ['partNumber', 'maker', 'kind', 'package', 'material', 'ratings', 'tags', 'model', 'lifecycle'] },
	{ method: 'PATCH', label: '/api/v1/junctions/{id}', path: () => `/api/v1/junctions/${partId}`, as: 'librarian', fields: ['maker', 'kind', 'package', 'ratings', 'tags', 'model', 'lifecycle', 'notes'] },
	{ method: 'POST', label: '/api/v1/fit', path: () => '/api/v1/fit', as: 'designer', fields: ['temperatureC', 'points'] },
	{ method: 'POST', label: '/api/v1/fit/capacitance', path: () => '/api/v1/fit/capacitance', as: 'designer', fields: ['points', 'temperatureC', 'strayCapacitanceF'] },
	{ method: 'POST', label: '/api/v1/rank', path: () => '/api/v1/rank', as: 'designer', fields: ['biasV', 'temperatureC', 'temperatureRangeC', 'clampCurrentA', 'maxForwardDropV', 'kinds', 'q', 'limit'] },
	{ method: 'POST', label: '/api/v1/predict', path: () => '/api/v1/predict', as: 'designer', fields: ['model', 'temperatureC', 'biasV', 'currentA'] },
	{ method: 'POST', label: '/api/v1/projects', path: () => '/api/v1/projects', as: 'designer', fields: ['name', 'description', 'leadEmail', 'requirement', 'memberEmails'] },
	{ method: 'POST', label: '/api/v1/projects/{id}/shortlist', path: () => `/api/v1/projects/${projectId}/shortlist`, as: 'designer', fields: ['junctionId', 'note'] },
	{ method: 'DELETE', label: '/api/v1/projects/{id}/shortlist', path: () => `/api/v1/projects/${projectId}/shortlist`, as: 'designer', fields: ['junctionId'] },
	{ method: 'POST', label: '/api/v1/projects/{id}/review', path: () => `/api/v1/projects/${projectId}/review`, as: 'lead', fields: ['action', 'comment', 'expectedVersion'] },
	{ method: 'POST', label: '/api/v1/junctions/{id}/runs', path: () => `/api/v1/junctions/${partId}/runs`, as: 'librarian', fields: ['sample', 'temperatureC', 'points'] },
	{
		method: 'POST',
		label: '/api/v1/junctions/{id}/runs (C–V)',
		path: () => `/api/v1/junctions/${partId}/runs`,
		as: 'librarian',
		fields: ['sample', 'temperatureC', 'points', 'measurement', 'frequencyHz', 'testLevelV', 'strayCapacitanceF']
	}
];

describe('property-based bodies', () => {
	for (const t of targets) {
		test(`${t.method} ${t.label}: never a 5xx; a refusal writes nothing`, async () => {
			await fc.assert(
				fc.asyncProperty(bodies(t.fields), async (body) => {
					const before = await counts();
					const raw = body && typeof body === 'object' && '__raw' in body ? String((body as { __raw: string }).__raw) : undefined;
					const r = await api(t.method, t.path(), raw !== undefined ? { as: t.as, body: raw, headers: { 'content-type': 'application/json' } } : { as: t.as, json: body });
					expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBeLessThan(500);
					if (r.status >= 400) {
						expect(r.body?.error?.code, JSON.stringify(r.body)).toBeTypeOf('string');
						expect(r.body.error.message).toBeTypeOf('string');
						expect(await counts()).toEqual(before);
					}
				}),
				{ numRuns: RUNS, seed: Number(process.env.FUZZ_SEED ?? 20261202) }
			);
		});
	}

	test('CSV uploads of arbitrary text: never a 5xx; a refused file writes nothing', async () => {
		const line = fc.oneof(
			fc.string(),
			fc.tuple(fc.double(), fc.double()).map(([v, i]) => `${v},${i}`),
			fc.constantFrom('V,I', 'voltage (V),current (A)', 'V;I', '0,7;1e-3', '\ufeffV,I', 'NaN,NaN', ',,,', 'V (V),C (pF)', 'VR (V);Cp [pF];Freq (kHz)', '-1,2.5', '0;4,1;1000')
		);
		await fc.assert(
			fc.asyncProperty(fc.array(line, { maxLength: 30 }), async (lines) => {
				const before = await counts();
				const r = await api('POST', `/api/v1/junctions/${partId}/runs?sample=fz1&temperatureC=25`, {
					as: 'librarian',
					body: lines.join('\n'),
					headers: { 'content-type': 'text/csv' }
				});
				expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBeLessThan(500);
				if (r.status >= 400) expect(await counts()).toEqual(before);
			}),
			{ numRuns: RUNS, seed: 7 }
		);
	});
});

describe('injection strings are stored as text and shown inert', () => {
	test('a part whose maker and tags carry SQL and HTML comes back verbatim and renders escaped', async () => {
		const maker = INJECTIONS[0] + ' ' + INJECTIONS[3];
		const created = await api('POST', '/api/v1/junctions', {
			as: 'librarian',
			json: { partNumber: unique('INJ').toUpperCase(), maker, kind: 'diode', tags: [INJECTIONS[2]], model: { IS: 1e-14, N: 1.5 } }
		});
		expect(created.status).toBe(201);
		const back = await api('GET', `/api/v1/junctions/${created.body.id}`, { as: 'designer' });
		expect(back.body.maker).toBe(maker);
		expect(back.body.tags).toEqual([INJECTIONS[2]]);
		// The table it would have dropped is still there.
		expect((await counts()).parts).toBeGreaterThan(0);
		const page = await browse(`/parts/${created.body.id}`, { as: 'designer' });
		expect(page.status).toBe(200);
		expect(page.text).not.toContain('<img src=x onerror=alert(1)>');
		expect(page.text).not.toContain('<script>alert(1)</script>');
		expect(page.text).toContain('&lt;img src=x onerror=alert(1)>');
	});

	test('a project named with markup shows it as text', async () => {
		const name = `${INJECTIONS[3]} ${unique('p')}`;
		const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name, requirement: { biasV: -2, temperatureC: 50 } } });
		expect(created.status).toBe(201);
		const page = await browse(`/projects/${created.body.id}`, { as: 'designer' });
		expect(page.status).toBe(200);
		expect(page.text).not.toContain('<img src=x onerror=alert(1)>');
	});
});

describe('oversized bodies', () => {
	test('a JSON body over the limit is refused with 413 and the JSON error shape', async () => {
		const r = await api('POST', '/api/v1/rank', { as: 'designer', body: JSON.stringify({ biasV: -1, temperatureC: 25, q: 'x'.repeat(3 * 1024 * 1024) }), headers: { 'content-type': 'application/json' } });
		expect(r.status).toBe(413);
		expect(r.body.error.code).toBe('too_large');
	});

	test('a sweep file over the limit is refused with 413 and nothing is stored', async () => {
		const before = await counts();
		const big = 'V,I\n' + '0.5,1e-6\n'.repeat(1_900_000);
		const r = await api('POST', `/api/v1/junctions/${partId}/runs?sample=big&temperatureC=25`, { as: 'librarian', body: big, headers: { 'content-type': 'text/csv' } });
		expect(r.status).toBe(413);
		expect(r.body.error.code).toBe('too_large');
		expect(await counts()).toEqual(before);
	});
});

describe('interrupted uploads', () => {
	test('an upload cut off mid-stream writes nothing', async () => {
		const token = await tokenFor('librarian');
		const before = await counts();
		const boundary = 'cut-' + unique();
		const head = `--${boundary}\r\nContent-Disposition: form-data; name="sample"\r\n\r\ncut1\r\n--${boundary}\r\nContent-Disposition: form-data; name="temperatureC"\r\n\r\n25\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.csv"\r\nContent-Type: text/csv\r\n\r\nV,I\n`;
		// A random scale makes the file new to the catalogue on every run (uploads are unique by SHA-256).
		const scale = 1 + Math.random() * 1e-3;
		const rows = Array.from({ length: 2000 }, (_, k) => `${(0.3 + k * 0.0002).toFixed(4)},${(1e-9 * scale * Math.exp(k / 200)).toExponential(6)}\n`).join('');
		const full = Buffer.from(head + rows + `\r\n--${boundary}--\r\n`);
		const url = new URL(`/api/v1/junctions/${partId}/runs`, APP_URL);
		await new Promise<void>((resolve) => {
			const req = httpRequest(url, {
				method: 'POST',
				headers: { authorization: `Bearer ${token}`, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(full.length) }
			});
			req.on('error', () => resolve());
			req.on('response', (res) => {
				res.resume();
				res.on('end', () => resolve());
			});
			// Half the body, then the connection drops.
			req.write(full.subarray(0, Math.floor(full.length / 2)), () => setTimeout(() => req.destroy(), 200));
		});
		// Give the server a moment to notice and roll back whatever it had started.
		await new Promise((r) => setTimeout(r, 500));
		expect(await counts()).toEqual(before);
		// Control: the same body sent whole is a valid upload, so the cut is what stopped it.
		const whole = await fetch(url, {
			method: 'POST',
			headers: { authorization: `Bearer ${token}`, 'content-type': `multipart/form-data; boundary=${boundary}` },
			body: full
		});
		expect(whole.status, await whole.text()).toBe(201);
	});
});
