import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { liveEvents } from '$lib/server/live-events';

// Changes as they happen, for open ranking and project screens (models and projects).
export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const hub = await liveEvents();
	return new Response(hub.open(), {
		headers: {
			'content-type': 'text/event-stream',
			'cache-control': 'no-cache, no-transform',
			// Reverse proxies that buffer responses would hold the events back.
			'x-accel-buffering': 'no'
		}
	});
});
