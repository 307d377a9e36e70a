/**
 * One-sided normal tolerance bounds, with the exact tolerance factor from the noncentral t.
 *
 * For n values y₁…yₙ drawn from a normal distribution, with mean ȳ and sample standard
 * deviation s (n − 1 in the denominator), the upper bound ȳ + k·s lies above at least a
 * fraction p (the coverage) of the population with confidence γ when
 *   k = t′⁻¹(γ; ν = n − 1, δ = z_p·√n) / √n,
 * t′⁻¹ the γ-quantile of the noncentral t distribution with ν degrees of freedom and
 * noncentrality δ, z_p the p-quantile of the standard normal (NIST/SEMATECH e-Handbook of
 * Statistical Methods §7.2.6.3; Natrella, NBS Handbook 91 (1963) §2-5, whose Table A-7
 * tabulates k). No table and no large-n approximation: k is the exact quantile.
 *
 * Noncentral t distribution function for t ≥ 0 and δ ≥ 0 (the quadrant the factor needs)
 * as the Poisson mixture of regularised incomplete beta functions I_x(a, b):
 *   F(t; ν, δ) = Φ(−δ) + ½·Σ_{i≥0} [P_i·I_x(i + ½, ν/2) + (δ/√2)·Q_i·I_x(i + 1, ν/2)],
 *   x = t²/(t² + ν), λ = δ²/2, P_i = e^{−λ}·λ^i/i!, Q_i = e^{−λ}·λ^i/Γ(i + 3/2)
 * (R. V. Lenth, Appl. Statist. 38 (1989) 185, algorithm AS 243). The sum starts at the
 * Poisson mode and runs both ways (D. Benton & K. Krishnamoorthy, Comput. Statist. Data
 * Anal. 43 (2003) 249), with I_x stepped by I_x(a + 1, b) = I_x(a, b) − g_a,
 * g_a = Γ(a + b)/(Γ(a + 1)·Γ(b))·x^a·(1 − x)^b, g kept in logarithms so that a large δ
 * neither underflows nor needs thousands of terms. The incomplete beta, ln Γ and the
 * normal distribution come from @stdlib (ports of well-tested numerical libraries); the
 * quantile is found by bisection down to the last few bits of a double.
 */
import betainc from '@stdlib/math-base-special-betainc';
import gammaln from '@stdlib/math-base-special-gammaln';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { DEFAULT_CONFIDENCE, DEFAULT_COVERAGE } from './tolerance-limits';

/** Relative size of a term below which the series is cut (its tail is bounded, see below). */
const SERIES_EPS = 1e-17;
/** Terms either side of the mode beyond which the series is declared non-convergent. */
const MAX_TERMS = 100_000;

/**
 * Distribution function of the noncentral t, F(t; ν, δ) = P(T ≤ t), for t ≥ 0 and δ ≥ 0
 * (file header for the method and its sources). Absolute accuracy about 1e-15.
 * @param t value, ≥ 0
 * @param df degrees of freedom ν, > 0
 * @param delta noncentrality δ, ≥ 0
 * @throws RangeError outside that domain, or for non-finite arguments
 */
