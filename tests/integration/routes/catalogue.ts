import type { RouteCase } from './types';

// Part 1 exists in every seeded database (the demo catalogue); run 1 belongs to it.
export const catalogueRoutes: RouteCase[] = [
	{ route: '/catalogue', method: 'GET', path: '/catalogue', allow: 'any-role', kind: 'page' },
	{ route: '/catalogue/export', method: 'GET', path: '/catalogue/export?format=csv', allow: 'any-role', kind: 'page' },
	{ route: '/parts/new', method: 'GET', path: '/parts/new', allow: ['librarian'], kind: 'page' },
	{ route: '/parts/new', method: 'POST', path: '/parts/new', allow: ['librarian'], kind: 'action', form: {} },
	{ route: '/parts/[id=id]', method: 'GET', path: '/parts/1', allow: 'any-role', kind: 'page' },
	{ route: '/parts/[id=id]/edit', method: 'GET', path: '/parts/1/edit', allow: ['librarian'], kind: 'page' },
	{ route: '/parts/[id=id]/edit', method: 'POST', path: '/parts/1/edit?/sample', allow: ['librarian'], kind: 'action', form: { unit: '' } },
	{ route: '/parts/[id=id]/edit', method: 'POST', path: '/parts/1/edit?/save', allow: ['librarian'], kind: 'action', form: { partNumber: '' } },
	{ route: '/parts/[id=id]/edit', method: 'POST', path: '/parts/1/edit?/card', allow: ['librarian'], kind: 'action', form: { card: '' } },
	{ route: '/parts/[id=id]/edit', method: 'POST', path: '/parts/1/edit?/lifecycle', allow: ['librarian'], kind: 'action', form: { lifecycle: 'nonsense' } },
	{ route: '/parts/[id=id]/upload', method: 'GET', path: '/parts/1/upload', allow: ['librarian'], kind: 'page' },
	{ route: '/parts/[id=id]/runs/[runId=id]/file', method: 'GET', path: '/parts/1/runs/1/file', allow: 'any-role', kind: 'page' },
	// The run page and its corrections; the bodies are incomplete, so an allowed caller gets 400 and nothing changes.
	{ route: '/parts/[id=id]/runs/[runId=id]', method: 'GET', path: '/parts/1/runs/1', allow: 'any-role', kind: 'page' },
	{ route: '/parts/[id=id]/runs/[runId=id]', method: 'POST', path: '/parts/1/runs/1?/withdraw', allow: ['librarian'], kind: 'action', form: { reason: '' } },
	{ route: '/parts/[id=id]/runs/[runId=id]', method: 'POST', path: '/parts/1/runs/1?/reinstate', allow: ['librarian'], kind: 'action', form: { reason: '' } },
	{ route: '/parts/[id=id]/runs/[runId=id]', method: 'POST', path: '/parts/1/runs/1?/refit', allow: ['librarian'], kind: 'action', form: { fromV: 'left', toV: '' } },
	{ route: '/parts/[id=id]/runs/[runId=id]', method: 'POST', path: '/parts/1/runs/1?/correct', allow: ['librarian'], kind: 'action', form: { sample: '', temperature: 'warm' } },
	{ route: '/parts/[id=id]/spice', method: 'GET', path: '/parts/1/spice', allow: 'any-role', kind: 'page' },
	{ route: '/api/v1/junctions', method: 'GET', path: '/api/v1/junctions', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/junctions', method: 'POST', path: '/api/v1/junctions', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]', method: 'GET', path: '/api/v1/junctions/1', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/junctions/[id=id]', method: 'PATCH', path: '/api/v1/junctions/1', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]/spice', method: 'GET', path: '/api/v1/junctions/1/spice', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/junctions/[id=id]/runs', method: 'POST', path: '/api/v1/junctions/1/runs', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]/runs/[runId=id]', method: 'GET', path: '/api/v1/junctions/1/runs/1', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/junctions/[id=id]/runs/[runId=id]', method: 'PATCH', path: '/api/v1/junctions/1/runs/1', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]/runs/[runId=id]/withdraw', method: 'POST', path: '/api/v1/junctions/1/runs/1/withdraw', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]/runs/[runId=id]/reinstate', method: 'POST', path: '/api/v1/junctions/1/runs/1/reinstate', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/junctions/[id=id]/runs/[runId=id]/refit', method: 'POST', path: '/api/v1/junctions/1/runs/1/refit', allow: ['librarian'], kind: 'api', json: { excludeV: [1, 0] } },
	// Imports: an empty preview or confirm is refused with 400 and writes nothing.
	{ route: '/parts/import', method: 'GET', path: '/parts/import', allow: ['librarian'], kind: 'page' },
	{ route: '/parts/import', method: 'POST', path: '/parts/import?/preview', allow: ['librarian'], kind: 'action', form: {} },
	{ route: '/parts/import', method: 'POST', path: '/parts/import?/confirm', allow: ['librarian'], kind: 'action', form: { table: '' } },
	{ route: '/parts/import/sweeps', method: 'GET', path: '/parts/import/sweeps', allow: ['librarian'], kind: 'page' },
	{ route: '/api/v1/junctions/import', method: 'POST', path: '/api/v1/junctions/import?dryRun=1', allow: ['librarian'], kind: 'api', json: {} },
	{ route: '/api/v1/fit', method: 'POST', path: '/api/v1/fit', allow: 'any-role', kind: 'api', json: {} },
	{ route: '/api/v1/fit/capacitance', method: 'POST', path: '/api/v1/fit/capacitance', allow: 'any-role', kind: 'api', json: {} }
];
