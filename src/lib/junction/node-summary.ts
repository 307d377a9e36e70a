/**
 * A protected node's figures in one record: the evaluation over the signal range
 * (node-evaluate.ts), the error voltage across the source resistance, the fault excursion at
 * both temperature ends (fault.ts) and the node's flags against the stated limits
 * (node-limits.ts). The API, the screens and the network ranking all read this record.
 *
 * Limits are judged on a basis, as in the single-junction ranking (rank.ts): the net
 * current and noise on the statistical bound (default), the worst sample assignment or the
 * typical one; where the node has no bound, the worst assignment stands in. The fault
 * excursion is always the worst sample's, as the forward drop is there.
 */
import { faultExcursion, type FaultExcursion } from './fault';
import { NodeCircuit, DEFAULT_GRID_POINTS, type NodeEvaluation } from './node-evaluate';
import { nodeFlags, NODE_LIMIT_FLAGS, type NodeFlagCode, type NodeLimits } from './node-limits';
import { DEFAULT_BASIS, type RankBasis } from './operating-point';

/** The fault in one direction at both ends: worst and typical samples. */
export interface FaultAtEnds {
	direction: 'above' | 'below';
	/** Worst-sample excursion [V] at [cold, hot]; null where nothing clamps. */
	worst: [FaultExcursion, FaultExcursion];
	typical: [FaultExcursion, FaultExcursion];
}

export interface NodeSummary {
	evaluation: NodeEvaluation;
	/** |worst net current| × source resistance [V], or null without one; typical likewise. */
	errorVoltageV: number | null;
	typicalErrorVoltageV: number | null;
	/** The fault as stated, and the same current the other way; null without a fault current. */
	fault: FaultAtEnds | null;
	oppositeFault: FaultAtEnds | null;
	/** The net current and noise the limits were judged on (file header). */
	judged: Judged;
	flags: NodeFlagCode[];
	/** No limit flag is raised. */
	meetsLimits: boolean;
}

export interface Judged {
	basis: RankBasis;
	/** Whether the node has a value on the basis (false: no bound, the worst assignment stood in). */
	hasValue: boolean;
	/** Net current on the basis [A] (signed) and |it| × the source resistance [V] (null without one). */
	netCurrentA: number;
	errorVoltageV: number | null;
	/** Noise density on the basis [A/√Hz]. */
	noiseA_rtHz: number;
}

export interface NodeSummaryOptions {
	gridPoints?: number;
	sourceResistanceOhm?: number;
	/** Positive: driven into the node. */
	faultCurrentA?: number;
	limits?: NodeLimits;
	/** What the limits are judged on (default: the statistical bound). */
	basis?: RankBasis;
	/** Leave out the typical and the opposite fault (a ranking needs only the stated fault's worst). */
	brief?: boolean;
}

function faultAtEnds(circuit: NodeCircuit, currentA: number, brief = false): FaultAtEnds {
	const at = (end: 0 | 1, samples: 'worst' | 'typical') =>
		faultExcursion(circuit.net, circuit.positions, circuit.positions.map((_, p) => circuit.scaledAt(end, p)), currentA, samples);
	const worst: [FaultExcursion, FaultExcursion] = [at(0, 'worst'), at(1, 'worst')];
	return { direction: currentA > 0 ? 'above' : 'below', worst, typical: brief ? worst : [at(0, 'typical'), at(1, 'typical')] };
}

/** The net current and noise on the basis, the worst assignment standing in for a missing bound. */
function judgedOf(ev: NodeEvaluation, basis: RankBasis, rs: number | undefined): Judged {
	const hasValue = basis !== 'bound' || ev.bound !== null;
	const net = basis === 'typical' ? ev.typical.netCurrentA : basis === 'bound' && ev.bound ? ev.bound.netCurrentA : ev.worst.netCurrentA;
	const noise = basis === 'typical' ? ev.noise.typical : basis === 'bound' && ev.noise.bound ? ev.noise.bound : ev.noise.worst;
	return { basis, hasValue, netCurrentA: net, errorVoltageV: rs === undefined ? null : Math.abs(net) * rs, noiseA_rtHz: noise.densityA_rtHz };
}

/** Every figure of a node (file header). @throws RangeError / NodeError as NodeCircuit.evaluate. */
export function summarizeNode(circuit: NodeCircuit, options: NodeSummaryOptions = {}): NodeSummary {
	const evaluation = circuit.evaluate(options.gridPoints ?? DEFAULT_GRID_POINTS);
	const rs = options.sourceResistanceOhm;
	const errorVoltageV = rs === undefined ? null : Math.abs(evaluation.worst.netCurrentA) * rs;
	const typicalErrorVoltageV = rs === undefined ? null : Math.abs(evaluation.typical.netCurrentA) * rs;
	const i = options.faultCurrentA;
	const fault = i === undefined ? null : faultAtEnds(circuit, i, options.brief);
	const oppositeFault = i === undefined || options.brief ? null : faultAtEnds(circuit, -i);
	const judged = judgedOf(evaluation, options.basis ?? DEFAULT_BASIS, rs);
	const flags = nodeFlags(
		{
			worstNetA: judged.netCurrentA,
			errorVoltageV: judged.errorVoltageV,
			noiseA_rtHz: judged.noiseA_rtHz,
			excursionV: fault ? [fault.worst[0].excursionV, fault.worst[1].excursionV] : null,
			forwardNvt: circuit.largestForwardBias(),
			hotC: evaluation.hotC
		},
		options.limits ?? {},
		rs,
		circuit.constants
	);
	return { evaluation, errorVoltageV, typicalErrorVoltageV, fault, oppositeFault, judged, flags, meetsLimits: !flags.some((f) => NODE_LIMIT_FLAGS.includes(f)) };
}
