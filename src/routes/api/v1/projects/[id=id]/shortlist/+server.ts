import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import { shortlistAddSchema, shortlistRemoveSchema } from '$lib/schemas/projects';

export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'shortlist:edit');
	const input = await readJson(event, shortlistAddSchema);
	const entry = await projects.addEntry(Number(event.params.id), input, user.id);
	return json({ id: entry.id, junctionId: entry.partId, note: entry.note }, { status: 201 });
});

export const DELETE = endpoint(async (event) => {
	const user = requirePermission(event, 'shortlist:edit');
	const input = await readJson(event, shortlistRemoveSchema);
	await projects.removeEntry(Number(event.params.id), input.junctionId, user.id);
	return new Response(null, { status: 204 });
});
