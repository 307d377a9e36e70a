import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { nodeRankRequestSchema } from '$lib/schemas/node-rank';
import { rankNodeCatalogue } from '$lib/server/node-rank';

// Catalogue parts ranked in a protected node: every part in the positions marked candidate.
export const POST = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const body = await readJson(event, nodeRankRequestSchema);
	return json(await rankNodeCatalogue(body));
});
