import { DomainError } from '$lib/server/api';
import { fail } from '$lib/server/http-error';
import { requirePermission } from '$lib/server/guards';
import { partSpiceBlock, spiceResponse } from '$lib/server/spice';
import { sampleChoiceFrom } from '$lib/schemas/spice';
import type { RequestHandler } from './$types';

// The part page's download: the same block and query as GET /api/v1/junctions/{id}/spice.
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const choice = sampleChoiceFrom(event.url.searchParams);
	if (!choice.success) fail(400, choice.error.issues[0].message);
	try {
		return spiceResponse(await partSpiceBlock(Number(event.params.id), choice.data));
	} catch (e) {
		if (e instanceof DomainError && (e.status === 404 || e.status === 409)) fail(e.status, e.message);
		throw e;
	}
};
