import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { rankRequestSchema } from '$lib/schemas/rank';
import { rankCatalogue } from '$lib/server/ranking';

// Ranks the catalogue at an operating point: limits met first, measured before given,
// then by the leakage on the chosen basis (statistical bound unless asked otherwise).
export const POST = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const { op, limit, withModels, withSamples } = await readJson(event, rankRequestSchema);
	return json(await rankCatalogue(op, limit, withModels, undefined, withSamples));
});