export function noncentralTCdf(t: number, df: number, delta: number): number {
	if (!(t >= 0) || !Number.isFinite(t)) throw new RangeError(`t must be a finite number ≥ 0, got ${t}`);
	if (!(df > 0) || !Number.isFinite(df)) throw new RangeError(`degrees of freedom must be a finite number > 0, got ${df}`);
	if (!(delta >= 0) || !Number.isFinite(delta)) throw new RangeError(`noncentrality must be a finite number ≥ 0, got ${delta}`);
	const floor = normalCdf(-delta, 0, 1);
	if (t === 0) return floor;
	const t2 = t * t;
	const x = t2 / (t2 + df);
	// 1 − x written directly, so a large t keeps its digits.
	const lnY = Math.log(df / (t2 + df));
	const lnX = Math.log(x);
	const b = df / 2;
	const lambda = (delta * delta) / 2;
	if (lambda === 0) return Math.min(1, floor + 0.5 * betainc(x, 0.5, b));
	const k = Math.floor(lambda);
	const lnLambda = Math.log(lambda);
	const qScale = delta / Math.SQRT2;
	const lnGB = gammaln(b);
	// ln g_a for the two chains at the mode (a = k + ½ and a = k + 1).
	const lnG = (a: number) => gammaln(a + b) - gammaln(a + 1) - lnGB + a * lnX + b * lnY;
	const pMode = Math.exp(-lambda + k * lnLambda - gammaln(k + 1));
	const qMode = qScale * Math.exp(-lambda + k * lnLambda - gammaln(k + 1.5));
	const iHalfMode = betainc(x, k + 0.5, b);
	const iOneMode = betainc(x, k + 1, b);
	const lnGHalfMode = lnG(k + 0.5);
	const lnGOneMode = lnG(k + 1);
	let sum = pMode * iHalfMode + qMode * iOneMode;

	// Forward from the mode: P, Q and both I_x fall with i, so with r = λ/(i + 1) < 1 the
	// rest of the series is below term·r/(1 − r) (a geometric bound).
	let p = pMode;
	let q = qMode;
	let iHalf = iHalfMode;
	let iOne = iOneMode;
	let lnGHalf = lnGHalfMode;
	let lnGOne = lnGOneMode;
	for (let i = k + 1; ; i++) {
		if (i - k > MAX_TERMS) throw new RangeError(`noncentral t series did not converge (t ${t}, ν ${df}, δ ${delta})`);
		const aHalf = i - 0.5; // the a being stepped from
		const aOne = i;
		iHalf = Math.max(0, iHalf - Math.exp(lnGHalf));
		iOne = Math.max(0, iOne - Math.exp(lnGOne));
		lnGHalf += lnX + Math.log((aHalf + b) / (aHalf + 1));
		lnGOne += lnX + Math.log((aOne + b) / (aOne + 1));
		p *= lambda / i;
		q *= lambda / (i + 0.5);
		const term = p * iHalf + q * iOne;
		sum += term;
		const r = lambda / (i + 1);
		if (r < 1 && term * r <= SERIES_EPS * sum * (1 - r)) break;
	}

	// Backward from the mode to i = 0: P and Q fall (i < λ) while I_x rises to at most 1,
	// so the rest is below (p + q)·s/(1 − s) with s = (i + ½)/λ < 1.
	p = pMode;
	q = qMode;
	iHalf = iHalfMode;
	iOne = iOneMode;
	lnGHalf = lnGHalfMode;
	lnGOne = lnGOneMode;
	for (let i = k - 1; i >= 0; i--) {
		if (k - i > MAX_TERMS) throw new RangeError(`noncentral t series did not converge (t ${t}, ν ${df}, δ ${delta})`);
		// g_{a−1} = g_a·a/((a − 1 + b)·x), then I_x(a − 1) = I_x(a) + g_{a−1}.
		const aHalf = i + 1.5;
		const aOne = i + 2;
		lnGHalf += Math.log(aHalf / (aHalf - 1 + b)) - lnX;
		lnGOne += Math.log(aOne / (aOne - 1 + b)) - lnX;
		iHalf = Math.min(1, iHalf + Math.exp(lnGHalf));
		iOne = Math.min(1, iOne + Math.exp(lnGOne));
		p *= (i + 1) / lambda;
		q *= (i + 1.5) / lambda;
		const term = p * iHalf + q * iOne;
		sum += term;
		const s = (i + 0.5) / lambda;
		if ((p + q) * s <= SERIES_EPS * sum * (1 - s)) break;
	}
	return Math.min(1, floor + 0.5 * sum);
}

