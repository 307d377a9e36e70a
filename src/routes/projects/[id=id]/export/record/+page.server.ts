import { pageError } from '$lib/server/errors';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import * as review from '$lib/server/review';
import * as people from '$lib/server/people';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'project:read');
	const project = await projects.find(Number(event.params.id)).catch(pageError);
	const events = await review.events(project.id);
	const basis = review.latestDecision(events) ?? events[0] ?? null;
	const lead = project.leadId ? await people.findById(project.leadId) : null;
	// Each part's parameters and card as they stood at that step (the .lib's own code).
	const models = basis
		? review.spiceBlocks(basis).map(({ partId, block, note }) => {
				const entry = basis.snapshot.entries.find((e) => e.partId === partId);
				return { partId, parameters: entry?.model?.input ?? null, card: block?.text ?? null, note };
			})
		: [];
	return {
		project: { id: project.id, name: project.name, description: project.description, state: project.state, requirement: project.requirement, version: project.version },
		lead: lead?.name ?? null,
		models,
		basis: basis ? { action: basis.action, at: basis.at, by: basis.actorName, version: basis.projectVersion, entries: basis.snapshot.entries, requirement: basis.snapshot.requirement } : null,
		events: [...events].reverse().map((e) => ({ id: e.id, action: e.action, toState: e.toState, at: e.at, by: e.actorName, comment: e.comment }))
	};
};
