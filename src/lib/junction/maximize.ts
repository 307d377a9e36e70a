/**
 * The largest value of a function of one variable over an interval, found from its values on
 * a grid (ends included) and refined between the best grid point's neighbours by
 * golden-section search (J. Kiefer, Proc. Amer. Math. Soc. 4 (1953) 502; the form in
 * W. H. Press et al., Numerical Recipes, 3rd ed., 2007, §10.2).
 *
 * A function that is unimodal between the neighbours of its best grid point has its maximum
 * found to the search tolerance; the grid spacing decides which peak is found, so grids are
 * made fine enough that the peaks of the functions evaluated here are wider than two steps.
 */

/** Golden-section ratio (3 − √5)/2. */
const GOLD = (3 - Math.sqrt(5)) / 2;

/**
 * n evenly spaced points from lo to hi, both ends exact.
 * @throws RangeError for n < 2 (or lo = hi with n = 1 allowed), non-finite ends or lo > hi.
 */
export function evenGrid(lo: number, hi: number, n: number): Float64Array {
	if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) throw new RangeError(`invalid interval [${lo}, ${hi}]`);
	if (!Number.isInteger(n) || n < 1) throw new RangeError(`a grid needs a whole number of points, got ${n}`);
	if (lo === hi || n === 1) return Float64Array.of(lo);
	const xs = new Float64Array(n);
	for (let i = 0; i < n; i++) xs[i] = lo + ((hi - lo) * i) / (n - 1);
	xs[n - 1] = hi;
	return xs;
}

/** Where a maximum lies and its value. */
export interface Maximum {
	x: number;
	y: number;
}

/**
 * The largest of `ys` (the function's values at `xs`, ascending), refined by golden-section
 * search of `f` on [x_{k−1}, x_{k+1}] around the best grid index k (clamped to the grid's
 * ends) until the bracket is below `relTol` of the grid's span. The result is never worse than
 * the best grid point. NaN values are passed over.
 * @throws RangeError when the grid is empty or xs and ys differ in length.
 */
export function refineMaximum(f: (x: number) => number, xs: ArrayLike<number>, ys: ArrayLike<number>, relTol = 1e-7): Maximum {
	const n = xs.length;
	if (n === 0 || ys.length !== n) throw new RangeError('a maximum needs a non-empty grid with one value per point');
	let k = 0;
	for (let i = 1; i < n; i++) if (ys[i] > ys[k] || Number.isNaN(ys[k])) k = i;
	const best: Maximum = { x: xs[k], y: ys[k] };
	if (n < 2) return best;
	let a = xs[Math.max(0, k - 1)];
	let b = xs[Math.min(n - 1, k + 1)];
	const tol = relTol * (xs[n - 1] - xs[0]);
	let c = a + GOLD * (b - a);
	let d = b - GOLD * (b - a);
	let fc = f(c);
	let fd = f(d);
	for (let it = 0; it < 200 && b - a > tol; it++) {
		if (fc > best.y) Object.assign(best, { x: c, y: fc });
		if (fd > best.y) Object.assign(best, { x: d, y: fd });
		if (fc >= fd) {
			b = d;
			d = c;
			fd = fc;
			c = a + GOLD * (b - a);
			fc = f(c);
		} else {
			a = c;
			c = d;
			fc = fd;
			d = b - GOLD * (b - a);
			fd = f(d);
		}
	}
	if (fc > best.y) Object.assign(best, { x: c, y: fc });
	if (fd > best.y) Object.assign(best, { x: d, y: fd });
	return best;
}
