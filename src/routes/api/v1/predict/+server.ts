import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { predictRequestSchema } from '$lib/schemas/rank';
import { predictModel } from '$lib/server/predict';

// Current at given biases and forward voltage at given currents for one SPICE-named model.
export const POST = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const body = await readJson(event, predictRequestSchema);
	return json(predictModel(body));
});
