/**
 * Sliders beside the bias and temperature fields. The typed field is the value; a slider
 * only shows it and writes a new one. The bias slider is logarithmic in |V| (a designer's
 * biases span millivolts to hundreds of volts, reverse, and up to a volt forward), the
 * temperature slider linear. Arrow keys step a decade-aware amount: a tenth of the
 * leading decade's unit (−5 V → −5.1 V, −0.5 V → −0.51 V, −50 V → −51 V).
 */

/** Below this |bias| the slider is nearly linear; also the finest step [V] (the field shows mV). */
const V0 = 1e-3;
export const BIAS_REVERSE_MAX_V = 200;
export const BIAS_FORWARD_MAX_V = 1;
const SPAN = Math.log10(1 + BIAS_REVERSE_MAX_V / V0);

/** Slider positions: the reverse end at −1, zero bias at 0, the forward end below 1. */
export const BIAS_SLIDER = { min: -1, max: Math.log10(1 + BIAS_FORWARD_MAX_V / V0) / SPAN, step: 0.0005 };
export const TEMPERATURE_SLIDER = { min: -55, max: 175, step: 1 };

/** Slider position of a bias (clamped to the slider's ends). */
export function biasToSlider(v: number): number {
	const u = (Math.sign(v) * Math.log10(1 + Math.abs(v) / V0)) / SPAN;
	return Math.min(BIAS_SLIDER.max, Math.max(BIAS_SLIDER.min, u));
}

/** Bias at a slider position, rounded to three significant digits (and whole millivolts). */
export function sliderToBias(u: number): number {
	const v = Math.sign(u) * V0 * (10 ** (Math.abs(u) * SPAN) - 1);
	return tidyBias(v);
}

function tidyBias(v: number): number {
	if (v === 0) return 0;
	const q = Math.max(V0, 10 ** (Math.floor(Math.log10(Math.abs(v))) - 2));
	return Number((Math.round(v / q) * q).toFixed(3)) || 0;
}

/**
 * The bias one arrow step up (+1) or down (−1) from v: a tenth of the leading decade's unit
 * of the magnitude it moves through, landing on a multiple of that step.
 */
export function stepBias(v: number, direction: 1 | -1): number {
	const away = Math.sign(v) === direction || v === 0;
	// Toward zero, the step is the one of the decade being entered (−1 V → −0.99 V).
	const magnitude = away ? Math.abs(v) : Math.abs(v) * (1 - 1e-9);
	const step = magnitude < 10 * V0 ? V0 : 10 ** (Math.floor(Math.log10(magnitude)) - 1);
	const next = nextMultiple(v, step, direction);
	return Math.min(BIAS_FORWARD_MAX_V, Math.max(-BIAS_REVERSE_MAX_V, Number(next.toFixed(3)) || 0));
}

/** The temperature one arrow step (1 K) or page step (10 K) from t, within the slider's range. */
export function stepTemperature(t: number, direction: 1 | -1, page = false): number {
	const step = page ? 10 : 1;
	const next = nextMultiple(t, step, direction);
	return Math.min(TEMPERATURE_SLIDER.max, Math.max(TEMPERATURE_SLIDER.min, next));
}

/** The next multiple of `step` beyond x in the direction given (x itself never, even when on one). */
function nextMultiple(x: number, step: number, direction: 1 | -1): number {
	const k = x / step;
	// A hair of slack, so that 5.1 / 0.1 = 50.99999… counts as on 51.
	return (direction > 0 ? Math.floor(k + 1e-9) + 1 : Math.ceil(k - 1e-9) - 1) * step;
}
