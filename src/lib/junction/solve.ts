/**
 * Safeguarded Newton iteration for a monotone increasing function on a bracket.
 *
 * Used where no closed form exists (recombination or breakdown terms together
 * with series resistance; forward voltage with a shunt). Newton converges
 * quadratically near the root; whenever a step would leave the bracket, or
 * the function overflows, the method falls back to bisection, so it always
 * converges for a continuous monotone function whose bracket holds a sign change.
 */

/** Evaluates f(x) and f'(x); must write f into out[0] and f' into out[1]. */
export type ValueAndSlope = (x: number, out: Float64Array) => void;

const scratch = new Float64Array(2);

/**
 * Find x in [lo, hi] with f(x) = 0 for an increasing f, starting from x0.
 * Converges to ~2 ulp of x (or 1e-300 absolute).
 * @throws RangeError when the bracket does not contain a sign change or is not finite.
 */
export function solveIncreasing(f: ValueAndSlope, lo: number, hi: number, x0?: number): number {
	if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) throw new RangeError(`invalid bracket [${lo}, ${hi}]`);
	f(lo, scratch);
	const flo = scratch[0];
	if (flo === 0) return lo;
	f(hi, scratch);
	const fhi = scratch[0];
	if (fhi === 0) return hi;
	if (!(flo < 0) || !(fhi > 0)) throw new RangeError(`no sign change in [${lo}, ${hi}]`);
	let x = x0 !== undefined && x0 > lo && x0 < hi ? x0 : 0.5 * (lo + hi);
	for (let i = 0; i < 400; i++) {
		f(x, scratch);
		const fx = scratch[0];
		const dfx = scratch[1];
		if (fx === 0) return x;
		if (fx < 0 || Number.isNaN(fx)) lo = x;
		else hi = x;
		let next = NaN;
		if (Number.isFinite(fx) && Number.isFinite(dfx) && dfx > 0) next = x - fx / dfx;
		if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
		const tol = 2.5e-16 * Math.abs(next) + 1e-300;
		if (Math.abs(next - x) <= tol || hi - lo <= tol) return next;
		x = next;
	}
	return x;
}
