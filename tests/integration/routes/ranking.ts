import type { RouteCase } from './types';

// The ranking screen and its API: every signed-in person with a role ('rank:use').
const op = { biasV: -5, temperatureC: 25 };
export const rankingRoutes: RouteCase[] = [
	{ route: '/rank', method: 'GET', path: '/rank?v=-5&thi=25', allow: 'any-role', kind: 'page' },
	{ route: '/rank', method: 'POST', path: '/rank?/savePreset', allow: 'any-role', kind: 'action', form: { name: '', query: 'v=-5&thi=25' } },
	{ route: '/rank', method: 'POST', path: '/rank?/deletePreset', allow: 'any-role', kind: 'action', form: { id: '999999' } },
	{ route: '/rank/export', method: 'GET', path: '/rank/export?v=-5&thi=25&format=csv', allow: 'any-role', kind: 'page' },
	{ route: '/rank/compare', method: 'GET', path: '/rank/compare?ids=1,2&v=-5&thi=25', allow: 'any-role', kind: 'page' },
	{ route: '/api/v1/rank', method: 'POST', path: '/api/v1/rank', allow: 'any-role', kind: 'api', json: op },
	{ route: '/api/v1/rank/snapshot', method: 'GET', path: '/api/v1/rank/snapshot', allow: 'any-role', kind: 'api' },
	// Live updates for open ranking and project screens (an event stream).
	{ route: '/api/v1/events', method: 'GET', path: '/api/v1/events', allow: 'any-role', kind: 'api' },
	{
		route: '/api/v1/predict',
		method: 'POST',
		path: '/api/v1/predict',
		allow: 'any-role',
		kind: 'api',
		json: { model: { IS: 1e-14, N: 1 }, temperatureC: 25, biasV: [-1] }
	}
];
