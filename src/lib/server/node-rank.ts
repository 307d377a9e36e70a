/**
 * POST /api/v1/node/rank: the catalogue's parts ranked in a protected node, every part in
 * the candidate positions (src/lib/junction/node-rank.ts states the rules: basis, limits,
 * flags, order), over the in-memory model cache with the catalogue filters of
 * POST /api/v1/rank, written as items like that endpoint's.
 */
import { candidateCircuit, nodeRankRows, NodeError, rankNode, SI_2019, type NodeRankedPart, type NodeRankResult, type RankPosition } from '$lib/junction';
import { listedPart } from '$lib/catalogue/part-names';
import { networkOf } from '$lib/schemas/node';
import type { NodeCurvePoint, NodeRankItem, NodeRankRequestBody, NodeRankResponse } from '$lib/schemas/node-rank';
import type { RankFlag } from '$lib/schemas/rank';
import { DomainError } from './api';
import { modelCache, type CacheSnapshot, type CachedPart } from './model-cache';
import { judgementTerms, resolveJunction } from './node';
import { filterOf } from './ranking';

/** Items listed unless the request says otherwise. */
export const DEFAULT_NODE_RANK_LIMIT = 50;
/** Leading items that carry their curves unless the request says otherwise. */
export const DEFAULT_RANK_CURVES = 0;

/** The engine's positions: fixed parts (or inline models) resolved, candidates left open. */
function rankPositions(req: NodeRankRequestBody, snap: CacheSnapshot): RankPosition[] {
	const terms = judgementTerms(req);
	return req.junctions.map((j, i) => ({ anode: j.anode, cathode: j.cathode, fixed: j.candidate ? null : resolveJunction(j, i, snap, terms) }));
}

/** The net-current limit the request states [A]: given, or allowed error ÷ source resistance. */
function budgetOf(req: NodeRankRequestBody): number | null {
	if (req.maxNetCurrentA !== undefined) return req.maxNetCurrentA;
	if (req.allowedErrorV !== undefined && req.sourceResistanceOhm !== undefined) return req.allowedErrorV / req.sourceResistanceOhm;
	return null;
}

function itemOf(part: CachedPart, row: NodeRankedPart, rank: number, result: NodeRankResult): NodeRankItem {
	const e = row.excursionV;
	const drop = e && e.cold !== null && e.hot !== null ? { cold: e.cold, hot: e.hot, worst: Math.max(e.cold, e.hot) } : null;
	return {
		rank,
		...listedPart(part),
		samples: row.samples,
		evidence: row.evidence,
		leakageA: row.netCurrentA,
		bound: row.bound,
		forwardDropV: drop,
		reverseMarginV: part.ratedReverseV === null || result.reverseV === 0 ? null : part.ratedReverseV - result.reverseV,
		capacitanceF: null,
		errorVoltageV: result.sourceResistanceOhm === undefined ? null : row.netCurrentA.worst * result.sourceResistanceOhm,
		noiseA_rtHz: row.noiseA_rtHz,
		// The catalogue's and the node's flag codes; FLAG_WORDS and NODE_FLAG_WORDS explain them.
		flags: row.flags as RankFlag[],
		meetsLimits: row.meetsLimits,
		netCurrentA: row.netCurrentA,
		worst: row.worst,
		excursionV: e
	};
}

/** A listed part's curves on the node's full grid (NodeCircuit, the same as POST /api/v1/node). */
function curveOf(snap: CacheSnapshot, positions: RankPosition[], req: NodeRankRequestBody, index: number, factor: number): NodeCurvePoint[] {
	const ev = candidateCircuit(snap.table.view(), { net: networkOf(req), positions }, index, factor).evaluate(req.gridPoints);
	return Array.from(ev.signalV, (signalV, i) => ({
		signalV,
		netCurrentA: { cold: ev.typicalA[0][i], hot: ev.typicalA[1][i] },
		worstA: { cold: ev.worstA[0][i], hot: ev.worstA[1][i] }
	}));
}

/** Ranks one snapshot (file header). @throws DomainError 422 for a node the engine refuses. */
export function rankNodeSnapshot(snap: CacheSnapshot, req: NodeRankRequestBody): NodeRankResponse {
	const positions = rankPositions(req, snap);
	const view = snap.table.view();
	const matches = filterOf(req);
	const include = new Uint8Array(snap.parts.length);
	for (let p = 0; p < snap.parts.length; p++) if (matches(snap.parts[p])) include[p] = 1;
	const limit = req.limit ?? DEFAULT_NODE_RANK_LIMIT;
	let result: NodeRankResult;
	try {
		result = rankNode(
			view,
			{
				net: networkOf(req),
				positions,
				include,
				limit,
				...(req.basis !== undefined ? { basis: req.basis } : {}),
				...judgementTerms(req),
				...(req.by !== undefined ? { by: req.by } : {}),
				...(req.sourceResistanceOhm !== undefined ? { sourceResistanceOhm: req.sourceResistanceOhm } : {}),
				...(req.faultCurrentA !== undefined ? { faultCurrentA: req.faultCurrentA } : {}),
				limits: {
					...(req.maxNetCurrentA !== undefined ? { maxNetCurrentA: req.maxNetCurrentA } : {}),
					...(req.allowedErrorV !== undefined ? { allowedErrorV: req.allowedErrorV } : {}),
					...(req.maxNoiseA_rtHz !== undefined ? { maxNoiseA_rtHz: req.maxNoiseA_rtHz } : {}),
					...(req.maxExcursionV !== undefined ? { maxExcursionV: req.maxExcursionV } : {})
				},
				reverseMarginV: req.reverseMarginV ?? 0,
				includeOverRating: req.includeOverRating ?? false,
				...(req.gridPoints !== undefined ? { gridPoints: req.gridPoints } : {})
			},
			SI_2019
		);
	} catch (e) {
		if (e instanceof NodeError) throw new DomainError(422, e.message, e.issues);
		if (e instanceof RangeError) throw new DomainError(422, `The node cannot be ranked: ${e.message}.`);
		throw e;
	}
	const curves = req.withCurves ?? DEFAULT_RANK_CURVES;
	const items = nodeRankRows(view, result, 0, limit).map((row, i) => {
		const item = itemOf(snap.parts[row.index], row, i + 1, result);
		if (i < curves) item.curve = curveOf(snap, positions, req, row.index, result.factor[row.index]);
		return item;
	});
	return {
		items,
		evaluated: result.ranked + result.excluded.length,
		excludedOverRating: result.excluded.length,
		hotC: result.hotC,
		coldC: result.coldC,
		reverseV: result.reverseV,
		leakageBudgetA: budgetOf(req),
		basis: result.basis,
		coverage: result.coverage,
		confidence: result.confidence,
		by: result.by
	};
}

/** POST /api/v1/node/rank. */
export async function rankNodeCatalogue(req: NodeRankRequestBody): Promise<NodeRankResponse> {
	return rankNodeSnapshot((await modelCache()).snapshot, req);
}
