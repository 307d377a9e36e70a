/**
 * Who may do what: one pure function used by the screens (to hide what a person cannot
 * do) and by the server (to refuse it). Roles add up; nobody's role is implied by another.
 */
export const ROLES = ['designer', 'librarian', 'lead', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** What each role lets a person do, for the words beside a grant or removal. */
export const ROLE_WORDS: Record<Role, string> = {
	designer: 'rank parts, build shortlists and send them to a lead',
	librarian: 'add and change parts, samples and measurement runs',
	lead: 'decide on submitted shortlists',
	admin: 'manage people, roles and access'
};

export type Actor = { id: string; roles: readonly Role[] } | null;

export const ACTIONS = [
	'catalogue:read',
	'catalogue:write',
	'rank:use',
	'project:read',
	'project:create',
	'shortlist:edit',
	'project:people',
	'review:submit',
	'review:decide',
	'people:manage',
	'tokens:own'
] as const;
export type Action = (typeof ACTIONS)[number];

/** The roles that grant each action; an empty list means any signed-in person. */
const GRANTS: Record<Action, readonly Role[] | 'any-role'> = {
	'catalogue:read': 'any-role',
	'catalogue:write': ['librarian'],
	'rank:use': 'any-role',
	'project:read': 'any-role',
	'project:create': ['designer'],
	'shortlist:edit': ['designer'],
	'project:people': ['designer', 'lead'],
	'review:submit': ['designer'],
	'review:decide': ['lead'],
	'people:manage': ['admin'],
	'tokens:own': 'any-role'
};

/** What each action lets a person do, in the words the screens use. */
const ACTION_WORDS: Record<Action, string> = {
	'catalogue:read': 'Looking up parts in the catalogue',
	'catalogue:write': 'Adding and changing parts, samples and measurement runs',
	'rank:use': 'Ranking junctions',
	'project:read': 'Opening projects',
	'project:create': 'Starting a project',
	'shortlist:edit': "Changing a project's shortlist",
	'project:people': "Changing a project's members or its lead",
	'review:submit': 'Sending a shortlist to the lead',
	'review:decide': 'Deciding on a shortlist',
	'people:manage': 'Managing people and roles',
	'tokens:own': 'Keeping API tokens'
};

/** Facts about the record that narrow a decision (only reviews need them so far). */
export type ReviewResource = { leadId: string | null; submittedBy: string | null };

export function can(actor: Actor, action: Action, resource?: ReviewResource): boolean {
	if (!actor || actor.roles.length === 0) return false;
	const grant = GRANTS[action];
	const allowed = grant === 'any-role' || grant.some((r) => actor.roles.includes(r));
	if (!allowed) return false;
	if (action === 'review:decide' && resource) {
		// A named lead decides alone; nobody decides on their own submission.
		if (resource.leadId !== null && resource.leadId !== actor.id) return false;
		if (resource.submittedBy === actor.id) return false;
	}
	return true;
}

/**
 * Why `actor` may not do `action`, in words a person reads (no permission codes): the role it
 * needs, or, when the role is held, that this record is not theirs to act on.
 */
export function refusal(actor: Actor, action: Action): string {
	const grant = GRANTS[action];
	const what = ACTION_WORDS[action];
	const roles = actor?.roles ?? [];
	if (grant === 'any-role') {
		if (roles.length === 0) return `${what} needs a role on the team. Ask an admin to grant you one.`;
	} else if (!grant.some((r) => roles.includes(r))) {
		return `${what} needs the ${grant.join(' or ')} role. If your work needs it, ask an admin to grant it.`;
	}
	if (action === 'review:decide') return `${what} here is for the project's named lead, and never for the person who sent the shortlist.`;
	return `${what} is not open to you here.`;
}

export function isRole(value: string): value is Role {
	return (ROLES as readonly string[]).includes(value);
}
