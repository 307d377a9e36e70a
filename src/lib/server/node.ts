/**
 * The protected node over HTTP: a request's junctions resolved into engine positions (a
 * catalogue part's measured samples from the in-memory model cache, or an inline model),
 * evaluated by the engine (src/lib/junction/node-summary.ts) and written in the API's shape.
 */
import {
	createModel,
	DEFAULT_CONFIDENCE,
	DEFAULT_COVERAGE,
	NodeCircuit,
	toleranceFactor,
	NodeError,
	NOISE_APPROXIMATION_NOTE,
	summarizeNode,
	type FaultAtEnds,
	type NodePosition,
	type NodeSummary
} from '$lib/junction';
import {
	networkOf,
	type FaultOut,
	type NodeEntryPrediction,
	type NodeJunctionInput,
	type NodeRequest,
	type NodeRequirement,
	type NodeResponse
} from '$lib/schemas/node';
import { fieldsFromNode, queryFromFields } from '$lib/node/node-fields';
import { DomainError } from './errors';
import { modelCache, type CacheSnapshot, type CachedPart } from './model-cache';

/** An engine position with the part it came from (null for an inline model or an empty candidate slot). */
export type ResolvedPosition = NodePosition & { part: CachedPart | null; label: string | null };

type NodeShape = Omit<NodeRequest, 'junctions'> & { junctions: NodeJunctionInput[] };

/** The bound's coverage and confidence a node asks for, defaults filled in. */
export function judgementTerms(node: { coverage?: number; confidence?: number }): { coverage: number; confidence: number } {
	return { coverage: node.coverage ?? DEFAULT_COVERAGE, confidence: node.confidence ?? DEFAULT_CONFIDENCE };
}

/** A catalogue part's position: its samples, with the tolerance factor when they are two or more measured ones. */
function partPosition(part: CachedPart, terms: { coverage: number; confidence: number }): Pick<NodePosition, 'samples' | 'boundFactor'> {
	const samples = part.record.samples;
	const measured = part.evidence === 'measured' && samples.length >= 2;
	return { samples, ...(measured ? { boundFactor: toleranceFactor(samples.length, terms.coverage, terms.confidence) } : {}) };
}

/**
 * Engine positions for a request's junctions; candidate positions take `candidate`.
 * @throws DomainError 422 naming the junction whose part is unknown or whose model is unusable.
 */
function resolvePositions(
	junctions: NodeJunctionInput[],
	snap: CacheSnapshot,
	candidate?: CachedPart,
	terms: { coverage: number; confidence: number } = judgementTerms({})
): ResolvedPosition[] {
	return junctions.map((j, i) => {
		if (!j.candidate) return resolveJunction(j, i, snap, terms);
		if (!candidate) throw new DomainError(422, `junctions[${i}] is a candidate position, with no part to fill it.`, [{ path: `junctions.${i}`, message: 'No part.' }]);
		return { anode: j.anode, cathode: j.cathode, label: j.label ?? null, ...partPosition(candidate, terms), part: candidate };
	});
}

/**
 * The engine position of a junction that names its part (`id`) or carries an inline model; `i` is its index in the request.
 * @throws DomainError 422 naming the junction whose part is unknown or whose model is unusable.
 */
export function resolveJunction(j: NodeJunctionInput, i: number, snap: CacheSnapshot, terms: { coverage: number; confidence: number }): ResolvedPosition {
	const base = { anode: j.anode, cathode: j.cathode, label: j.label ?? null };
	if (j.id !== undefined) {
		const k = snap.indexOf.get(j.id);
		if (k === undefined)
			throw new DomainError(422, `junctions[${i}]: the catalogue has no part ${j.id} with a usable model.`, [{ path: `junctions.${i}.id`, message: `No part ${j.id} with a usable model.` }]);
		const part = snap.parts[k];
		return { ...base, ...partPosition(part, terms), part };
	}
	try {
		const { material, ...params } = j.model!;
		return { ...base, samples: [createModel(params, material)], part: null };
	} catch (e) {
		const message = (e as Error).message;
		throw new DomainError(422, `junctions[${i}]: the model is not usable: ${message}.`, [{ path: `junctions.${i}.model`, message }]);
	}
}

/** The engine's circuit for a node and its positions. @throws DomainError 422 for what the engine refuses. */
function circuitOf(node: NodeShape, positions: ResolvedPosition[]): NodeCircuit {
	try {
		return new NodeCircuit(networkOf(node), positions);
	} catch (e) {
		if (e instanceof NodeError) throw new DomainError(422, e.message, e.issues);
		if (e instanceof RangeError) throw new DomainError(422, `The node cannot be evaluated: ${e.message}.`);
		throw e;
	}
}

/** A node's figures against its own limits. */
function summaryOf(node: NodeShape, circuit: NodeCircuit, gridPoints?: number): NodeSummary {
	return summarizeNode(circuit, {
		gridPoints: gridPoints ?? node.gridPoints,
		...(node.sourceResistanceOhm !== undefined ? { sourceResistanceOhm: node.sourceResistanceOhm } : {}),
		...(node.faultCurrentA !== undefined ? { faultCurrentA: node.faultCurrentA } : {}),
		...(node.basis !== undefined ? { basis: node.basis } : {}),
		limits: {
			...(node.maxNetCurrentA !== undefined ? { maxNetCurrentA: node.maxNetCurrentA } : {}),
			...(node.allowedErrorV !== undefined ? { allowedErrorV: node.allowedErrorV } : {}),
			...(node.maxNoiseA_rtHz !== undefined ? { maxNoiseA_rtHz: node.maxNoiseA_rtHz } : {}),
			...(node.maxExcursionV !== undefined ? { maxExcursionV: node.maxExcursionV } : {})
		}
	});
}

