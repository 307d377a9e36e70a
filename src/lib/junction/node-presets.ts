/**
 * Starting points for the common protection networks of a high-impedance input. Each is a
 * complete node a designer then edits: rails, guard, ranges and where the junctions sit.
 * The numbers are typical of an electrometer or pH input (common practice, not a standard).
 */
import type { Placement } from './node';

export const NODE_PRESET_KEYS = ['rail-pair', 'guard-pair', 'guard-clamp', 'reference-clamp'] as const;
export type NodePresetKey = (typeof NODE_PRESET_KEYS)[number];

export interface NodePreset {
	key: NodePresetKey;
	name: string;
	/** One sentence on what the network does and when it is used. */
	summary: string;
	rails: Record<string, number>;
	guardOffsetV?: number;
	signalRangeV: [number, number];
	temperatureRangeC: [number, number];
	sourceResistanceOhm?: number;
	/** Positive: driven into the node; negative: drawn out of it. */
	faultCurrentA?: number;
	junctions: Placement[];
}

export const NODE_PRESETS: Readonly<Record<NodePresetKey, NodePreset>> = {
	'rail-pair': {
		key: 'rail-pair',
		name: 'Pair to the rails',
		summary:
			'One junction from the node up to the positive rail and one from the negative rail up to the node: a fault either way is clamped a forward drop beyond a rail. Both are reverse-biased across the signal range, so their leakages partly cancel.',
		rails: { VPOS: 5, VNEG: -5 },
		signalRangeV: [-2, 2],
		temperatureRangeC: [0, 70],
		sourceResistanceOhm: 1e9,
		faultCurrentA: 10e-3,
		junctions: [
			{ anode: 'node', cathode: 'VPOS' },
			{ anode: 'VNEG', cathode: 'node' }
		]
	},
	'guard-pair': {
		key: 'guard-pair',
		name: 'Back-to-back to the guard',
		summary:
			'Two junctions in opposite directions between the node and a guard driven at the signal: each sees only the buffer’s offset, so it leaks about G0 times that offset.',
		rails: {},
		guardOffsetV: 1e-3,
		signalRangeV: [-1, 1],
		temperatureRangeC: [0, 70],
		sourceResistanceOhm: 1e9,
		faultCurrentA: 1e-3,
		junctions: [
			{ anode: 'node', cathode: 'guard' },
			{ anode: 'guard', cathode: 'node' }
		]
	},
	'guard-clamp': {
		key: 'guard-clamp',
		name: 'One clamp to the guard',
		summary:
			'A single junction from the node to the guard, the buffer’s offset across it: it clamps a fault that drives the node up, and leaks in one direction only.',
		rails: {},
		guardOffsetV: 1e-3,
		signalRangeV: [-1, 1],
		temperatureRangeC: [0, 70],
		sourceResistanceOhm: 1e9,
		faultCurrentA: 1e-3,
		junctions: [{ anode: 'node', cathode: 'guard' }]
	},
	'reference-clamp': {
		key: 'reference-clamp',
		name: 'One clamp to a reference',
		summary:
			'A single junction from a fixed reference up to the node: it stops the node going more than a forward drop below the reference, reverse-biased by the signal above it.',
		rails: { REF: 0 },
		signalRangeV: [0, 2],
		temperatureRangeC: [0, 70],
		sourceResistanceOhm: 1e9,
		faultCurrentA: -10e-3,
		junctions: [{ anode: 'REF', cathode: 'node' }]
	}
};
