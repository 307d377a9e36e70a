import { json } from '@sveltejs/kit';
import type { RequestEvent } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import * as review from '$lib/server/review';
import * as projectPeople from '$lib/server/project-people';
import { projectPatchSchema } from '$lib/schemas/project-people';

/** The project as GET answers it (PATCH answers the same after its change). */
async function full(event: RequestEvent) {
	const project = await projects.find(Number(event.params.id));
	const [entries, members, events] = await Promise.all([projects.entries(project), projects.members(project.id), review.events(project.id)]);
	const decision = review.latestDecision(events);
	return json({
		id: project.id,
		name: project.name,
		description: project.description,
		state: project.state,
		version: project.version,
		requirement: project.requirement,
		leadId: project.leadId,
		members,
		entries: entries.map((e) => ({
			junctionId: e.partId,
			partNumber: e.partNumber,
			maker: e.maker,
			kind: e.kind,
			note: e.note,
			addedBy: e.addedBy,
			addedAt: e.addedAt,
			prediction: e.prediction,
			node: e.node,
			verdict: e.verdict
		})),
		reviews: events.map((e) => ({ id: e.id, action: e.action, fromState: e.fromState, toState: e.toState, comment: e.comment, by: e.actorName, at: e.at, projectVersion: e.projectVersion })),
		changedSinceDecision: decision
			? review.changedSince(decision.snapshot, entries).map((c) => ({ junctionId: c.partId, partNumber: c.partNumber, then: c.then.prediction, now: c.now?.prediction ?? null }))
			: []
	});
}

export const GET = endpoint(async (event) => {
	requirePermission(event, 'project:read');
	return full(event);
});

// Names the lead who decides ({ leadEmail }, null: any lead), also while a review is open.
export const PATCH = endpoint(async (event) => {
	const user = requirePermission(event, 'project:people');
	const { leadEmail } = await readJson(event, projectPatchSchema);
	await projectPeople.changeLead(Number(event.params.id), leadEmail, user, process.env.ORIGIN ?? event.url.origin);
	return full(event);
});
