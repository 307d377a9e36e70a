import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

// The run's original file, byte for byte as uploaded.
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const file = await runs.originalFile(Number(event.params.id), Number(event.params.runId));
	if (!file) error(404, { message: 'No such run for this part.', code: 'not_found' });
	return new Response(new Uint8Array(file.bytes), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${file.fileName.replace(/["\\\r\n]/g, '_')}"`,
			'x-content-sha256': file.sha256,
			'cache-control': 'private, max-age=3600'
		}
	});
};
