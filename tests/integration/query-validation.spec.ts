// Query strings and form fields are read by zod schemas: a value outside the list is a 400 that
// names the parameter, on the API and on pages alike, and nothing is written.
import { beforeAll, describe, expect, test } from 'vitest';
import { api, browse, unique } from './helpers';

let projectId: number;

beforeAll(async () => {
	const r = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Query check'), requirement: { biasV: -5, temperatureC: 25 } } });
	expect(r.status).toBe(201);
	projectId = r.body.id;
});

describe('query parameters', () => {
	test('POST /api/v1/fit?material=… outside the list is a 400 naming material', async () => {
		const csv = 'V,I\n0.3,1e-9\n0.4,5e-8\n0.5,2e-6\n0.6,1e-4\n0.7,3e-3\n';
		const r = await api('POST', '/api/v1/fit?material=unobtainium', { as: 'designer', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(r.status).toBe(400);
		expect(r.body.error.issues[0].path).toBe('material');
		expect(r.body.error.message).toMatch(/material is one of silicon/);
		const ok = await api('POST', '/api/v1/fit?material=germanium', { as: 'designer', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(ok.status).toBe(200);
	});

	test('a project library with ?sample=best is a 400 naming sample', async () => {
		const r = await api('GET', `/projects/${projectId}/export/spice?sample=best`, { as: 'designer' });
		expect(r.status).toBe(400);
		expect(r.body.error.issues[0].path).toBe('sample');
		expect(r.body.error.message).toMatch(/typical or worst/);
	});

	test('comparing more than four parts is refused on the page', async () => {
		const r = await browse('/rank/compare?ids=1,2,3,4,5&v=-5&thi=25', { as: 'designer' });
		expect(r.status).toBe(400);
		expect(r.text).toMatch(/Compare at most 4 parts at once/);
	});
});

describe('project forms', () => {
	test('adding with no part number is refused beside the form, and the shortlist stays empty', async () => {
		const r = await browse(`/projects/${projectId}?/add`, { as: 'designer', form: { partNumber: '   ', note: '' } });
		expect(r.status).toBe(400);
		expect(r.text).toMatch(/Type a part number\./);
		const p = await api('GET', `/api/v1/projects/${projectId}`, { as: 'designer' });
		expect(p.status).toBe(200);
		expect(p.body.entries).toEqual([]);
	});

	test('removing a part named by something that is not an id is refused', async () => {
		const r = await browse(`/projects/${projectId}?/remove`, { as: 'designer', form: { partId: 'x' } });
		expect(r.status).toBe(400);
		expect(r.text).toMatch(/No part named\./);
	});
});
