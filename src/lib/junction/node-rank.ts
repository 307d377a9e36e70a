/**
 * Ranking catalogue parts for a protected node: each part placed in every candidate
 * position at once (the same part in each; its samples may differ from position to
 * position, node-evaluate.ts), the node's figures computed over its signal and temperature
 * ranges (node-rank-pass.ts, node-rank-fault.ts), judged and ordered by the rules of the
 * single-junction ranking (rank.ts):
 *  - basis: the statistical bound (default), the worst sample assignment or the typical
 *    one, for the net current and for the noise; a part with fewer than two measured samples
 *    (or only a given model) has no bound, and its limits are held against the worst;
 *  - limits: the node's (net current or error voltage, noise, fault excursion, the fault
 *    clamped at all; node-limits.ts) and the part's ratings: the largest reverse bias any
 *    candidate position sees over the signal range beyond the rated reverse voltage less the
 *    margin (such parts are left out unless asked for), and a fault current above the rated
 *    forward current;
 *  - flags: the catalogue's (extrapolated current at the worst point, temperatures far from
 *    the measured ones, light, metal–semiconductor, fit, samples, band gap) and the node's;
 *  - order: parts meeting every limit first; then measured before given-model-only; then
 *    parts with a value on the basis; then by that value — the worst |net current| (`by`
 *    'net'; the error voltage is that times the source resistance, the same order) or the
 *    noise density ('noise') — typical where a part has no value; ties by typical, then by
 *    part index.
 */
import { SI_2019, celsiusToKelvin, thermalVoltage, type PhysicalConstants } from './constants';
import { MAX_GRID_POINTS, MIN_GRID_POINTS, NodeCircuit } from './node-evaluate';
import { biasRange, checkNetwork, type NodeNetwork } from './node';
import { nodeFlags, NODE_LIMIT_FLAGS, type NodeFlagCode, type NodeLimits } from './node-limits';
import { faultExcursion } from './fault';
import { faultEstimates } from './node-rank-fault';
import { gridPass, type GridFigures, type RankPosition } from './node-rank-pass';
import { judgementOf, type RankBasis } from './operating-point';
import {
	BIT_CURRENT_EXTRAPOLATED,
	BIT_OVER_FORWARD_RATING,
	BIT_OVER_REVERSE_RATING,
	BIT_TEMPERATURE_EXTRAPOLATED,
	flagsFromBits,
	LIMIT_BITS,
	type FlagCode
} from './rank-flags';
import { GROUP_FAILS_LIMIT, GROUP_UNLISTED, orderGroups, RANK_GROUPS, rankGroup } from './rank-order';
import type { BoundTerms, CatalogueView, Evidence, RankResult } from './rank-types';
import { scaleModel } from './temperature';

export type { RankPosition };

/** What a node ranking orders by: the net current (and with it the error voltage) or the noise. */
export const NODE_RANK_BY = ['net', 'noise'] as const;
export type NodeRankBy = (typeof NODE_RANK_BY)[number];

/** Grid of signal voltages a ranking uses unless told otherwise (ends included; file header of node-rank-pass.ts). */
export const RANK_GRID_POINTS = 21;

export interface NodeRankRequest {
	net: NodeNetwork;
	positions: readonly RankPosition[];
	basis?: RankBasis;
	coverage?: number;
	confidence?: number;
	by?: NodeRankBy;
	sourceResistanceOhm?: number;
	/** Positive: driven into the node. */
	faultCurrentA?: number;
	limits?: NodeLimits;
	reverseMarginV?: number;
	includeOverRating?: boolean;
	gridPoints?: number;
	/** Mask by part index: only parts with a non-zero entry are evaluated, counted or listed. */
	include?: Uint8Array;
	/** Only the best `limit` are put in `order`. */
	limit?: number;
}

