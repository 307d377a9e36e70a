/**
 * The ranking's flag vocabulary: stable codes, their words on screen, and the bit set the
 * catalogue table keeps per part. The one source of these texts for every screen, the API
 * and the exports; importing it pulls in nothing else of the rank core.
 */
import { MATERIAL_DEFAULTS } from './model';
import type { PartRecord } from './rank-types';

/** Stable flag codes (the API's), in the order screens list them; see FLAG_WORDS for the words. */
export const FLAG_CODES = [
	'current-extrapolated',
	'temperature-extrapolated',
	'over-reverse-rating',
	'reverse-not-measured',
	'metal-semiconductor',
	'light-sensitive',
	'poor-fit',
	'few-samples',
	'forward-drop-over-limit',
	'over-leakage-target',
	'over-capacitance-limit',
	'band-gap-assumed',
	'over-forward-rating',
	'over-noise-limit',
	// Set by the catalogue, which knows where a part's CJO, VJ and M came from; the table does not.
	'capacitance-from-card'
] as const;
export type FlagCode = (typeof FLAG_CODES)[number];

/** RMS fit residual above which a fit counts as poor [V] (2 mV, common practice for small-signal fits). */
export const POOR_FIT_RMS_V = 2e-3;
/** Temperature distance beyond which a prediction counts as extrapolated [K]. */
export const TEMPERATURE_EXTRAPOLATION_K = 25;

/**
 * Each flag in plain words: a short label for chips, a sentence for the explanation, and
 * whether it is a caution (shown in amber).
 */
export const FLAG_WORDS: Record<FlagCode, { short: string; long: string; caution: boolean }> = {
	'current-extrapolated': {
		short: 'below measured current',
		long: 'The predicted current is over a decade below the lowest current measured on this part: the model is extrapolated.',
		caution: true
	},
	'temperature-extrapolated': {
		short: 'outside measured temperatures',
		long: `An end of the temperature range lies more than ${TEMPERATURE_EXTRAPOLATION_K} K from every temperature this part was measured at.`,
		caution: true
	},
	'over-reverse-rating': {
		short: 'reverse rating exceeded',
		long: 'The reverse bias (plus the margin you asked for) exceeds the rated reverse voltage.',
		caution: true
	},
	'reverse-not-measured': {
		short: 'leakage never measured',
		long: 'Reverse leakage was never measured; only the Shockley floor is known and real leakage is higher.',
		caution: true
	},
	'metal-semiconductor': {
		short: 'metal–semiconductor',
		long: 'Metal–semiconductor junction: the Shockley model is empirical here.',
		caution: false
	},
	'light-sensitive': {
		short: 'light makes current',
		long: 'Glass or clear package, or an LED: ambient light makes a photocurrent that can exceed the dark leakage. Shield it.',
		caution: true
	},
	'poor-fit': {
		short: 'poor fit',
		long: 'The model fits the measured sweeps poorly (RMS residual over 2 mV), so predictions are less certain.',
		caution: true
	},
	'few-samples': {
		short: 'under 3 samples',
		long: 'Fewer than three samples were measured, so the part-to-part spread is unknown.',
		caution: false
	},
	'forward-drop-over-limit': {
		short: 'drop over limit',
		long: 'The worst-case forward drop at the clamp current (the larger of the hot and cold ends) exceeds your limit.',
		caution: true
	},
	'over-leakage-target': {
		short: 'over leakage budget',
		long: 'The leakage the list is ranked by (the basis in its heading; the worst sample where a part has no statistical bound) exceeds the allowed leakage, or the allowed error voltage across the source resistance.',
		caution: true
	},
	'over-capacitance-limit': {
		short: 'capacitance over limit',
		long: 'The junction capacitance at the bias exceeds your limit.',
		caution: true
	},
	'band-gap-assumed': {
		short: 'band gap assumed',
		long: `Nobody gave or measured this part's band gap, so a typical ${MATERIAL_DEFAULTS['wide-gap'].EG} eV was assumed. Its leakage at temperatures away from the measured ones is uncertain: blue, green and white LEDs and SiC parts have larger band gaps.`,
		caution: true
	},
	'over-forward-rating': {
		short: 'clamp over forward rating',
		long: 'The clamp current is above the rated forward current: the part is not rated to carry it, and its forward drop there means little.',
		caution: true
	},
	'capacitance-from-card': {
		short: 'capacitance from card',
		long: 'Capacitance from a datasheet card: no C–V sweep of this part was measured, so CJO, VJ and M are the card’s.',
		caution: false
	},
	'over-noise-limit': {
		short: 'noise over limit',
		long: 'The current noise (of the junction at its bias, or at the protected node) exceeds the density you allowed, judged on the same basis as the leakage.',
		caution: true
	}
};

/**
 * Plain-words explanation of a flag code.
 * @throws RangeError for an unknown code.
 */
export function explainFlag(code: FlagCode): string {
	const t = FLAG_WORDS[code];
	if (!t) throw new RangeError(`unknown flag code '${String(code)}'`);
	return t.long;
}

/** The bit of a flag code in a part's flag set. */
export function flagBit(code: FlagCode): number {
	return 1 << FLAG_CODES.indexOf(code);
}

/** Decode a flag bit set into codes, in FLAG_CODES order. */
export function flagsFromBits(bits: number): FlagCode[] {
	return FLAG_CODES.filter((_, i) => (bits & (1 << i)) !== 0);
}

// Bits the catalogue table sets per operating point, looked up once.
export const BIT_CURRENT_EXTRAPOLATED = flagBit('current-extrapolated');
export const BIT_TEMPERATURE_EXTRAPOLATED = flagBit('temperature-extrapolated');
export const BIT_FORWARD_DROP_OVER_LIMIT = flagBit('forward-drop-over-limit');
export const BIT_OVER_REVERSE_RATING = flagBit('over-reverse-rating');
export const BIT_OVER_FORWARD_RATING = flagBit('over-forward-rating');
export const BIT_OVER_LEAKAGE_TARGET = flagBit('over-leakage-target');
export const BIT_OVER_CAPACITANCE_LIMIT = flagBit('over-capacitance-limit');
export const BIT_OVER_NOISE_LIMIT = flagBit('over-noise-limit');

/**
 * Flags that mean a stated limit is not met (the part ranks after those meeting every
 * limit): forward drop, leakage budget, capacitance, current noise, and both ratings.
 */
export const LIMIT_BITS =
	BIT_FORWARD_DROP_OVER_LIMIT |
	BIT_OVER_LEAKAGE_TARGET |
	BIT_OVER_CAPACITANCE_LIMIT |
	BIT_OVER_NOISE_LIMIT |
	BIT_OVER_REVERSE_RATING |
	BIT_OVER_FORWARD_RATING;

/** Flags that hold for a part whatever the operating point. */
export function staticFlagsOf(p: PartRecord): number {
	let f = 0;
	if (!p.measured.reverseMeasured) f |= flagBit('reverse-not-measured');
	if (p.kind === 'schottky' || p.samples.some((s) => s.material === 'metal-semiconductor')) f |= flagBit('metal-semiconductor');
	if (p.transparentPackage || p.kind === 'led') f |= flagBit('light-sensitive');
	if ((p.fitRmsResidualV ?? 0) > POOR_FIT_RMS_V) f |= flagBit('poor-fit');
	if (p.samples.length < 3) f |= flagBit('few-samples');
	if (p.samples.some((s) => s.egAssumed)) f |= flagBit('band-gap-assumed');
	return f;
}