function faultOut(f: FaultAtEnds): FaultOut {
	return {
		direction: f.direction,
		excursionV: { cold: f.worst[0].excursionV, hot: f.worst[1].excursionV },
		typicalV: { cold: f.typical[0].excursionV, hot: f.typical[1].excursionV },
		clampedTo: f.worst[1].clampedTo ?? f.worst[0].clampedTo,
		nodeV: { cold: f.worst[0].nodeV, hot: f.worst[1].nodeV }
	};
}

/** The API's answer for a summary (NodeResponse in $lib/schemas/node). */
function nodeResponse(s: NodeSummary, positions: ResolvedPosition[], terms: { coverage: number; confidence: number }): NodeResponse {
	const ev = s.evaluation;
	return {
		worst: {
			netCurrentA: ev.worst.netCurrentA,
			signalV: ev.worst.signalV,
			temperatureC: ev.worst.temperatureC,
			samples: ev.worst.samples.map((sample, position) => ({ position, sample }))
		},
		typical: { ...ev.typical },
		bound: ev.bound ? { ...ev.bound } : null,
		basis: s.judged.basis,
		hasValueOnBasis: s.judged.hasValue,
		...terms,
		errorVoltageV: s.errorVoltageV,
		typicalErrorVoltageV: s.typicalErrorVoltageV,
		noise: {
			densityA_rtHz: ev.noise.worst.densityA_rtHz,
			signalV: ev.noise.worst.signalV,
			temperatureC: ev.noise.worst.temperatureC,
			typicalA_rtHz: ev.noise.typical.densityA_rtHz,
			boundA_rtHz: ev.noise.bound?.densityA_rtHz ?? null,
			approximate: ev.noise.approximate,
			note: NOISE_APPROXIMATION_NOTE
		},
		fault: s.fault && s.oppositeFault ? { ...faultOut(s.fault), opposite: faultOut(s.oppositeFault) } : null,
		curve: Array.from(ev.signalV, (signalV, i) => ({
			signalV,
			netCurrentA: { cold: ev.typicalA[0][i], hot: ev.typicalA[1][i] },
			worstA: { cold: ev.worstA[0][i], hot: ev.worstA[1][i] },
			boundA: ev.bound ? { cold: ev.boundA[0][i], hot: ev.boundA[1][i] } : null
		})),
		junctions: positions.map((p, position) => ({
			position,
			label: p.label,
			anode: p.anode,
			cathode: p.cathode,
			id: p.part?.id ?? null,
			partNumber: p.part?.partNumber ?? null,
			samples: p.samples.length,
			biasRangeV: ev.positions[position].biasRangeV,
			currentAtWorstA: ev.positions[position].currentA,
			noiseA_rtHz: ev.positions[position].noiseA_rtHz
		})),
		coldC: ev.coldC,
		hotC: ev.hotC,
		flags: s.flags,
		meetsLimits: s.meetsLimits
	};
}

/** POST /api/v1/node: a node whose junctions are all given. */
export async function evaluateNode(req: NodeRequest): Promise<NodeResponse> {
	const snap = (await modelCache()).snapshot;
	const terms = judgementTerms(req);
	const positions = resolvePositions(req.junctions, snap, undefined, terms);
	return nodeResponse(summaryOf(req, circuitOf(req, positions)), positions, terms);
}

/** The figures a saved node gives one part (NodeEntryPrediction in $lib/schemas/node). */
function entryPrediction(s: NodeSummary): NodeEntryPrediction {
	const ev = s.evaluation;
	return {
		netCurrentA: { worst: ev.worst.netCurrentA, typical: ev.typical.netCurrentA },
		signalV: ev.worst.signalV,
		temperatureC: ev.worst.temperatureC,
		errorVoltageV: s.errorVoltageV,
		noiseA_rtHz: ev.noise.worst.densityA_rtHz,
		excursionV: s.fault ? { cold: s.fault.worst[0].excursionV, hot: s.fault.worst[1].excursionV } : null,
		flags: s.flags,
		meetsLimits: s.meetsLimits
	};
}

/**
 * Each named part judged in a saved node, every candidate position holding it, from one cache
 * snapshot. Parts without a usable model are absent; so is every part when a fixed position's
 * part has gone from the catalogue (the node cannot be evaluated then).
 */
export function predictNode(node: NodeRequirement, partIds: number[], snap: CacheSnapshot): Map<number, NodeEntryPrediction> {
	const out = new Map<number, NodeEntryPrediction>();
	for (const id of new Set(partIds)) {
		const k = snap.indexOf.get(id);
		if (k === undefined) continue;
		try {
			const positions = resolvePositions(node.junctions, snap, snap.parts[k], judgementTerms(node));
			out.set(id, entryPrediction(summaryOf(node, circuitOf(node, positions))));
		} catch (e) {
			if (e instanceof DomainError) continue;
			throw e;
		}
	}
	return out;
}

/** The screen link of a saved node: /node with its fields (fixed parts by their part numbers). */
export async function nodeScreenHref(node: NodeRequirement): Promise<string> {
	const snap = (await modelCache()).snapshot;
	const numberOf = (id: number) => {
		const k = snap.indexOf.get(id);
		return k === undefined ? `#${id}` : snap.parts[k].partNumber;
	};
	return `/node?${queryFromFields(fieldsFromNode(node, numberOf))}`;
}
