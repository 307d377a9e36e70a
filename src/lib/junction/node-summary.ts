/**
 * A protected node's figures in one record: the evaluation over the signal range
 * (node-evaluate.ts), the error voltage across the source resistance, the fault excursion at
 * both temperature ends (fault.ts) and the node's flags against the stated limits
 * (node-limits.ts). The API, the screens and the network ranking all read this record.
 */
import { faultExcursion, type FaultExcursion } from './fault';
import { NodeCircuit, DEFAULT_GRID_POINTS, type NodeEvaluation } from './node-evaluate';
import { nodeFlags, NODE_LIMIT_FLAGS, type NodeFlagCode, type NodeLimits } from './node-limits';

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
	flags: NodeFlagCode[];
	/** No limit flag is raised. */
	meetsLimits: boolean;
}

export interface NodeSummaryOptions {
	gridPoints?: number;
	sourceResistanceOhm?: number;
	/** Positive: driven into the node. */
	faultCurrentA?: number;
	limits?: NodeLimits;
}

function faultAtEnds(circuit: NodeCircuit, currentA: number): FaultAtEnds {
	const at = (end: 0 | 1, samples: 'worst' | 'typical') =>
		faultExcursion(circuit.net, circuit.positions, circuit.positions.map((_, p) => circuit.scaledAt(end, p)), currentA, samples);
	return {
		direction: currentA > 0 ? 'above' : 'below',
		worst: [at(0, 'worst'), at(1, 'worst')],
		typical: [at(0, 'typical'), at(1, 'typical')]
	};
}

/** Every figure of a node (file header). @throws RangeError / NodeError as NodeCircuit.evaluate. */
export function summarizeNode(circuit: NodeCircuit, options: NodeSummaryOptions = {}): NodeSummary {
	const evaluation = circuit.evaluate(options.gridPoints ?? DEFAULT_GRID_POINTS);
	const rs = options.sourceResistanceOhm;
	const errorVoltageV = rs === undefined ? null : Math.abs(evaluation.worst.netCurrentA) * rs;
	const typicalErrorVoltageV = rs === undefined ? null : Math.abs(evaluation.typical.netCurrentA) * rs;
	const i = options.faultCurrentA;
	const fault = i === undefined ? null : faultAtEnds(circuit, i);
	const oppositeFault = i === undefined ? null : faultAtEnds(circuit, -i);
	const flags = nodeFlags(
		{
			worstNetA: evaluation.worst.netCurrentA,
			errorVoltageV,
			noiseA_rtHz: evaluation.noise.worst.densityA_rtHz,
			excursionV: fault ? [fault.worst[0].excursionV, fault.worst[1].excursionV] : null,
			forwardNvt: circuit.largestForwardBias(),
			hotC: evaluation.hotC
		},
		options.limits ?? {},
		rs,
		circuit.constants
	);
	return { evaluation, errorVoltageV, typicalErrorVoltageV, fault, oppositeFault, flags, meetsLimits: !flags.some((f) => NODE_LIMIT_FLAGS.includes(f)) };
}