/** The catalogue ranking's order and counts (see RankResult), with the node's own figures. */
export interface NodeRankResult extends Pick<RankResult, 'order' | 'ranked' | 'meetingLimits' | 'excluded' | 'basis' | 'coverage' | 'confidence'> {
	by: NodeRankBy;
	figures: GridFigures;
	/** Worst-sample fault excursion [V] at [cold, hot] per part (NaN: not clamped), or null without a fault current. */
	excursionV: [Float64Array, Float64Array] | null;
	/** Tolerance factor per part (NaN: no bound). */
	factor: Float64Array;
	catalogueFlags: Uint32Array;
	nodeFlags: NodeFlagCode[][];
	/** The largest reverse bias any candidate position sees over the signal range [V] (0 when none is reverse-biased). */
	reverseV: number;
	coldC: number;
	hotC: number;
	sourceResistanceOhm?: number;
}

/** One listed part, its figures as magnitudes (the signed worst with where it lies). */
export interface NodeRankedPart {
	index: number;
	id: string;
	samples: number;
	evidence: Evidence;
	netCurrentA: { typical: number; worst: number; bound: number | null };
	/** The worst net current, signed (leaving the node positive), and where [V, °C]. */
	worst: { netCurrentA: number; signalV: number; temperatureC: number };
	noiseA_rtHz: { typical: number; worst: number; bound: number | null };
	bound: BoundTerms | null;
	excursionV: { cold: number | null; hot: number | null } | null;
	flags: (FlagCode | NodeFlagCode)[];
	meetsLimits: boolean;
}

/**
 * Ranks the catalogue's parts in a node (file header).
 * @throws NodeError for an invalid network, RangeError for invalid options.
 */
export function rankNode(view: CatalogueView, req: NodeRankRequest, constants: PhysicalConstants = SI_2019): NodeRankResult {
	checkNetwork(req.net, req.positions);
	if (!req.positions.some((p) => !p.fixed)) throw new RangeError('a node ranking needs at least one candidate position');
	const gridPoints = req.gridPoints ?? RANK_GRID_POINTS;
	if (!Number.isInteger(gridPoints) || gridPoints < MIN_GRID_POINTS || gridPoints > MAX_GRID_POINTS) throw new RangeError(`gridPoints must be ${MIN_GRID_POINTS}…${MAX_GRID_POINTS}`);
	const { basis, coverage, confidence } = judgementOf({ biasV: 0, temperatureC: 0, basis: req.basis, coverage: req.coverage, confidence: req.confidence });
	const n = view.records.length;
	const factors = view.factorsFor(coverage, confidence);
	const factor = new Float64Array(n);
	for (let j = 0; j < n; j++) factor[j] = view.given[j] === 1 ? NaN : factors[view.count[j]];
	const figures = gridPass({ net: req.net, positions: req.positions, view, include: req.include, factor, gridPoints, constants });
	const excursionV = req.faultCurrentA === undefined ? null : faults(view, req, constants);
	const [coldC, hotC] = req.net.temperatureRangeC;
	const reverseV = Math.max(0, ...req.positions.filter((p) => !p.fixed).map((p) => -biasRange(req.net, p)[0]));
	const result: NodeRankResult = {
		order: new Int32Array(0),
		ranked: 0,
		meetingLimits: 0,
		excluded: new Int32Array(0),
		basis,
		coverage,
		confidence,
		by: req.by ?? 'net',
		figures,
		excursionV,
		factor,
		catalogueFlags: new Uint32Array(n),
		nodeFlags: new Array(n),
		reverseV,
		coldC,
		hotC,
		...(req.sourceResistanceOhm !== undefined ? { sourceResistanceOhm: req.sourceResistanceOhm } : {})
	};
	judgeAndOrder(view, req, result, constants);
	return result;
}

