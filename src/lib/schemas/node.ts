/**
 * Request and response shapes of the protected node (volts, amperes, ohms, °C, A/√Hz):
 * POST /api/v1/node evaluates a node whose junctions are all given; POST /api/v1/node/rank
 * fills the positions marked `candidate` with every catalogue part in turn. Also the node as
 * a project's requirement. Shared by the endpoints, the node screen and the project code.
 */
import { z } from 'zod';
import { MATERIALS } from '$lib/junction/names';
import {
	DEFAULT_GRID_POINTS,
	GUARD,
	MAX_GRID_POINTS,
	MAX_POSITIONS,
	MAX_RAILS,
	MIN_GRID_POINTS,
	NODE,
	networkIssues,
	biasRange,
	type NodeNetwork
} from '$lib/junction';
import { NODE_FLAG_WORDS, type NodeFlagCode } from '$lib/junction/node-limits';
import { FLAG_WORDS, operatingPointSchema, spiceModelSchema } from './rank';
import { MAX_ID } from '../../params/id';

const ABS_ZERO_C = -273.15;
const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);
const volts = (what: string) => finite(what).refine((v) => Math.abs(v) <= 10_000, `${what} must be within ±10 kV`);
const positive = (what: string) => finite(what).refine((v) => v > 0, `${what} must be greater than zero`);
const celsius = (what: string) => finite(what).refine((v) => v > ABS_ZERO_C && v < 1000, `${what} must lie between absolute zero and 1000 °C`);
const terminal = (what: string) => z.string({ error: `${what} must be "node", "guard" or a rail's name` }).trim().min(1).max(16);

/** An inline junction model: SPICE names, and the material its EG/XTI defaults come from. */
const nodeModelSchema = spiceModelSchema.extend({ material: z.enum(MATERIALS).optional() }).strict();

const nodeJunctionSchema = z
	.object({
		/** A catalogue part (all its measured samples). */
		id: z.number().int().positive().max(MAX_ID, 'No part has that id.').optional(),
		/** Or an inline model (one sample). */
		model: nodeModelSchema.optional(),
		anode: terminal('anode'),
		cathode: terminal('cathode'),
		/** In a ranking, this position takes each catalogue part in turn. */
		candidate: z.boolean().optional(),
		/** A name for the position on screens (D1, "upper clamp"). */
		label: z.string().trim().max(40).optional()
	})
	.strict();
export type NodeJunctionInput = z.infer<typeof nodeJunctionSchema>;

/** The node without its junctions' part choices checked (that depends on the endpoint). */
const nodeFields = z
	.object({
		rails: z.record(z.string(), volts('rail voltage')).default({}),
		guard: z.object({ offsetV: volts('guard.offsetV') }).strict().optional(),
		signalRangeV: z.tuple([volts('signalRangeV[0]'), volts('signalRangeV[1]')]),
		temperatureC: celsius('temperatureC').optional(),
		temperatureRangeC: z.tuple([celsius('temperatureRangeC[0]'), celsius('temperatureRangeC[1]')]).optional(),
		sourceResistanceOhm: positive('sourceResistanceOhm').optional(),
		/** Positive: driven into the node; negative: drawn out of it. */
		faultCurrentA: finite('faultCurrentA').refine((v) => v !== 0 && Math.abs(v) <= 100, 'faultCurrentA must be non-zero and at most 100 A').optional(),
		junctions: z.array(nodeJunctionSchema).min(1, 'Place at least one junction.').max(MAX_POSITIONS, `At most ${MAX_POSITIONS} junctions.`),
		gridPoints: z.number().int().min(MIN_GRID_POINTS).max(MAX_GRID_POINTS, `gridPoints must be at most ${MAX_GRID_POINTS}`).optional(),
		maxNetCurrentA: positive('maxNetCurrentA').optional(),
		allowedErrorV: positive('allowedErrorV').optional(),
		maxNoiseA_rtHz: positive('maxNoiseA_rtHz').optional(),
		maxExcursionV: positive('maxExcursionV').optional(),
		/** What the limits are judged on, and the statistical bound's terms: as in POST /api/v1/rank. */
		basis: operatingPointSchema.shape.basis,
		coverage: operatingPointSchema.shape.coverage,
		confidence: operatingPointSchema.shape.confidence
	})
	.strict();

type NodeFields = z.infer<typeof nodeFields>;

/** The engine's network for a request (temperatures as [cold, hot]). */
export function networkOf(n: Pick<NodeFields, 'rails' | 'guard' | 'signalRangeV' | 'temperatureC' | 'temperatureRangeC'>): NodeNetwork {
	const t = n.temperatureRangeC ?? [n.temperatureC ?? 25, n.temperatureC ?? 25];
	return {
		rails: n.rails,
		...(n.guard ? { guardOffsetV: n.guard.offsetV } : {}),
		signalRangeV: n.signalRangeV,
		temperatureRangeC: [t[0], t[1]]
	};
}

