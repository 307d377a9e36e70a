import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import * as projectPeople from '$lib/server/project-people';
import { memberSchema } from '$lib/schemas/project-people';

export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'project:people');
	const { email } = await readJson(event, memberSchema);
	const person = await projects.addMember(Number(event.params.id), email, user.id);
	return json(person, { status: 201 });
});

// 409 when the member is the last person who could decide an open review.
export const DELETE = endpoint(async (event) => {
	const user = requirePermission(event, 'project:people');
	const { email } = await readJson(event, memberSchema);
	await projectPeople.removeMember(Number(event.params.id), email, user, process.env.ORIGIN ?? event.url.origin);
	return new Response(null, { status: 204 });
});
