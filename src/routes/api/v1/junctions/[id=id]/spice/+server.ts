import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { partSpiceBlock, spiceResponse } from '$lib/server/spice';
import { sampleChoiceFrom } from '$lib/schemas/spice';

// The part as an ngspice-ready block: ?sample=typical (default), worst (with biasV and
// temperatureC: the sample leaking most there) or a sample's unit. text/plain.
export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const choice = sampleChoiceFrom(event.url.searchParams);
	if (!choice.success) throw choice.error;
	return spiceResponse(await partSpiceBlock(Number(event.params.id), choice.data));
});
