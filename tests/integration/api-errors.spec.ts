// Every /api/ answer is JSON in the error shape { error: { code, message } }, including the
// ones no route writes: a path nothing serves, a method a route does not take.
import { describe, expect, test } from 'vitest';
import { api, type Caller } from './helpers';

const cases: [string, string, Caller, number, string][] = [
	['GET', '/api/v1/nothing-here', 'designer', 404, 'not_found'],
	['POST', '/api/v1/junctions/1/runs/1/erase', 'librarian', 404, 'not_found'],
	['GET', '/api/v1/junctions/not-a-number', 'designer', 404, 'not_found'],
	['GET', '/api/v2/junctions', 'designer', 404, 'not_found'],
	['GET', '/api/', 'designer', 404, 'not_found'],
	['DELETE', '/api/v1/health', 'anonymous', 405, 'method_not_allowed'],
	['PUT', '/api/v1/rank', 'designer', 405, 'method_not_allowed'],
	['DELETE', '/api/v1/junctions/1', 'librarian', 405, 'method_not_allowed'],
	['GET', '/api/v1/junctions/1/runs/1/withdraw', 'librarian', 405, 'method_not_allowed'],
	['OPTIONS', '/api/v1/projects', 'designer', 405, 'method_not_allowed'],
	// Anonymous callers hear that they must sign in before anything else, also in JSON.
	['GET', '/api/v1/nothing-here', 'anonymous', 401, 'unauthenticated']
];

describe('API errors are JSON', () => {
	for (const [method, path, as, status, code] of cases) {
		test(`${method} ${path} as ${as} → ${status} ${code}`, async () => {
			const r = await api(method, path, { as });
			expect(r.status).toBe(status);
			expect(r.headers.get('content-type')).toMatch(/^application\/json/);
			expect(r.body.error.code).toBe(code);
			expect(r.body.error.message).toBeTypeOf('string');
			expect(r.body.error.message.length).toBeGreaterThan(10);
		});
	}

	test('a 405 keeps the Allow header and names the methods the path takes', async () => {
		const r = await api('PUT', '/api/v1/junctions/1', { as: 'librarian' });
		expect(r.headers.get('allow')).toMatch(/GET/);
		expect(r.headers.get('allow')).toMatch(/PATCH/);
		expect(r.body.error.message).toMatch(/PATCH/);
	});

	test('errors the routes write themselves pass through unchanged', async () => {
		const r = await api('GET', '/api/v1/junctions/999999999', { as: 'designer' });
		expect(r.status).toBe(404);
		expect(r.body.error.message).toBe('No part 999999999 in the catalogue.');
	});

	test('pages outside /api keep their HTML error page', async () => {
		const res = await fetch(`${process.env.APP_URL}/no-such-page`, { headers: { accept: 'text/html' }, redirect: 'manual' });
		expect(res.headers.get('content-type') ?? '').not.toMatch(/json/);
	});
});
