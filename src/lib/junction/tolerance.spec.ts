import { describe, expect, it } from 'vitest';
import { scipyNoncentralTCdf, scipyNoncentralTQuantiles, scipyNormalQuantiles } from '../../../tests/reference/scipy';
import { logNormalUpperBound, noncentralTCdf, noncentralTQuantile, toleranceFactor } from './tolerance';
import { expectRelClose } from './test-helpers';

// One-sided normal tolerance factors k (upper limit ȳ + k·s covers a fraction p of the
// population with confidence γ): M. G. Natrella, Experimental Statistics, NBS Handbook 91
// (1963), Table A-7 "Factors for one-sided tolerance limits for normal distributions"
// (computed by Lieberman 1958), three decimals. Transcribed from memory of the table; the
// check against SciPy below is what makes a slip in memory visible.
const NATRELLA_A7: { confidence: number; coverage: number; k: Record<number, number> }[] = [
	{ confidence: 0.9, coverage: 0.95, k: { 2: 13.09, 3: 5.311, 5: 3.4, 10: 2.568, 30: 2.08 } },
	{ confidence: 0.95, coverage: 0.95, k: { 2: 26.26, 3: 7.656, 5: 4.203, 10: 2.911, 30: 2.22 } },
	{ confidence: 0.95, coverage: 0.99, k: { 2: 37.094, 3: 10.553, 5: 5.741, 10: 3.981, 30: 3.064 } }
];
const SIZES = [2, 3, 5, 10, 30];

describe('one-sided tolerance factor k from the noncentral t', () => {
	for (const row of NATRELLA_A7) {
		it(`matches Natrella's Table A-7 at γ = ${row.confidence}, p = ${row.coverage} for n = 2, 3, 5, 10, 30`, () => {
			for (const n of SIZES) {
				// The table rounds to three decimals (tabulated to 0.001 or its last digit).
				expect(Math.abs(toleranceFactor(n, row.coverage, row.confidence) - row.k[n]), `n = ${n}`).toBeLessThanOrEqual(0.0011);
			}
		});
	}

	it('agrees with SciPy (scipy.stats.nct.ppf, Debian python3-scipy) to 1e-9 at n = 2, 3, 5, 10, 30 and more', () => {
		const pairs: [number, number][] = [
			[0.95, 0.9],
			[0.95, 0.95],
			[0.99, 0.99],
			[0.9, 0.5],
			[0.5, 0.75],
			[0.999, 0.999]
		];
		const sizes = [...SIZES, 4, 7, 100, 400];
		const z = scipyNormalQuantiles(pairs.map(([p]) => p));
		const cases: [number, number, number][] = [];
		for (const [i, [, g]] of pairs.entries()) for (const n of sizes) cases.push([g, n - 1, z[i] * Math.sqrt(n)]);
		const ref = scipyNoncentralTQuantiles(cases);
		let j = 0;
		for (const [p, g] of pairs)
			for (const n of sizes) expectRelClose(toleranceFactor(n, p, g), ref[j++] / Math.sqrt(n), 1e-9, `n ${n}, p ${p}, γ ${g}`);
	});

	it('is close to the NIST/SEMATECH handbook example (§7.2.6.3: n = 43, p = 0.90, γ = 0.99, approximate k₁ = 1.8752)', () => {
		// The handbook's worked value comes from its approximation formula; the exact factor lies within 0.002 of it.
		expect(Math.abs(toleranceFactor(43, 0.9, 0.99) - 1.8752)).toBeLessThan(0.002);
	});

	it('falls with n towards z_p, and rises with coverage and confidence', () => {
		let last = Infinity;
		for (const n of [2, 3, 4, 6, 10, 20, 50, 200, 1000]) {
			const k = toleranceFactor(n);
			expect(k).toBeLessThan(last);
			expect(k).toBeGreaterThan(1.6448536269514722); // z_0.95
			last = k;
		}
		expect(toleranceFactor(5, 0.99, 0.9)).toBeGreaterThan(toleranceFactor(5, 0.95, 0.9));
		expect(toleranceFactor(5, 0.95, 0.99)).toBeGreaterThan(toleranceFactor(5, 0.95, 0.9));
	});

	it('refuses what has no factor', () => {
		expect(() => toleranceFactor(1)).toThrow(RangeError);
		expect(() => toleranceFactor(2.5)).toThrow(RangeError);
		expect(() => toleranceFactor(5, 1)).toThrow(RangeError);
		expect(() => toleranceFactor(5, 0.95, 0.2)).toThrow(RangeError);
	});
});

describe('noncentral t distribution function', () => {
	it('agrees with SciPy (scipy.stats.nct.cdf) to 1e-12 absolute, from the central t to δ = 40', () => {
		const cases: [number, number, number][] = [
			[1, 1, 0.5],
			[3, 2, 1.5],
			[10, 29, 9],
			[0.5, 4, 3],
			[50, 1, 40],
			[1000, 1, 2.3],
			[2.1, 7, 0],
			[0.01, 3, 0.2],
			[45, 399, 33]
		];
		const ref = scipyNoncentralTCdf(cases);
		cases.forEach(([t, df, d], i) => expect(Math.abs(noncentralTCdf(t, df, d) - ref[i]), `${t} ${df} ${d}`).toBeLessThan(1e-12));
	});

	it('is the inverse of its quantile, and Φ(−δ) at t = 0', () => {
		for (const [g, df, d] of [
			[0.9, 4, 3.7],
			[0.999, 1, 4.4],
			[0.6, 50, 10]
		])
			expect(noncentralTCdf(noncentralTQuantile(g, df, d), df, d)).toBeCloseTo(g, 11);
		expect(noncentralTCdf(0, 5, 0)).toBe(0.5);
		expect(() => noncentralTCdf(-1, 5, 1)).toThrow(RangeError);
	});
});

describe('log-normal upper bound', () => {
	it('equals a hand computation: 1, 2 and 4 pA give 2 pA·2^k', () => {
		// y = ln(1e-12) + {0, ln 2, 2 ln 2}: ȳ = ln(2e-12), s = ln 2, so exp(ȳ + k·s) = 2 pA·2^k.
		const k = toleranceFactor(3); // 5.3115 (Natrella Table A-7, γ 0.90, p 0.95)
		expectRelClose(logNormalUpperBound([1e-12, 2e-12, 4e-12], k), 2e-12 * 2 ** k, 1e-12);
		expectRelClose(logNormalUpperBound([1e-12, 2e-12, 4e-12], k), 79.42e-12, 1e-3);
		// Equal samples: no spread, the bound is the value itself.
		expectRelClose(logNormalUpperBound([3e-15, 3e-15], toleranceFactor(2)), 3e-15, 1e-14);
		expect(() => logNormalUpperBound([1e-12], k)).toThrow(RangeError);
		expect(() => logNormalUpperBound([1e-12, 0], k)).toThrow(RangeError);
	});
});
