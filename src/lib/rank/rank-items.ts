/**
 * From the engine's ranking to the API's ranked list: the catalogue filters, the engine
 * operating point of a request, and each ranked row as an API item. Pure, so the server
 * (POST /api/v1/rank) and the browser (ranking over the model snapshot) list the same
 * items from the same CatalogueTable.
 */
// Direct module imports (not the engine's index), so the ranking worker carries only what it runs.
import { SI_2019 } from '$lib/junction/constants';
import type { CatalogueTable } from '$lib/junction/catalogue-table';
import type { OperatingPoint } from '$lib/junction/operating-point';
import type { RankResult, RankedPart } from '$lib/junction/rank-types';
import { leakageBudget } from '$lib/projects/leakage-budget';
import { listedPart } from '$lib/catalogue/part-names';
import type { RankFlag, RankItem, RankOperatingPoint, RankResponse, SpiceModel } from '$lib/schemas/rank';

/** What the ranked list needs to know about a part besides its models (the server's cache holds more). */
export type ListedPart = Pick<RankItem, 'id' | 'partNumber' | 'maker' | 'kind' | 'package' | 'lifecycle' | 'ratedReverseV' | 'ratedForwardA'> & {
	material: string;
	/** Each sample's unit label, in the order of the record's samples (empty for a given model). */
	sampleUnits: string[];
	/** Lower-cased part number, maker and tags, for the text filter. */
	search: string;
	typical: SpiceModel;
	capacitanceSource: 'measured' | 'given' | null;
};

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

/** One ranked row as an API item (without its rank). */
export function toItem(part: ListedPart, row: RankedPart, op: RankOperatingPoint): Omit<RankItem, 'rank'> {
	const { rank, ...item } = rankedItem(0, part, row, op);
	void rank;
	return item;
}

/**
 * One ranked row as an API item: one object literal, the fields in the API's order (no
 * spreads: a ranking makes one per listed part, and spreads made this a tenth of a request).
 */
function rankedItem(rank: number, part: ListedPart, row: RankedPart, op: RankOperatingPoint): RankItem {
	const item: RankItem = {
		rank,
		id: part.id,
		partNumber: part.partNumber,
		maker: part.maker,
		kind: part.kind,
		package: part.package,
		lifecycle: part.lifecycle,
		ratedReverseV: part.ratedReverseV,
		ratedForwardA: part.ratedForwardA,
		samples: row.samples,
		evidence: row.evidence,
		leakageA: row.leakageA,
		bound: row.bound,
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
	if (row.sampleLeakageA) item.sampleLeakage = row.sampleLeakageA.map((leakageA, i) => ({ unit: part.sampleUnits[i] ?? `#${i + 1}`, leakageA }));
	return item;
}

/** The row's flags, with 'capacitance-from-card' when the capacitance shown is a given card's. */
function withCapacitanceFlag(row: RankedPart, part: ListedPart): RankFlag[] {
	const flags = row.flags as RankFlag[];
	return row.capacitanceF !== undefined && part.capacitanceSource === 'given' ? [...flags, 'capacitance-from-card'] : flags;
}

/** The catalogue filters as one predicate, with the request's words and packages prepared once. */
export function filterOf(op: Pick<RankOperatingPoint, 'kinds' | 'lifecycles' | 'packages' | 'q'>): (part: ListedPart) => boolean {
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

/**
 * Ranks a table whose part p is parts[p] at a request's operating point and lists the best
 * `limit` as API items; the first `withModels` carry their typical model.
 */
export function rankListed(
	table: CatalogueTable,
	parts: readonly ListedPart[],
	op: RankOperatingPoint,
	limit = 100,
	withModels = 0,
	withSamples = false
): RankResponse {
	const eop = engineOperatingPoint(op);
	let include: Uint8Array | undefined;
	if (hasFilters(op)) {
		include = new Uint8Array(parts.length);
		const matches = filterOf(op);
		for (let p = 0; p < parts.length; p++) if (matches(parts[p])) include[p] = 1;
	}
	// Only the first `limit` parts are listed, so the engine selects those instead of ordering all;
	// the result is read at once below, so the table's own buffers can hold it (reuse).
	const result: RankResult = table.rank(eop, SI_2019, { limit, reuse: true, ...(include ? { include } : {}) });
	const order = result.order;
	const excludedOverRating = result.excluded.length;
	const rows = table.rows(result, eop, 0, limit, SI_2019, { withSamples });
	const items: RankItem[] = rows.map((row, i) => {
		const part = parts[order[i]];
		const item = rankedItem(i + 1, part, row, op);
		if (i < withModels) item.model = { ...part.typical, material: part.material };
		return item;
	});
	return {
		items,
		evaluated: result.ranked + excludedOverRating,
		excludedOverRating,
		hotC: result.hotC,
		coldC: result.coldC,
		leakageBudgetA: leakageBudget(op),
		basis: result.basis,
		coverage: result.coverage,
		confidence: result.confidence
	};
}