/** Excursions from the shortcut, or each part's node solved in full when it does not hold (node-rank-fault.ts). */
function faults(view: CatalogueView, req: NodeRankRequest, constants: PhysicalConstants): [Float64Array, Float64Array] {
	const current = req.faultCurrentA as number;
	const quick = faultEstimates(req.net, req.positions, view, current, constants);
	if (quick) return quick;
	const n = view.records.length;
	const out: [Float64Array, Float64Array] = [new Float64Array(n).fill(NaN), new Float64Array(n).fill(NaN)];
	for (let j = 0; j < n; j++) {
		if (req.include && req.include[j] === 0) continue;
		const positions = req.positions.map((p) => ({ anode: p.anode, cathode: p.cathode, samples: p.fixed ? p.fixed.samples : view.records[j].samples }));
		req.net.temperatureRangeC.forEach((tC, end) => {
			const scaled = positions.map((p) => p.samples.map((m) => scaleModel(m, tC, constants)));
			out[end][j] = faultExcursion(req.net, positions, scaled, current).excursionV ?? NaN;
		});
	}
	return out;
}

/** Each part's value on the basis (or the worst standing in), from the grid figures. */
function onBasis(f: GridFigures, basis: RankBasis, j: number, noise: boolean): { value: number; hasValue: boolean } {
	const [worst, typical, bound] = noise ? [f.value.noiseWorst[j], f.value.noiseTypical[j], f.value.noiseBound[j]] : [f.value.worst[j], f.value.typical[j], f.value.bound[j]];
	if (basis === 'typical') return { value: typical, hasValue: true };
	if (basis === 'worst') return { value: worst, hasValue: true };
	return bound === bound ? { value: bound, hasValue: true } : { value: worst, hasValue: false };
}

/** Flags, rank groups and the order (file header), written into `result`. */
function judgeAndOrder(view: CatalogueView, req: NodeRankRequest, result: NodeRankResult, constants: PhysicalConstants): void {
	const n = view.records.length;
	const f = result.figures;
	const farCold = view.farAt(result.coldC);
	const farHot = view.farAt(result.hotC);
	const vtHot = thermalVoltage(celsiusToKelvin(result.hotC), constants);
	const margin = req.reverseMarginV ?? 0;
	const fault = req.faultCurrentA === undefined ? 0 : Math.abs(req.faultCurrentA);
	const bucket = new Uint8Array(n).fill(GROUP_UNLISTED);
	const counts = new Int32Array(RANK_GROUPS);
	const key = new Float64Array(n);
	const tie = new Float64Array(n);
	const excluded: number[] = [];
	const tops = req.positions.map((p) => biasRange(req.net, p)[1]);
	const fixedNvt = Math.max(-Infinity, ...req.positions.flatMap((p, i) => (p.fixed ? p.fixed.samples.map((m) => tops[i] / (m.N * vtHot)) : [])));
	const candidateTop = Math.max(...req.positions.flatMap((p, i) => (p.fixed ? [] : [tops[i]])));
	for (let j = 0; j < n; j++) {
		if (req.include && req.include[j] === 0) continue;
		const net = onBasis(f, result.basis, j, false);
		const noise = onBasis(f, result.basis, j, true);
		let forwardNvt = fixedNvt;
		for (let s = view.start[j]; s < view.start[j] + view.count[j]; s++) forwardNvt = Math.max(forwardNvt, candidateTop / (view.models.N[s] * vtHot));
		const rs = req.sourceResistanceOhm;
		const exc = result.excursionV;
		const codes = nodeFlags(
			{
				worstNetA: net.value,
				errorVoltageV: rs === undefined ? null : Math.abs(net.value) * rs,
				noiseA_rtHz: Math.sqrt(noise.value),
				excursionV: exc ? [nullIfNaN(exc[0][j]), nullIfNaN(exc[1][j])] : null,
				forwardNvt,
				hotC: result.hotC
			},
			req.limits ?? {},
			rs,
			constants
		);
		result.nodeFlags[j] = codes;
		let bits = view.staticFlags[j];
		if (farCold[j] | farHot[j]) bits |= BIT_TEMPERATURE_EXTRAPOLATED;
		if (f.quietestAtWorst[j] < view.minMeasuredA[j] / 10) bits |= BIT_CURRENT_EXTRAPOLATED;
		if (fault > view.ratedForwardA[j]) bits |= BIT_OVER_FORWARD_RATING;
		const over = result.reverseV > 0 && result.reverseV > view.ratedReverseV[j] - margin;
		if (over) bits |= BIT_OVER_REVERSE_RATING;
		result.catalogueFlags[j] = bits;
		if (over && !req.includeOverRating) {
			excluded.push(j);
			continue;
		}
		const judged = result.by === 'noise' ? noise : net;
		const fails = (bits & LIMIT_BITS) !== 0 || codes.some((c) => NODE_LIMIT_FLAGS.includes(c));
		const b = rankGroup(fails, view.given[j] === 1, judged.hasValue);
		bucket[j] = b;
		counts[b]++;
		key[j] = Math.abs(judged.value);
		tie[j] = Math.abs(result.by === 'noise' ? f.value.noiseTypical[j] : f.value.typical[j]);
		if (!judged.hasValue) key[j] = tie[j];
	}
	result.order = orderGroups(bucket, counts, GROUP_UNLISTED, () => key, tie, req.limit ?? Infinity, new Int32Array(n));
	result.excluded = Int32Array.from(excluded);
	for (let b = 0; b < RANK_GROUPS; b++) {
		result.ranked += counts[b];
		if ((b & GROUP_FAILS_LIMIT) === 0) result.meetingLimits += counts[b];
	}
}

