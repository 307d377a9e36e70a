import type { RouteCase } from './types';

// Project routes. Ids that do not exist are fine here: the guard runs before the lookup,
// so allowed callers get 404 (or 409), never 401/403.
export const projectRoutes: RouteCase[] = [
	{ route: '/projects', method: 'GET', path: '/projects', allow: 'any-role', kind: 'page' },
	{ route: '/projects/new', method: 'GET', path: '/projects/new', allow: ['designer'], kind: 'page' },
	{ route: '/projects/new', method: 'POST', path: '/projects/new', allow: ['designer'], kind: 'action', form: { name: '' } },
	{ route: '/projects/[id=id]', method: 'GET', path: '/projects/999999', allow: 'any-role', kind: 'page' },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/add', allow: ['designer'], kind: 'action', form: { partNumber: '' } },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/remove', allow: ['designer'], kind: 'action', form: { partId: '' } },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/member', allow: ['designer', 'lead'], kind: 'action', form: { email: '' } },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/removeMember', allow: ['designer', 'lead'], kind: 'action', form: { email: '' } },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/lead', allow: ['designer', 'lead'], kind: 'action', form: { leadEmail: 'not an address' } },
	{ route: '/projects/[id=id]', method: 'POST', path: '/projects/999999?/review', allow: ['designer', 'lead'], kind: 'action', form: { action: '' } },
	{ route: '/projects/[id=id]/export/spice', method: 'GET', path: '/projects/999999/export/spice', allow: 'any-role', kind: 'page' },
	{ route: '/projects/[id=id]/export/csv', method: 'GET', path: '/projects/999999/export/csv', allow: 'any-role', kind: 'page' },
	{ route: '/projects/[id=id]/export/record', method: 'GET', path: '/projects/999999/export/record', allow: 'any-role', kind: 'page' },
	{ route: '/api/v1/projects', method: 'GET', path: '/api/v1/projects', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/projects', method: 'POST', path: '/api/v1/projects', allow: ['designer'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]', method: 'GET', path: '/api/v1/projects/999999', allow: 'any-role', kind: 'api' },
	{ route: '/api/v1/projects/[id=id]', method: 'PATCH', path: '/api/v1/projects/999999', allow: ['designer', 'lead'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]/members', method: 'POST', path: '/api/v1/projects/999999/members', allow: ['designer', 'lead'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]/members', method: 'DELETE', path: '/api/v1/projects/999999/members', allow: ['designer', 'lead'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]/shortlist', method: 'POST', path: '/api/v1/projects/999999/shortlist', allow: ['designer'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]/shortlist', method: 'DELETE', path: '/api/v1/projects/999999/shortlist', allow: ['designer'], kind: 'api', json: {} },
	{ route: '/api/v1/projects/[id=id]/review', method: 'POST', path: '/api/v1/projects/999999/review', allow: ['designer', 'lead'], kind: 'api', json: {} }
];
