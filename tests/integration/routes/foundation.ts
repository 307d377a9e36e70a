import type { RouteCase } from './types';

// Who may reach each foundation route and form action ('any-role' = anyone holding a role).
export const foundationRoutes: RouteCase[] = [
	{ route: '/', method: 'GET', path: '/', allow: 'signed-in', kind: 'page' },
	{ route: '/admin', method: 'GET', path: '/admin', allow: ['admin'], kind: 'page' },
	{ route: '/admin', method: 'POST', path: '/admin?/invite', allow: ['admin'], kind: 'action', form: { email: '', name: '' } },
	{ route: '/admin', method: 'POST', path: '/admin?/role', allow: ['admin'], kind: 'action', form: { userId: '', role: 'lead', grant: '1' } },
	{ route: '/admin', method: 'POST', path: '/admin?/deactivate', allow: ['admin'], kind: 'action', form: { userId: '' } },
	{ route: '/admin', method: 'POST', path: '/admin?/reactivate', allow: ['admin'], kind: 'action', form: { userId: '' } },
	{ route: '/admin/audit', method: 'GET', path: '/admin/audit', allow: ['admin'], kind: 'page' },
	{ route: '/account/tokens', method: 'GET', path: '/account/tokens', allow: 'any-role', kind: 'page' },
	{ route: '/account/tokens', method: 'POST', path: '/account/tokens?/create', allow: 'any-role', kind: 'action', form: { name: '' } },
	{ route: '/account/tokens', method: 'POST', path: '/account/tokens?/revoke', allow: 'any-role', kind: 'action', form: { id: '999999' } }
];

// Routes that are open to everyone or are not guarded pages in their own right.
export const publicRoutes = ['/signin', '/signin/check-mail', '/signout', '/auth', '/dev/mailbox', '/api/v1/health'];
