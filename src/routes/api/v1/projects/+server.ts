import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import { createProjectSchema } from '$lib/schemas/projects';

export const GET = endpoint(async (event) => {
	const user = requirePermission(event, 'project:read');
	const q = event.url.searchParams;
	// ?mine=1: projects the caller is a member of; ?open=1: those whose shortlist may still change.
	const items = await projects.list({ state: q.get('state') ?? undefined, memberId: q.get('mine') === '1' ? user.id : undefined, open: q.get('open') === '1' });
	return json({
		items: items.map((p) => ({
			id: p.id,
			name: p.name,
			description: p.description,
			state: p.state,
			version: p.version,
			requirement: p.requirement,
			lead: p.lead,
			entryCount: p.entryCount,
			updatedAt: p.updatedAt
		}))
	});
});

export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'project:create');
	const input = await readJson(event, createProjectSchema);
	const p = await projects.create(input, user.id);
	return json({ id: p.id, name: p.name, state: p.state, version: p.version, requirement: p.requirement, leadId: p.leadId }, { status: 201 });
});
