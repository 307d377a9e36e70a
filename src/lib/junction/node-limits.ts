/**
 * What a designer may require of a protected node, and the node's own flags: limits it does
 * not meet, a fault nothing clamps, a junction the signal range turns on, an error voltage too
 * large for the node to be taken at the signal voltage. Flags about the parts themselves
 * (extrapolation, light, fit quality …) are the catalogue ranking's (rank.ts).
 */
import { thermalVoltage, celsiusToKelvin, SI_2019, type PhysicalConstants } from './constants';
import { FLAG_WORDS } from './rank-flags';

export interface NodeLimits {
	/** Largest allowed worst |net node current| [A]. */
	maxNetCurrentA?: number;
	/** Largest allowed error voltage across the source resistance [V] (needs the resistance). */
	allowedErrorV?: number;
	/** Largest allowed current-noise density at the node [A/√Hz]. */
	maxNoiseA_rtHz?: number;
	/** Largest allowed fault excursion beyond the clamping terminal [V] (needs a fault current). */
	maxExcursionV?: number;
}

export const NODE_FLAG_CODES = [
	'over-net-current-limit',
	'over-noise-limit',
	'excursion-over-limit',
	'fault-unclamped',
	'conducts-in-range',
	'error-shifts-bias'
] as const;
export type NodeFlagCode = (typeof NODE_FLAG_CODES)[number];

/** Flags that mean a stated limit is not met (a candidate with one ranks after those meeting every limit). */
export const NODE_LIMIT_FLAGS: readonly NodeFlagCode[] = ['over-net-current-limit', 'over-noise-limit', 'excursion-over-limit', 'fault-unclamped'];

/** Forward bias beyond which a junction counts as conducting inside the signal range: 10·N·Vt, in units of N·Vt. */
export const CONDUCTING_NVT = 10;
/** Error voltage, as a fraction of kT/q at the hot end, above which the node no longer sits at the signal voltage. */
export const ERROR_SHIFT_FRACTION = 0.1;

export const NODE_FLAG_WORDS: Record<NodeFlagCode, { short: string; long: string; caution: boolean }> = {
	'over-net-current-limit': {
		short: 'net current over limit',
		long: 'The net node current on the ranking’s basis (or its error voltage across the source resistance) exceeds what you allowed.',
		caution: true
	},
	// One code and one text with the single-junction ranking's noise limit.
	'over-noise-limit': FLAG_WORDS['over-noise-limit'],
	'excursion-over-limit': {
		short: 'fault excursion over limit',
		long: 'With the fault current the node goes farther beyond the rail (or guard) it is clamped to than you allowed, at the hot or the cold end.',
		caution: true
	},
	'fault-unclamped': {
		short: 'fault not clamped',
		long: 'No junction conducts the fault current in its direction: nothing stops the node within a kilovolt of the signal range.',
		caution: true
	},
	'conducts-in-range': {
		short: 'conducts in the signal range',
		long: 'Inside the signal range a junction is forward-biased by more than ten times N·kT/q: it conducts, so the node is clamped there rather than protected.',
		caution: true
	},
	'error-shifts-bias': {
		short: 'error moves the node',
		long: 'The error voltage is over a tenth of kT/q. Junctions biased near zero (guard clamps) see it added to their bias, so figures taken with the node at the signal voltage are only rough.',
		caution: true
	}
};

/** What the node's figures were, for `nodeFlags`. */
export interface NodeFigures {
	/** Net current [A], its error voltage [V] and the noise density [A/√Hz] on the basis the limits are judged on. */
	worstNetA: number;
	errorVoltageV: number | null;
	noiseA_rtHz: number;
	/** Fault excursion at [cold, hot], or null without a fault current; entries null when unclamped. */
	excursionV: [number | null, number | null] | null;
	/** Largest forward bias any junction sees over the signal range, in units of its N·Vt at the hot end. */
	forwardNvt: number;
	hotC: number;
}

/** The node's flags for its figures and limits, in NODE_FLAG_CODES order. */
export function nodeFlags(f: NodeFigures, limits: NodeLimits, sourceResistanceOhm?: number, constants: PhysicalConstants = SI_2019): NodeFlagCode[] {
	const out = new Set<NodeFlagCode>();
	const abs = Math.abs(f.worstNetA);
	if (limits.maxNetCurrentA !== undefined && abs > limits.maxNetCurrentA) out.add('over-net-current-limit');
	if (limits.allowedErrorV !== undefined && f.errorVoltageV !== null && f.errorVoltageV > limits.allowedErrorV) out.add('over-net-current-limit');
	if (limits.maxNoiseA_rtHz !== undefined && f.noiseA_rtHz > limits.maxNoiseA_rtHz) out.add('over-noise-limit');
	if (f.excursionV) {
		if (f.excursionV.some((x) => x === null)) out.add('fault-unclamped');
		else if (limits.maxExcursionV !== undefined && f.excursionV.some((x) => (x as number) > (limits.maxExcursionV as number))) out.add('excursion-over-limit');
	}
	if (f.forwardNvt > CONDUCTING_NVT) out.add('conducts-in-range');
	if (sourceResistanceOhm !== undefined && f.errorVoltageV !== null && f.errorVoltageV > ERROR_SHIFT_FRACTION * thermalVoltage(celsiusToKelvin(f.hotC), constants))
		out.add('error-shifts-bias');
	return NODE_FLAG_CODES.filter((c) => out.has(c));
}
