import { requirePermission } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'project:read');
	const state = event.url.searchParams.get('state') ?? '';
	return { state, projects: await projects.list({ state: state || undefined }) };
};
