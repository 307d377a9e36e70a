/**
 * The ranking's flags as compact marks for dense lists: a few characters built from the
 * quantity each flag is about (I current, T temperature, V_R and V_F the reverse and
 * forward voltages, I_L the leakage, C capacitance, E_g the band gap, hν light). A trailing
 * ">" says a limit or rating is exceeded, "?" that a value was never measured or given.
 * The words stay in FLAG_WORDS: a mark is always shown with them on hover, on focus and in
 * the legend.
 */
import type { FlagCode } from '$lib/junction/rank-flags';
import type { NodeFlagCode } from '$lib/junction/node-limits';

export const FLAG_MARKS: Record<FlagCode, string> = {
	'current-extrapolated': 'I↓',
	'temperature-extrapolated': 'T↔',
	'over-reverse-rating': 'VR>',
	'reverse-not-measured': 'IR?',
	'metal-semiconductor': 'M–S',
	'light-sensitive': 'hν',
	'poor-fit': 'fit',
	'few-samples': 'n<3',
	'forward-drop-over-limit': 'VF>',
	'over-leakage-target': 'IL>',
	'over-capacitance-limit': 'C>',
	'band-gap-assumed': 'Eg?',
	'over-forward-rating': 'IF>',
	'capacitance-from-card': 'C?',
	'over-noise-limit': 'In>'
};

/** The protected node's own flags (the node screen, a project's node verdicts); noise shares the ranking's code. */
const NODE_FLAG_MARKS: Record<NodeFlagCode, string> = {
	'over-net-current-limit': 'IN>',
	'over-noise-limit': 'In>',
	'excursion-over-limit': 'VX>',
	'fault-unclamped': 'VX?',
	'conducts-in-range': 'VF~',
	'error-shifts-bias': 'ΔV'
};

/** The mark for any flag code, a node's or the ranking's. */
export function flagMark(code: string): string {
	return (NODE_FLAG_MARKS as Record<string, string>)[code] ?? (FLAG_MARKS as Record<string, string>)[code] ?? code;
}
