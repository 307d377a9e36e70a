/**
 * Ranking the catalogue at a designer's operating point, and predictions for named parts.
 * The numbers, the limit flags and the order come from the engine's catalogue table
 * (src/lib/junction/rank.ts, which states the definitions and order rules) over the
 * in-memory model cache: parts meeting every stated limit first; within each group
 * measured parts before given-model-only ones, parts with a value on the chosen basis
 * (statistical bound by default, worst sample or typical) before those without, then by
 * that value. This module adds the catalogue's filters, turns an allowed error voltage
 * into the leakage budget, and adds the error voltage across the source resistance, the
 * reverse margin and (on request) each sample's leakage by unit to each item.
 *
 * Worst case: leakage at the hot end of the range (largest sample at that point), forward
 * drop the larger of the hot and cold ends (largest sample). Material defaults (EG, XTI)
 * are the engine's. The bias is across the junction itself, so the source resistance is
 * not put in series: it only turns leakage into an error voltage.
 */
import { CatalogueTable, SI_2019 } from '$lib/junction';
import type { RankOperatingPoint, RankResponse } from '$lib/schemas/rank';
import { engineOperatingPoint, rankListed, toItem } from '$lib/rank/rank-items';
import { modelCache, type CacheSnapshot, type CachedPart, type ModelCache } from './model-cache';

/** A rank item for one part, with the model version the numbers came from. */
export type { Prediction } from '$lib/projects/shortlist';
import type { Prediction } from '$lib/projects/shortlist';

/** Worst leakage the operating point allows [A]: given directly, or error voltage ÷ source resistance. */
export { leakageBudget } from '$lib/projects/shortlist';

// Filters, the engine operating point and the items are shared with the browser's ranking over the snapshot.
export { engineOperatingPoint, filterOf } from '$lib/rank/rank-items';

/** Ranks one snapshot (exported for benchmarks and tests that hold their own cache). */
export function rankSnapshot(
	snap: CacheSnapshot,
	op: RankOperatingPoint,
	limit = 100,
	withModels = 0,
	withSamples = false
): RankResponse {
	return rankListed(snap.table, snap.parts, op, limit, withModels, withSamples);
}

/** Ranks the whole catalogue at an operating point (order in the file header). */
export async function rankCatalogue(
	op: RankOperatingPoint,
	limit = 100,
	withModels = 0,
	cache?: ModelCache,
	withSamples = false
): Promise<RankResponse> {
	const c = cache ?? (await modelCache());
	return rankSnapshot(c.snapshot, op, limit, withModels, withSamples);
}

/**
 * Predictions for the named parts at an operating point, keyed by part id. Parts over
 * their reverse rating are included (with the flag); parts without a usable model are
 * absent from the map. `modelVersion` is parts.modelVersion as the numbers were computed.
 */
export async function predictParts(partIds: number[], op: RankOperatingPoint, cache?: ModelCache): Promise<Map<number, Prediction>> {
	const c = cache ?? (await modelCache());
	const snap = c.snapshot;
	const chosen: CachedPart[] = [];
	for (const id of new Set(partIds)) {
		const k = snap.indexOf.get(id);
		if (k !== undefined) chosen.push(snap.parts[k]);
	}
	const out = new Map<number, Prediction>();
	if (chosen.length === 0) return out;
	const table = new CatalogueTable(chosen.map((p) => p.record));
	const eop = { ...engineOperatingPoint(op), includeOverRating: true };
	const result = table.rank(eop);
	const rows = table.rows(result, eop, 0, chosen.length, SI_2019, { withSamples: true });
	rows.forEach((row, i) => {
		const part = chosen[result.order[i]];
		out.set(part.id, { ...toItem(part, row, op), modelVersion: part.modelVersion });
	});
	return out;
}
