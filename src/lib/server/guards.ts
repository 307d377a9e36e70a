import { redirect, type RequestEvent } from '@sveltejs/kit';
import { can, refusal, type Action, type ReviewResource } from '$lib/permissions';
import { httpError } from './errors';
import type { Role } from '$lib/permissions';

/** Signed in, or: pages redirect to sign-in, the API answers 401. */
export function requireUser(event: RequestEvent): App.User {
	const user = event.locals.user;
	if (user) return user;
	if (event.url.pathname.startsWith('/api/')) httpError(401, 'Sign in or send an API token (Authorization: Bearer …).');
	redirect(303, `/signin?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
}

/** Signed in and holding one of the roles. */
export function requireRole(event: RequestEvent, ...roles: Role[]): App.User {
	const user = requireUser(event);
	if (!roles.some((r) => user.roles.includes(r))) {
		httpError(403, `This needs the ${roles.join(' or ')} role. If your work needs it, ask an admin to grant it.`);
	}
	return user;
}

/** Signed in and allowed the action by can(). */
export function requirePermission(event: RequestEvent, action: Action, resource?: ReviewResource): App.User {
	const user = requireUser(event);
	if (!can(user, action, resource)) httpError(403, refusal(user, action));
	return user;
}
