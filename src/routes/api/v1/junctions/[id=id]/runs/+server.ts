import { json } from '@sveltejs/kit';
import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runs from '$lib/server/runs';
import { readUpload } from '$lib/server/upload';

// POST a sweep for a part: multipart, JSON points or a text/csv body; an I–V or a C–V sweep
// (a `measurement` field, or found from the header). `?dryRun=1` fits without storing (the
// upload page's preview); a refused upload writes nothing.
export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const upload = await readUpload(event);
	const dryRun = event.url.searchParams.get('dryRun') === '1';
	const result = await runs.ingest(user, { partId: Number(event.params.id), ...upload, dryRun });
	const includePoints = dryRun || event.url.searchParams.get('points') === '1';
	const body = { ...result, points: includePoints ? result.points : undefined };
	return json(body, { status: dryRun ? 200 : 201 });
});
