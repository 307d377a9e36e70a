import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { nodeRequestSchema } from '$lib/schemas/node';
import { evaluateNode } from '$lib/server/node';

// A protected node over its signal and temperature ranges: net current, noise, fault excursion.
export const POST = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const body = await readJson(event, nodeRequestSchema);
	return json(await evaluateNode(body));
});
