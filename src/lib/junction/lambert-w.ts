/**
 * Principal branch of the Lambert W function, W0(x): the w ≥ −1 with w·e^w = x.
 *
 * Two entry points: `lambertW0(x)` for an ordinary argument, and
 * `lambertW0Exp(y)` = W0(e^y), which never forms e^y. The diode equation with
 * series resistance needs W of arguments like 1e-14·e^(100/0.0258), far beyond
 * the double range, so the log-domain form solves w + ln w = y instead.
 *
 * References: Corless, Gonnet, Hare, Jeffrey, Knuth, "On the Lambert W function",
 * Adv. Comput. Math. 5 (1996) 329–359 (series at the branch point, asymptotics);
 * Halley iteration as in that paper, §4.
 */

const INV_E = Math.exp(-1);
const MAX_ITER = 64;

/** Halley refinement of w·e^w = x from a starting guess; stops at ~1 ulp changes. */
function halley(x: number, w: number): number {
	for (let i = 0; i < MAX_ITER; i++) {
		const ew = Math.exp(w);
		const f = w * ew - x;
		const wp1 = w + 1;
		if (wp1 === 0) break;
		const denom = ew * wp1 - ((w + 2) * f) / (2 * wp1);
		if (denom === 0 || !Number.isFinite(denom)) break;
		const dw = f / denom;
		w -= dw;
		if (Math.abs(dw) <= 4e-16 * (1 + Math.abs(w))) break;
	}
	return w;
}

/**
 * Lambert W, principal branch: W0(x) with W0(x)·exp(W0(x)) = x, for x ≥ −1/e.
 * Dimensionless. Source: Corless et al. 1996 (see file header).
 * @throws RangeError when x < −1/e or x is not finite.
 */
export function lambertW0(x: number): number {
	if (Number.isNaN(x) || x === Infinity || x === -Infinity) throw new RangeError(`lambertW0 needs a finite argument, got ${x}`);
	if (x === 0) return 0;
	if (x < -INV_E) {
		// Allow for rounding of −1/e itself.
		if (x > -INV_E - 1e-15) return -1;
		throw new RangeError(`lambertW0 is real only for x ≥ −1/e, got ${x}`);
	}
	let w: number;
	if (x < -0.32) {
		// Branch-point series in p = sqrt(2(e·x + 1)) (Corless et al. 1996, eq. 4.22).
		const p = Math.sqrt(Math.max(0, 2 * (Math.E * x + 1)));
		w = -1 + p - (p * p) / 3 + (11 / 72) * p * p * p;
		if (p < 1e-6) return w;
	} else if (Math.abs(x) < 1e-4) {
		// Taylor series W = x − x² + 1.5x³ − 8/3 x⁴; fully accurate here, and exact relative accuracy for tiny x.
		return x * (1 + x * (-1 + x * (1.5 - (8 / 3) * x)));
	} else if (x < 3) {
		w = Math.log1p(x) * (1 - Math.log1p(Math.log1p(x)) / (2 + Math.log1p(x)));
	} else {
		const l1 = Math.log(x);
		const l2 = Math.log(l1);
		w = l1 - l2 + l2 / l1;
	}
	return halley(x, w);
}

/**
 * W0(e^y) for any finite real y, computed without forming e^y (so it never
 * overflows): the w > 0 solving w + ln w = y when y > 1, else W0(exp(y)).
 * Dimensionless. Source: Corless et al. 1996, asymptotic start w ≈ y − ln y.
 * @throws RangeError when y is not finite.
 */
export function lambertW0Exp(y: number): number {
	if (!Number.isFinite(y)) throw new RangeError(`lambertW0Exp needs a finite log-argument, got ${y}`);
	if (y <= 1) return lambertW0(Math.exp(y));
	// Newton on g(w) = w + ln w − y, g' = 1 + 1/w; g is concave so Newton from the left converges monotonically.
	let w = y < 3 ? 1 : y - Math.log(y) + Math.log(y) / y;
	for (let i = 0; i < MAX_ITER; i++) {
		const g = w + Math.log(w) - y;
		const dw = g / (1 + 1 / w);
		w -= dw;
		if (Math.abs(dw) <= 2e-16 * w) break;
	}
	return w;
}

/**
 * ln(W0(e^y)) without overflow or underflow; used when W itself is tiny (y ≪ 0),
 * where ln W ≈ y − W. Dimensionless.
 * @throws RangeError when y is not finite.
 */
export function logLambertW0Exp(y: number): number {
	if (!Number.isFinite(y)) throw new RangeError(`logLambertW0Exp needs a finite log-argument, got ${y}`);
	const w = lambertW0Exp(y);
	// From w·e^w = e^y: ln w = y − w, exact in real arithmetic and well conditioned for small w.
	return y - w;
}
