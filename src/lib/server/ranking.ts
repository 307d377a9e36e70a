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
import { CatalogueTable, SI_2019, type OperatingPoint, type RankResult, type RankedPart } from '$lib/junction';
import type { RankFlag, RankItem, RankOperatingPoint, RankResponse } from '$lib/schemas/rank';
import { listedPart } from '$lib/catalogue/part-names';
import { modelCache, type CacheSnapshot, type CachedPart, type ModelCache } from './model-cache';

/** A rank item for one part, with the model version the numbers came from. */
export type { Prediction } from '$lib/projects/shortlist';
import type { Prediction } from '$lib/projects/shortlist';

/** The engine's operating point (the source resistance is not a series element here). */
export function engineOperatingPoint(op: RankOperatingPoint): OperatingPoint {
	const budget = leakageBudget(op);
	return {
		biasV: op.biasV,
		...(op.temperatureRangeC ? { temperatureRangeC: op.temperatureRangeC } : { temperatureC: op.temperatureC }),
		...(op.clampCurrentA !== undefined ? { clampCurrentA: op.clampCurrentA } : {}),
		...(op.maxForwardDropV !== undefined ? { maxForwardDropV: op.maxForwardDropV } : {}),
		...(budget !== null ? { maxLeakageA: budget } : {}),
		...(op.maxCapacitanceF !== undefined ? { maxCapacitanceF: op.maxCapacitanceF } : {}),
		...(op.maxNoiseA_rtHz !== undefined ? { maxNoiseA_rtHz: op.maxNoiseA_rtHz } : {}),
		reverseMarginV: op.reverseMarginV ?? 0,
		includeOverRating: op.includeOverRating ?? false,
		...(op.basis !== undefined ? { basis: op.basis } : {}),
		...(op.coverage !== undefined ? { coverage: op.coverage } : {}),
		...(op.confidence !== undefined ? { confidence: op.confidence } : {})
	};
}

/** Worst leakage the operating point allows [A]: given directly, or error voltage ÷ source resistance. */
export { leakageBudget } from '$lib/projects/shortlist';
import { leakageBudget } from '$lib/projects/shortlist';

function toItem(part: CachedPart, row: RankedPart, op: RankOperatingPoint): Omit<RankItem, 'rank'> {
	return {
		...listedPart(part),
		samples: row.samples,
		evidence: row.evidence,
		leakageA: row.leakageA,
		bound: row.bound,
		...(row.sampleLeakageA ? { sampleLeakage: row.sampleLeakageA.map((leakageA, i) => ({ unit: part.sampleUnits[i] ?? `#${i + 1}`, leakageA })) } : {}),
		forwardDropV: row.forwardDropV ? { cold: row.forwardDropV.cold, hot: row.forwardDropV.hot, worst: row.forwardDropV.worst } : null,
		reverseMarginV: part.ratedReverseV === null ? null : part.ratedReverseV - Math.max(0, -op.biasV),
		capacitanceF: row.capacitanceF ?? null,
		noiseA_rtHz: row.noiseA_rtHz,
		errorVoltageV: op.sourceResistanceOhm !== undefined ? row.leakageA.worst * op.sourceResistanceOhm : null,
		// The engine's flag codes are the API's (RANK_FLAGS lists the same codes); where the
		// capacitance came from is the catalogue's to say.
		flags: withCapacitanceFlag(row, part),
		meetsLimits: row.meetsLimits
	};
}

/** The row's flags, with 'capacitance-from-card' when the capacitance shown is a given card's. */
function withCapacitanceFlag(row: RankedPart, part: CachedPart): RankFlag[] {
	const flags = row.flags as RankFlag[];
	return row.capacitanceF !== undefined && part.capacitanceSource === 'given' ? [...flags, 'capacitance-from-card'] : flags;
}

/** The catalogue filters as one predicate, with the request's words and packages prepared once. */
export function filterOf(op: Pick<RankOperatingPoint, 'kinds' | 'lifecycles' | 'packages' | 'q'>): (part: CachedPart) => boolean {
	const kinds = op.kinds?.length ? new Set<string>(op.kinds) : null;
	const lifecycles = op.lifecycles?.length ? new Set<string>(op.lifecycles) : null;
	const packages = op.packages?.length ? new Set(op.packages.map((p) => p.toLowerCase())) : null;
	const words = op.q ? op.q.toLowerCase().split(/\s+/).filter(Boolean) : [];
	return (part) =>
		(!kinds || kinds.has(part.kind)) &&
		(!lifecycles || lifecycles.has(part.lifecycle)) &&
		(!packages || packages.has(part.package.toLowerCase())) &&
		words.every((w) => part.search.includes(w));
}

function hasFilters(op: RankOperatingPoint): boolean {
	return Boolean(op.kinds?.length || op.lifecycles?.length || op.packages?.length || op.q);
}

/** Ranks one snapshot (exported for benchmarks and tests that hold their own cache). */
export function rankSnapshot(
	snap: CacheSnapshot,
	op: RankOperatingPoint,
	limit = 100,
	withModels = 0,
	withSamples = false
): RankResponse {
	const eop = engineOperatingPoint(op);
	let include: Uint8Array | undefined;
	if (hasFilters(op)) {
		include = new Uint8Array(snap.parts.length);
		const matches = filterOf(op);
		for (let p = 0; p < snap.parts.length; p++) if (matches(snap.parts[p])) include[p] = 1;
	}
	// Only the first `limit` parts are listed, so the engine selects those instead of ordering all;
	// the result is read at once below, so the table's own buffers can hold it (reuse).
	const result: RankResult = snap.table.rank(eop, SI_2019, { limit, reuse: true, ...(include ? { include } : {}) });
	const order = result.order;
	const excludedOverRating = result.excluded.length;
	const evaluated = result.ranked + excludedOverRating;
	const budget = leakageBudget(op);
	const rows = snap.table.rows(result, eop, 0, limit, SI_2019, { withSamples });
	const items: RankItem[] = rows.map((row, i) => {
		const part = snap.parts[order[i]];
		const item: RankItem = { rank: i + 1, ...toItem(part, row, op) };
		if (i < withModels) item.model = { ...part.typical, material: part.material };
		return item;
	});
	return {
		items,
		evaluated,
		excludedOverRating,
		hotC: result.hotC,
		coldC: result.coldC,
		leakageBudgetA: budget,
		basis: result.basis,
		coverage: result.coverage,
		confidence: result.confidence
	};
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
