import { requirePermission } from '$lib/server/guards';
import { can } from '$lib/permissions';
import { httpError } from '$lib/server/errors';
import { compareIdsSchema } from '$lib/schemas/queries';
import { predictParts, type Prediction } from '$lib/server/ranking';
import { modelCache } from '$lib/server/model-cache';
import { fieldsFromQuery, parseFields, queryFromOperatingPoint } from '$lib/rank/operating-point-url';
import { COMPARE_MAX } from '../limits';
import { inRankOrder } from '$lib/rank/compare';
import { DEFAULT_BASIS } from '$lib/schemas/rank';
import type { PageServerLoad } from './$types';

// 2–4 parts side by side at the operating point in the query (?ids=3,8,21&v=…).
export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'rank:use');
	const parsed = compareIdsSchema(COMPARE_MAX).safeParse(event.url.searchParams.get('ids') ?? undefined);
	if (!parsed.success) httpError(400, parsed.error.issues[0].message);
	const ids = parsed.data;
	const fields = fieldsFromQuery(event.url.searchParams);
	const { op, errors } = parseFields(fields);
	const predictions = op ? await predictParts(ids, op) : new Map<number, Prediction>();
	const snap = (await modelCache()).snapshot;
	let parts = ids.flatMap((id) => {
		const p = predictions.get(id);
		const k = snap.indexOf.get(id);
		if (!p || k === undefined) return [];
		const cached = snap.parts[k];
		return [{ ...p, model: { ...cached.typical, material: cached.material } }];
	});
	// Ranking order, not the order of ticking.
	parts = inRankOrder(parts, op?.basis ?? DEFAULT_BASIS);
	const missing = ids.filter((id) => !predictions.has(id));
	// The way back to the ranking in the short form the ranking writes.
	const query = op ? queryFromOperatingPoint(op) : new URLSearchParams(event.url.searchParams);
	query.delete('ids');
	return { parts, missing, op, errors, query: query.toString(), canShortlist: can(user, 'shortlist:edit') };
};