/** The checks every node shares: temperatures, the limits' companions, the network's rules. */
export function checkNode(n: NodeFields, ctx: z.RefinementCtx): void {
	if ((n.temperatureC === undefined) === (n.temperatureRangeC === undefined))
		ctx.addIssue({ code: 'custom', path: ['temperatureC'], message: 'Give either temperatureC or temperatureRangeC: [cold, hot], not both and not neither.' });
	if (n.temperatureRangeC && n.temperatureRangeC[0] > n.temperatureRangeC[1])
		ctx.addIssue({ code: 'custom', path: ['temperatureRangeC'], message: 'temperatureRangeC must be [cold, hot] with cold ≤ hot.' });
	if (n.signalRangeV[0] > n.signalRangeV[1])
		ctx.addIssue({ code: 'custom', path: ['signalRangeV'], message: 'signalRangeV must be [low, high] with low ≤ high.' });
	if (n.allowedErrorV !== undefined && n.sourceResistanceOhm === undefined)
		ctx.addIssue({ code: 'custom', path: ['allowedErrorV'], message: 'An allowed error voltage needs sourceResistanceOhm to turn it into a current.' });
	if (n.maxExcursionV !== undefined && n.faultCurrentA === undefined)
		ctx.addIssue({ code: 'custom', path: ['maxExcursionV'], message: 'A fault-excursion limit needs the fault current it applies at (faultCurrentA).' });
	const net = networkOf(n);
	// Ranges already reported above; the engine's own rules cover rails, terminals and placements.
	for (const issue of networkIssues(net, n.junctions))
		if (issue.path !== 'signalRangeV' && issue.path !== 'temperatureRangeC') ctx.addIssue({ code: 'custom', path: issue.path.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)), message: issue.message });
}

/** POST /api/v1/node: every junction a catalogue part (`id`) or an inline `model`, none a candidate. */
export const nodeRequestSchema = nodeFields.superRefine((n, ctx) => {
	checkNode(n, ctx);
	n.junctions.forEach((j, i) => {
		if (j.candidate) ctx.addIssue({ code: 'custom', path: ['junctions', i, 'candidate'], message: 'This endpoint evaluates given junctions; rank candidates with POST /api/v1/node/rank.' });
		else if ((j.id === undefined) === (j.model === undefined))
			ctx.addIssue({ code: 'custom', path: ['junctions', i], message: 'Give the junction a catalogue part (id) or a model, not both and not neither.' });
	});
});
export type NodeRequest = z.infer<typeof nodeRequestSchema>;

/** Candidate positions take no part of their own; the others need one, as in nodeRequestSchema. */
export function checkCandidates(junctions: NodeJunctionInput[], ctx: z.RefinementCtx): void {
	if (!junctions.some((j) => j.candidate)) ctx.addIssue({ code: 'custom', path: ['junctions'], message: 'Mark at least one position candidate: true to rank parts in it.' });
	junctions.forEach((j, i) => {
		if (j.candidate && (j.id !== undefined || j.model !== undefined))
			ctx.addIssue({ code: 'custom', path: ['junctions', i], message: 'A candidate position takes each catalogue part in turn: leave out id and model.' });
		else if (!j.candidate && (j.id === undefined) === (j.model === undefined))
			ctx.addIssue({ code: 'custom', path: ['junctions', i], message: 'Give the junction a catalogue part (id) or a model, or mark it candidate: true.' });
	});
}

/**
 * A node as a project's requirement: the ranking's node (candidate positions and parts by id;
 * no inline models, so a stored requirement always names parts the catalogue keeps).
 */
export const nodeRequirementSchema = nodeFields.superRefine((n, ctx) => {
	checkNode(n, ctx);
	checkCandidates(n.junctions, ctx);
	n.junctions.forEach((j, i) => {
		if (j.model !== undefined) ctx.addIssue({ code: 'custom', path: ['junctions', i, 'model'], message: 'A saved node names catalogue parts (id) or candidate positions, not inline models.' });
	});
});
export type NodeRequirement = z.infer<typeof nodeRequirementSchema>;

export { nodeFields, DEFAULT_GRID_POINTS, NODE, GUARD, MAX_RAILS };

/** Where a node's net current is worst. */
export type NodeWorstOut = {
	netCurrentA: number;
	signalV: number;
	temperatureC: number;
	/** The sample each position takes to reach it (its index among the part's samples). */
	samples?: { position: number; sample: number; unit?: string }[];
};

export type FaultOut = {
	direction: 'above' | 'below';
	/** Worst sample: how far beyond the clamping terminal [V]; null where nothing clamps. */
	excursionV: { cold: number | null; hot: number | null };
	typicalV: { cold: number | null; hot: number | null };
	clampedTo: string | null;
	/** Node voltage with the fault at the hot end [V]. */
	nodeV: { cold: number | null; hot: number | null };
};

