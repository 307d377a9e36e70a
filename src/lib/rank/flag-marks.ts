/**
 * The ranking's flags as compact marks for dense lists: a few characters built from the
 * quantity each flag is about (I current, T temperature, V_R and V_F the reverse and
 * forward voltages, I_L the leakage, C capacitance, E_g the band gap, hν light). A trailing
 * ">" says a limit or rating is exceeded, "?" that a value was never measured or given.
 * The words stay in FLAG_WORDS: a mark is always shown with them on hover, on focus and in
 * the legend.
 */
import type { FlagCode } from '$lib/junction/rank-flags';

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
	'capacitance-from-card': 'C?'
};
