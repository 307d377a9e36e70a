/**
 * One position's share of a protected node's figures at one signal voltage and temperature,
 * from its samples' currents leaving the node c_s [A] and noise powers S_s [A²/Hz]
 * (node-evaluate.ts states the rules): the largest and smallest c_s (worst assignments), the
 * median (typical), the statistical bound's terms and the noise's. Pure and allocation-free,
 * so the node's own evaluation and the catalogue-wide ranking of a node (node-rank.ts) share
 * one statement of the rules.
 */
import { medianOfPrefix } from './catalogue-caches';

/** Where `positionTerms` writes. */
export const T_HIGH = 0;
export const T_LOW = 1;
export const T_TYPICAL = 2;
/** The bound's terms for the highest and the lowest net current [A]. */
export const T_BOUND_HIGH = 3;
export const T_BOUND_LOW = 4;
export const T_NOISE_WORST = 5;
export const T_NOISE_TYPICAL = 6;
export const T_NOISE_BOUND = 7;
export const TERMS = 8;

/**
 * One-sided normal tolerance limits [exp(ȳ + k·s), exp(ȳ − k·s)] of the magnitudes of
 * a[from … from + n − 1], over y = ln|a| (s with n − 1; the two-pass form of tolerance.ts),
 * into out[0], out[1]. NaN when a value is zero (no logarithm).
 */
function toleranceLimits(a: ArrayLike<number>, from: number, n: number, k: number, out: Float64Array): void {
	let sum = 0;
	for (let i = 0; i < n; i++) sum += Math.log(Math.abs(a[from + i]));
	const mean = sum / n;
	if (!Number.isFinite(mean)) {
		out[0] = NaN;
		out[1] = NaN;
		return;
	}
	let ss = 0;
	for (let i = 0; i < n; i++) {
		const d = Math.log(Math.abs(a[from + i])) - mean;
		ss += d * d;
	}
	const spread = k * Math.sqrt(ss / (n - 1));
	out[0] = Math.exp(mean + spread);
	out[1] = Math.exp(mean - spread);
}

const limits = new Float64Array(2);

/**
 * The terms of one position into `out` (T_HIGH …) from c[from …] and S[from …] (n samples),
 * with tolerance factor k (NaN or undefined: no bound; the extreme samples stand in, as they
 * do at zero bias where every sample carries nothing). `sort` is work space of n entries.
 */
export function positionTerms(
	c: ArrayLike<number>,
	noise: ArrayLike<number>,
	from: number,
	n: number,
	k: number | undefined,
	sort: Float64Array,
	out: Float64Array
): void {
	let hi = -Infinity;
	let lo = Infinity;
	let nz = 0;
	for (let s = from; s < from + n; s++) {
		const x = c[s];
		if (x > hi) hi = x;
		if (x < lo) lo = x;
		if (noise[s] > nz) nz = noise[s];
	}
	out[T_HIGH] = hi;
	out[T_LOW] = lo;
	out[T_NOISE_WORST] = nz;
	out[T_BOUND_HIGH] = hi;
	out[T_BOUND_LOW] = lo;
	out[T_NOISE_BOUND] = nz;
	if (k !== undefined && k === k && n >= 2) {
		toleranceLimits(c, from, n, k, limits);
		// The samples share one sign (a current has its bias's sign); at zero bias the extremes stand.
		if (limits[0] === limits[0] && (lo > 0 || hi < 0)) {
			out[T_BOUND_HIGH] = lo > 0 ? limits[0] : -limits[1];
			out[T_BOUND_LOW] = lo > 0 ? limits[1] : -limits[0];
		}
		toleranceLimits(noise, from, n, k, limits);
		out[T_NOISE_BOUND] = limits[0];
	}
	for (let s = 0; s < n; s++) sort[s] = c[from + s];
	out[T_TYPICAL] = medianOfPrefix(sort, n);
	for (let s = 0; s < n; s++) sort[s] = noise[from + s];
	out[T_NOISE_TYPICAL] = medianOfPrefix(sort, n);
}
