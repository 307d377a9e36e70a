import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import type { PageServerLoad } from './$types';

// The whole catalogue in a compact form, loaded once; search and filters run in the browser.
export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'catalogue:read');
	return { parts: await catalogue.compactList() };
};
