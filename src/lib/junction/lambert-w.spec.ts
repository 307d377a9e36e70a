import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { lambertW0, lambertW0Exp, logLambertW0Exp } from './lambert-w';
import { expectRelClose } from './test-helpers';

describe('Lambert W', () => {
	it('matches published special values', () => {
		// Omega constant W(1) = 0.5671432904097838… (OEIS A030178).
		expectRelClose(lambertW0(1), 0.5671432904097838, 2e-16);
		// W(e) = 1 and W(−1/e) = −1 follow from the definition w·e^w = x (Corless et al. 1996).
		expectRelClose(lambertW0(Math.E), 1, 2e-16);
		expect(lambertW0(-Math.exp(-1))).toBeCloseTo(-1, 7);
		expect(lambertW0(0)).toBe(0);
	});

	it('satisfies w·e^w = x from 1e-300 to 1e300 and near the branch point', () => {
		fc.assert(
			fc.property(fc.double({ min: -300, max: 300, noNaN: true }), (e) => {
				const x = 10 ** e;
				const w = lambertW0(x);
				// Compare in logs for large x (w·e^w overflows nothing, but keeps precision).
				if (x > 1e6) expectRelClose(Math.log(w) + w, Math.log(x), 1e-14);
				else expectRelClose(w * Math.exp(w), x, 1e-14);
			})
		);
		for (const x of [-0.3678, -0.36, -0.3, -0.1, -1e-5, 1e-5])
			expectRelClose(lambertW0(x) * Math.exp(lambertW0(x)), x, 1e-10, `x=${x}`);
	});

	it('log-domain form agrees with the direct one and stays finite for huge arguments', () => {
		for (const y of [-700, -50, -1, 0, 0.5, 1, 2, 10, 100, 700]) expectRelClose(lambertW0Exp(y), lambertW0(Math.exp(y)), 1e-14, `y=${y}`);
		for (const y of [1e3, 1e5, 1e10, 1e300]) {
			const w = lambertW0Exp(y);
			expect(Number.isFinite(w)).toBe(true);
			expectRelClose(w + Math.log(w), y, 1e-15, `y=${y}`);
		}
		expectRelClose(logLambertW0Exp(-1000), -1000, 1e-15);
	});

	it('throws outside its domain', () => {
		expect(() => lambertW0(-1)).toThrow(RangeError);
		expect(() => lambertW0(NaN)).toThrow(RangeError);
		expect(() => lambertW0Exp(Infinity)).toThrow(RangeError);
	});
});
