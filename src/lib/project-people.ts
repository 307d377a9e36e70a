/**
 * Who is left to decide when a project's people change. An open review (in-review) must
 * keep someone who may decide it: the named lead, or with none named any lead, never the
 * person who sent it (can() in permissions.ts). Changing the lead or removing a member
 * that would leave nobody is refused. Pure, so the screen hides what the server refuses.
 */
import { can, type ReviewResource, type Role } from './permissions';

export type Person = { id: string; name: string; roles: readonly Role[] };

/** The people who could decide the review with this lead and submitter. */
export function deciders(people: readonly Person[], resource: ReviewResource): Person[] {
	return people.filter((p) => can(p, 'review:decide', resource));
}

export type PeopleCheck = { ok: true } | { ok: false; status: 409; reason: string };

/**
 * May the project's lead become `leadId` (null: any lead) in this state? `leads` are the
 * people holding the lead role; `submittedBy` sent the open review.
 */
export function checkLead(state: string, leadId: string | null, submittedBy: string | null, leads: readonly Person[]): PeopleCheck {
	if (state !== 'in-review') return { ok: true };
	if (deciders(leads, { leadId, submittedBy }).length > 0) return { ok: true };
	const named = leadId ? leads.find((l) => l.id === leadId) : undefined;
	const reason =
		leadId && leadId === submittedBy
			? `${named?.name ?? 'That person'} sent this shortlist for review; nobody decides on their own submission.`
			: leadId
				? `${named?.name ?? 'That person'} cannot decide this review.`
				: 'No lead other than the person who sent this shortlist could decide it; name a lead first.';
	return { ok: false, status: 409, reason };
}

/**
 * May `member` leave the project? A named lead who leaves takes the lead with them (any
 * lead then decides), which an open review allows only if someone else could still decide.
 */
export function checkRemoval(
	state: string,
	member: Person,
	project: { leadId: string | null },
	submittedBy: string | null,
	leads: readonly Person[]
): PeopleCheck {
	if (member.id !== project.leadId) return { ok: true };
	const after = checkLead(state, null, submittedBy, leads.filter((l) => l.id !== member.id));
	if (after.ok) return after;
	return { ok: false, status: 409, reason: `${member.name} is the last person who could decide this open review; name another lead before removing them.` };
}
