import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as review from '$lib/server/review';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	requirePermission(event, 'project:read');
	const { project, event: approval } = await review.approval(Number(event.params.id));
	return new Response(review.spiceLibrary(project, approval), {
		headers: {
			'content-type': 'text/plain; charset=utf-8',
			'content-disposition': `attachment; filename="project-${project.id}-models.lib"`
		}
	});
});
