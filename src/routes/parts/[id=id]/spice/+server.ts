import { httpError, pageError } from '$lib/server/errors';
import { requirePermission } from '$lib/server/guards';
import { partSpiceBlock, spiceResponse } from '$lib/server/spice';
import { sampleChoiceFrom } from '$lib/schemas/spice';
import type { RequestHandler } from './$types';

// The part page's download: the same block and query as GET /api/v1/junctions/{id}/spice.
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const choice = sampleChoiceFrom(event.url.searchParams);
	if (!choice.success) httpError(400, choice.error.issues[0].message);
	return spiceResponse(await partSpiceBlock(Number(event.params.id), choice.data).catch(pageError));
};
