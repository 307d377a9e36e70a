import { endpoint, readQuery } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as review from '$lib/server/review';
import { projectLibraryQuerySchema } from '$lib/schemas/spice';
import type { RequestHandler } from './$types';

// The approved shortlist's SPICE library: ?sample=typical (default) or worst (each part's
// sample that leaks most at the requirement's bias and hottest temperature).
export const GET: RequestHandler = endpoint(async (event) => {
	requirePermission(event, 'project:read');
	const { sample } = readQuery(event.url, projectLibraryQuerySchema);
	const { project, event: approval } = await review.approval(Number(event.params.id));
	return new Response(review.spiceLibrary(project, approval, sample), {
		headers: {
			'content-type': 'text/plain; charset=utf-8',
			'content-disposition': `attachment; filename="project-${project.id}-models${sample === 'worst' ? '-worst' : ''}.lib"`
		}
	});
});
