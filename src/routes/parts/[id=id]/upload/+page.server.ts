import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { pageError } from '$lib/server/errors';
import { UPLOAD_LIMIT_BYTES } from '$lib/server/runs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'catalogue:write');
	const d = await catalogue.detailOr404(Number(event.params.id)).catch(pageError);
	const p = d.part;
	return {
		part: { id: p.id, partNumber: p.partNumber, maker: p.maker, kind: p.kind, material: p.material, ratedReverseV: p.ratedReverseV, ratedForwardA: p.ratedForwardA, ratedJunctionC: p.ratedJunctionC },
		units: d.samples.map((s) => s.unit),
		limitBytes: UPLOAD_LIMIT_BYTES
	};
};
