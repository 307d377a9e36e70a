import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission, requireRole } from '$lib/server/guards';
import * as review from '$lib/server/review';
import { reviewSchema } from '$lib/schemas/projects';

export const POST = endpoint(async (event) => {
	requirePermission(event, 'project:read');
	// Only people who can take part in a review get as far as the body.
	const user = requireRole(event, 'designer', 'lead');
	const input = await readJson(event, reviewSchema);
	const origin = process.env.ORIGIN ?? event.url.origin;
	const result = await review.transition(Number(event.params.id), input, user, origin);
	return json(result);
});
