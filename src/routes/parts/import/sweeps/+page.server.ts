import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { UPLOAD_LIMIT_BYTES } from '$lib/server/runs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'catalogue:write');
	const parts = await catalogue.compactList();
	return { parts: parts.map((p) => ({ id: p.id, pn: p.pn, mk: p.mk })), limitBytes: UPLOAD_LIMIT_BYTES };
};