/**
 * The γ-quantile of the noncentral t with ν degrees of freedom and noncentrality δ ≥ 0,
 * for Φ(−δ) ≤ γ < 1 (so the quantile is ≥ 0): the t with F(t; ν, δ) = γ, by bisection
 * until the bracket is a few units in the last place wide.
 * @throws RangeError outside that domain
 */
export function noncentralTQuantile(gamma: number, df: number, delta: number): number {
	if (!(gamma > 0 && gamma < 1)) throw new RangeError(`probability must lie in (0, 1), got ${gamma}`);
	const floor = noncentralTCdf(0, df, delta);
	if (gamma < floor) throw new RangeError(`probability ${gamma} lies below F(0) = ${floor}; the quantile would be negative`);
	if (gamma === floor) return 0;
	let lo = 0;
	let hi = Math.max(1, 2 * delta);
	while (noncentralTCdf(hi, df, delta) < gamma) {
		lo = hi;
		hi *= 2;
		if (hi > 1e300) throw new RangeError(`no quantile below 1e300 for γ ${gamma}, ν ${df}, δ ${delta}`);
	}
	for (let i = 0; i < 2000 && hi - lo > 4 * Number.EPSILON * hi; i++) {
		const mid = 0.5 * (lo + hi);
		if (noncentralTCdf(mid, df, delta) < gamma) lo = mid;
		else hi = mid;
	}
	return 0.5 * (lo + hi);
}

const factorCache = new Map<string, number>();
const FACTOR_CACHE_SIZE = 512;

/**
 * One-sided normal tolerance factor k for n samples, coverage p and confidence γ:
 * k = t′⁻¹(γ; n − 1, z_p·√n)/√n (file header). Kept once computed.
 * @param n number of samples, an integer ≥ 2
 * @param coverage p, in [0.5, 1)
 * @param confidence γ, in [0.5, 1)
 * @throws RangeError outside those domains
 */
export function toleranceFactor(n: number, coverage = DEFAULT_COVERAGE, confidence = DEFAULT_CONFIDENCE): number {
	if (!Number.isInteger(n) || n < 2) throw new RangeError(`a tolerance factor needs an integer number of samples ≥ 2, got ${n}`);
	if (!(coverage >= 0.5 && coverage < 1)) throw new RangeError(`coverage must lie in [0.5, 1), got ${coverage}`);
	if (!(confidence >= 0.5 && confidence < 1)) throw new RangeError(`confidence must lie in [0.5, 1), got ${confidence}`);
	const key = `${n}|${coverage}|${confidence}`;
	const hit = factorCache.get(key);
	if (hit !== undefined) return hit;
	const root = Math.sqrt(n);
	const k = noncentralTQuantile(confidence, n - 1, normalQuantile(coverage, 0, 1) * root) / root;
	if (factorCache.size >= FACTOR_CACHE_SIZE) factorCache.delete(factorCache.keys().next().value as string);
	factorCache.set(key, k);
	return k;
}

/**
 * Upper tolerance bound of positive values taken as log-normal: exp(ȳ + k·s) over
 * y = ln v (mean ȳ, sample standard deviation s with n − 1), the two-pass form.
 * Lot-to-lot leakage being log-normal is common practice, not a law.
 * @param values at least two values, each > 0
 * @param k tolerance factor (see toleranceFactor)
 * @throws RangeError for fewer than two values or a value that is not > 0
 */
export function logNormalUpperBound(values: ArrayLike<number>, k: number): number {
	const n = values.length;
	if (n < 2) throw new RangeError(`a bound needs at least two values, got ${n}`);
	let mean = 0;
	for (let i = 0; i < n; i++) {
		if (!(values[i] > 0)) throw new RangeError(`values must be > 0, got ${values[i]} at ${i}`);
		mean += Math.log(values[i]);
	}
	mean /= n;
	let ss = 0;
	for (let i = 0; i < n; i++) {
		const d = Math.log(values[i]) - mean;
		ss += d * d;
	}
	return Math.exp(mean + k * Math.sqrt(ss / (n - 1)));
}