export type NodeJunctionOut = {
	position: number;
	label: string | null;
	anode: string;
	cathode: string;
	id: number | null;
	partNumber: string | null;
	samples: number;
	biasRangeV: [number, number];
	/** Current leaving the node through it at the worst point, worst assignment [A]. */
	currentAtWorstA: number;
	/** Its noise density at the worst-noise point [A/√Hz]. */
	noiseA_rtHz: number;
};

export type NodeResponse = {
	worst: NodeWorstOut;
	typical: NodeWorstOut;
	/**
	 * The net current with each catalogue part's position at its one-sided tolerance limits
	 * (coverage and confidence as asked); null when no position holds two or more measured samples.
	 */
	bound: NodeWorstOut | null;
	/** The basis the limits were judged on, whether the node had a value on it (else the worst stood in), and the bound's terms. */
	basis: 'bound' | 'worst' | 'typical';
	hasValueOnBasis: boolean;
	coverage: number;
	confidence: number;
	/** |worst net current| × source resistance [V]; null without one. */
	errorVoltageV: number | null;
	typicalErrorVoltageV: number | null;
	noise: {
		densityA_rtHz: number;
		signalV: number;
		temperatureC: number;
		typicalA_rtHz: number;
		/** On the statistical bound (null as for `bound`). */
		boundA_rtHz: number | null;
		/** True when a junction has N > 1, where the shot-noise form is an approximation near zero bias. */
		approximate: boolean;
		note: string;
	};
	/** The fault as stated (and, in `opposite`, the same current the other way); null without a fault current. */
	fault: (FaultOut & { opposite: FaultOut }) | null;
	/** Typical net current (`netCurrentA`), worst assignment and bound (null without one) at each grid point. */
	curve: { signalV: number; netCurrentA: { cold: number; hot: number }; worstA: { cold: number; hot: number }; boundA: { cold: number; hot: number } | null }[];
	junctions: NodeJunctionOut[];
	coldC: number;
	hotC: number;
	flags: string[];
	meetsLimits: boolean;
};

export type NodeFlag = NodeFlagCode;

/** A part judged in a saved node (the project's requirement), every candidate position holding it. */
export type NodeEntryPrediction = {
	/** Worst |net current| and typical, with where the worst lies [A, V, °C]. */
	netCurrentA: { worst: number; typical: number };
	signalV: number;
	temperatureC: number;
	errorVoltageV: number | null;
	noiseA_rtHz: number;
	/** Worst-sample fault excursion at [cold, hot] as stated, or null without a fault current. */
	excursionV: { cold: number | null; hot: number | null } | null;
	flags: string[];
	meetsLimits: boolean;
};

/** Whether a node states any limit a part can meet or miss (a fault current counts: it must be clamped). */
export function nodeHasLimits(n: NodeRequirement): boolean {
	return (
		n.maxNetCurrentA !== undefined ||
		n.allowedErrorV !== undefined ||
		n.maxNoiseA_rtHz !== undefined ||
		n.maxExcursionV !== undefined ||
		n.faultCurrentA !== undefined
	);
}

/**
 * The single-junction operating point a node implies, for a project created from it: the
 * most reverse bias any candidate position sees over the signal range (where a clamp leaks
 * most), the node's temperatures and source resistance, the fault current as the clamp
 * current and the excursion limit as the forward-drop limit.
 */
export function operatingPointOfNode(n: NodeRequirement): {
	biasV: number;
	temperatureC?: number;
	temperatureRangeC?: [number, number];
	clampCurrentA?: number;
	maxForwardDropV?: number;
	sourceResistanceOhm?: number;
} {
	const net = networkOf(n);
	const candidates = n.junctions.filter((j) => j.candidate);
	const biasV = Math.min(...(candidates.length ? candidates : n.junctions).map((j) => biasRange(net, j)[0]));
	return {
		biasV,
		...(n.temperatureRangeC ? { temperatureRangeC: n.temperatureRangeC } : { temperatureC: n.temperatureC ?? 25 }),
		...(n.faultCurrentA !== undefined ? { clampCurrentA: Math.abs(n.faultCurrentA) } : {}),
		...(n.faultCurrentA !== undefined && n.maxExcursionV !== undefined ? { maxForwardDropV: n.maxExcursionV } : {}),
		...(n.sourceResistanceOhm !== undefined ? { sourceResistanceOhm: n.sourceResistanceOhm } : {})
	};
}

/** Words for any flag a ranking or a node raises: the catalogue's (rank) or the node's own. */
export function flagText(code: string): { short: string; long: string; caution: boolean } {
	return (NODE_FLAG_WORDS as Record<string, { short: string; long: string; caution: boolean }>)[code] ?? (FLAG_WORDS as Record<string, { short: string; long: string; caution: boolean }>)[code] ?? { short: code, long: code, caution: false };
}
