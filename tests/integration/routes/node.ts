import type { RouteCase } from './types';

// The protected node's screen and API: every signed-in person with a role ('rank:use');
// saving a node to a project is a shortlist edit (designers).
const node = {
	rails: { VPOS: 5, VNEG: -5 },
	signalRangeV: [-2, 2],
	temperatureC: 25,
	junctions: [{ model: { IS: 1e-14, N: 1 }, anode: 'node', cathode: 'VPOS' }]
};
export const nodeRoutes: RouteCase[] = [
	{ route: '/api/v1/node', method: 'POST', path: '/api/v1/node', allow: 'any-role', kind: 'api', json: node },
	{
		route: '/api/v1/node/rank',
		method: 'POST',
		path: '/api/v1/node/rank',
		allow: 'any-role',
		kind: 'api',
		json: { ...node, junctions: [{ candidate: true, anode: 'node', cathode: 'VPOS' }], limit: 1 }
	}
];

const savedNode = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureC: 25, junctions: [{ candidate: true, anode: 'node', cathode: 'VPOS' }] };
export const projectNodeRoutes: RouteCase[] = [
	{ route: '/api/v1/projects/[id=id]/node', method: 'PUT', path: '/api/v1/projects/999999/node', allow: ['designer'], kind: 'api', json: savedNode },
	{ route: '/api/v1/projects/[id=id]/node', method: 'DELETE', path: '/api/v1/projects/999999/node', allow: ['designer'], kind: 'api' }
];

export const nodeScreenRoutes: RouteCase[] = [
	{ route: '/node', method: 'GET', path: '/node?preset=rail-pair', allow: 'any-role', kind: 'page' },
	{ route: '/node', method: 'POST', path: '/node?/save', allow: ['designer'], kind: 'action', form: { query: '', project: '' } }
];
