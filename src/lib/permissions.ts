/**
 * Who may do what: one pure function used by the screens (to hide what a person cannot
 * do) and by the server (to refuse it). Roles add up; nobody's role is implied by another.
 */
export const ROLES = ['designer', 'librarian', 'lead', 'admin'] as const;
export type Role = (typeof ROLES)[number];

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

/** Each action in words, as a refusal names it ("changing the catalogue"). */
export const ACTION_WORDS: Record<Action, string> = {
	'catalogue:read': 'reading the catalogue',
	'catalogue:write': 'changing the catalogue',
	'rank:use': 'ranking parts',
	'project:read': 'reading projects',
	'project:create': 'starting a project',
	'shortlist:edit': 'changing a shortlist',
	'project:people': "changing a project's people",
	'review:submit': 'sending a shortlist for review',
	'review:decide': 'deciding a review',
	'people:manage': "managing people's roles",
	'tokens:own': 'keeping API tokens'
};

/**
 * Why `actor` may not do `action`, in words a person reads (no permission codes): the roles
 * it needs, or, when the role is held, that this record is not theirs to act on.
 */
export function refusal(actor: Actor, action: Action): string {
	const grant = GRANTS[action];
	const words = ACTION_WORDS[action];
	const what = words.charAt(0).toUpperCase() + words.slice(1);
	if (grant !== 'any-role' && !grant.some((r) => actor?.roles.includes(r))) return `${what} needs the ${grant.join(' or ')} role.`;
	if (action === 'review:decide') return `${what} here is for the project's named lead, and never for the person who sent the shortlist.`;
	return `${what} is not open to you here.`;
}

export function isRole(value: string): value is Role {
	return (ROLES as readonly string[]).includes(value);
}
