import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import { nodeRequirementSchema } from '$lib/schemas/node';

// The protected node the project's shortlist is judged in: set (or replace) it, or take it out.
export const PUT = endpoint(async (event) => {
	const user = requirePermission(event, 'shortlist:edit');
	const node = await readJson(event, nodeRequirementSchema);
	const p = await projects.setNode(Number(event.params.id), node, user.id);
	return json({ id: p.id, version: p.version, requirement: p.requirement });
});

export const DELETE = endpoint(async (event) => {
	const user = requirePermission(event, 'shortlist:edit');
	await projects.setNode(Number(event.params.id), null, user.id);
	return new Response(null, { status: 204 });
});
