import type { RouteCase } from './types';

// Who may reach each foundation route. 'anyone' = every signed-in person with a role.
export const foundationRoutes: RouteCase[] = [
	{ route: '/', method: 'GET', path: '/', allow: 'signed-in', kind: 'page' },
	{ route: '/admin', method: 'GET', path: '/admin', allow: ['admin'], kind: 'page' },
	{ route: '/account/tokens', method: 'GET', path: '/account/tokens', allow: 'any-role', kind: 'page' }
];

// Routes that are open to everyone or are not guarded pages in their own right.
export const publicRoutes = ['/signin', '/signin/check-mail', '/signout', '/auth', '/dev/mailbox', '/api/v1/health'];
