import type { Role } from '$lib/permissions';

/**
 * One row of the role matrix. `route` is the SvelteKit route id (folder path with its
 * [param=matcher] segments), `path` a concrete URL for it. `allow` lists the roles that get
 * through; every other role must get 403 and anonymous 401 (API) or a sign-in redirect (page).
 */
export type RouteCase = {
	route: string;
	method: 'GET' | 'POST' | 'PATCH' | 'DELETE' | 'PUT';
	path: string;
	allow: Role[] | 'any-role' | 'signed-in';
	kind: 'page' | 'api' | 'action';
	/** A JSON body for API calls; allowed callers may then get 2xx or a 4xx about the body, never 401/403. */
	json?: unknown;
	/** Form fields for a form action (kind 'action'); `path` then includes the ?/action. */
	form?: Record<string, string>;
};
