/**
 * POST /api/v1/node/rank: a protected node whose positions marked `candidate: true` take
 * every catalogue part in turn (the same part in each), ranked like POST /api/v1/rank.
 * Request and item shapes, shared by the endpoint and the node screen.
 */
import { z } from 'zod';
import { NODE_RANK_BY, type NodeRankBy } from '$lib/junction/node-rank';
import { checkCandidates, checkNode, nodeFields } from './node';
import { MAX_RANK_LIMIT, operatingPointSchema, type RankItem } from './rank';

const op = operatingPointSchema.shape;
/** How many of the leading items may carry their curves. */
const MAX_RANK_CURVES = 5;

export const nodeRankRequestSchema = nodeFields
	.extend({
		/** The catalogue filters of POST /api/v1/rank, for the candidates. */
		kinds: op.kinds,
		q: op.q,
		packages: op.packages,
		lifecycles: op.lifecycles,
		reverseMarginV: op.reverseMarginV,
		includeOverRating: op.includeOverRating,
		/** Order by the net current (and with it the error voltage) or by the noise. */
		by: z.enum(NODE_RANK_BY, { error: 'by must be "net" (net current and error voltage) or "noise"' }).optional(),
		limit: z.number().int().min(1).max(MAX_RANK_LIMIT, `limit must be at most ${MAX_RANK_LIMIT}`).optional(),
		/** The net current against the signal at both ends for the first this-many items. */
		withCurves: z.number().int().min(0).max(MAX_RANK_CURVES, `withCurves must be at most ${MAX_RANK_CURVES}`).optional()
	})
	.strict()
	.superRefine((n, ctx) => {
		checkNode(n, ctx);
		checkCandidates(n.junctions, ctx);
	});
export type NodeRankRequestBody = z.infer<typeof nodeRankRequestSchema>;

/** One point of a candidate's curve: typical and worst-assignment net current at both ends [V, A]. */
export type NodeCurvePoint = { signalV: number; netCurrentA: { cold: number; hot: number }; worstA: { cold: number; hot: number } };

/**
 * A part in the node, with the fields of POST /api/v1/rank's items in the node's meaning:
 * `leakageA` is the |net node current| (typical, worst assignment, bound), `forwardDropV`
 * the fault excursion beyond the clamping terminal (the conducting clamp's forward drop at
 * the fault current; worst sample), `reverseMarginV` the rating less the largest reverse
 * bias a candidate position sees, `errorVoltageV` the worst |net current| times the source
 * resistance. Node figures besides: where the worst lies and its sign, the noise.
 */
export type NodeRankItem = Omit<RankItem, 'model' | 'sampleLeakage'> & {
	netCurrentA: { typical: number; worst: number; bound: number | null };
	worst: { netCurrentA: number; signalV: number; temperatureC: number };
	excursionV: { cold: number | null; hot: number | null } | null;
	/** With `withCurves`, for the leading items. */
	curve?: NodeCurvePoint[];
};

export type NodeRankResponse = {
	items: NodeRankItem[];
	/** Parts evaluated (matching the filters), and of those left out for their reverse rating. */
	evaluated: number;
	excludedOverRating: number;
	hotC: number;
	coldC: number;
	/** The largest reverse bias a candidate position sees over the signal range [V]. */
	reverseV: number;
	/** The net-current limit used, given directly or as allowed error ÷ source resistance [A]. */
	leakageBudgetA: number | null;
	basis: 'bound' | 'worst' | 'typical';
	coverage: number;
	confidence: number;
	by: NodeRankBy;
};
