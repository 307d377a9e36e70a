import { json } from '@sveltejs/kit';
import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import * as review from '$lib/server/review';

export const GET = endpoint(async (event) => {
	requirePermission(event, 'project:read');
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
			verdict: e.verdict
		})),
		reviews: events.map((e) => ({ id: e.id, action: e.action, fromState: e.fromState, toState: e.toState, comment: e.comment, by: e.actorName, at: e.at, projectVersion: e.projectVersion })),
		changedSinceDecision: decision
			? review.changedSince(decision.snapshot, entries).map((c) => ({ junctionId: c.partId, partNumber: c.partNumber, then: c.then.prediction, now: c.now?.prediction ?? null }))
			: []
	});
});