function nullIfNaN(x: number): number | null {
	return Number.isNaN(x) ? null : x;
}

/** A page of a node ranking as plain objects. */
export function nodeRankRows(view: CatalogueView, result: NodeRankResult, offset = 0, limit = 50): NodeRankedPart[] {
	const f = result.figures;
	const ends = [result.coldC, result.hotC];
	const out: NodeRankedPart[] = [];
	for (let r = offset; r < Math.min(result.order.length, offset + limit); r++) {
		const j = result.order[r];
		const c = view.count[j];
		const k = result.factor[j];
		const hasBound = k === k && c >= 2;
		const bits = result.catalogueFlags[j];
		const nodeCodes = result.nodeFlags[j];
		const exc = result.excursionV;
		out.push({
			index: j,
			id: view.records[j].id,
			samples: c,
			evidence: view.given[j] === 1 ? 'given' : 'measured',
			netCurrentA: { typical: Math.abs(f.value.typical[j]), worst: Math.abs(f.value.worst[j]), bound: hasBound ? Math.abs(f.value.bound[j]) : null },
			worst: { netCurrentA: f.value.worst[j], signalV: f.signalV.worst[j], temperatureC: ends[f.end.worst[j]] },
			noiseA_rtHz: { typical: Math.sqrt(f.value.noiseTypical[j]), worst: Math.sqrt(f.value.noiseWorst[j]), bound: hasBound ? Math.sqrt(f.value.noiseBound[j]) : null },
			bound: hasBound ? { n: c, k, coverage: result.coverage, confidence: result.confidence } : null,
			excursionV: exc ? { cold: nullIfNaN(exc[0][j]), hot: nullIfNaN(exc[1][j]) } : null,
			flags: [...flagsFromBits(bits), ...nodeCodes.filter((x) => !flagsFromBits(bits).includes(x as FlagCode))],
			meetsLimits: (bits & LIMIT_BITS) === 0 && !nodeCodes.some((x) => NODE_LIMIT_FLAGS.includes(x))
		});
	}
	return out;
}

/**
 * One listed part's node in full (the curves for a chart, refined worst points, the sample
 * assignment): the positions with the part in every candidate one, for NodeCircuit.
 */
export function candidateCircuit(view: CatalogueView, req: Pick<NodeRankRequest, 'net' | 'positions'>, j: number, factor: number, constants: PhysicalConstants = SI_2019): NodeCircuit {
	const samples = view.records[j].samples;
	return new NodeCircuit(
		req.net,
		req.positions.map((p) =>
			p.fixed ? { ...p.fixed, anode: p.anode, cathode: p.cathode } : { anode: p.anode, cathode: p.cathode, samples, ...(factor === factor && samples.length >= 2 ? { boundFactor: factor } : {}) }
		),
		constants
	);
}

