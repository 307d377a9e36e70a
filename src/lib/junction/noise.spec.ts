import { describe, expect, it } from 'vitest';
import { CODATA_2014, SI_2019, celsiusToKelvin } from './constants';
import { createModel } from './model';
import { scaleModel } from './temperature';
import { solveBias, zeroBiasConductance } from './shockley';
import { noiseDensity, noiseIsApproximate, noisePower } from './noise';
import { expectRelClose } from './test-helpers';

const q = SI_2019.q;
const k = SI_2019.k;

describe('junction current noise', () => {
	// Published statement (A. van der Ziel, Noise in Solid State Devices and Circuits, 1986,
	// p–n junction chapter, from memory): S_I = 2q·(I + 2·IS) for the ideal junction current
	// I = IS·(exp(qV/kT) − 1); here written out again from that statement, independently of noise.ts.
	it('is 2q·(I + 2·IS) + 4kT/RSH at forward, zero and reverse bias', () => {
		const model = createModel({ IS: 2e-14, N: 1, RSH: 5e11 });
		for (const tC of [-20, 25, 85]) {
			const s = scaleModel(model, tC);
			const T = celsiusToKelvin(tC);
			const vt = (k * T) / q;
			for (const v of [-5, -0.3, -0.01, -1e-4, 0, 1e-4, 0.02, 0.3, 0.55]) {
				const i = s.IS * Math.expm1(v / vt);
				const expected = 2 * q * (i + 2 * s.IS) + (4 * k * T) / (5e11 / Math.pow(2, (tC - 27) / 10));
				expectRelClose(noisePower(s, v), expected, 1e-12, `${tC} °C, ${v} V`);
			}
		}
	});

	it('uses the junction voltage after the drop on RS', () => {
		const model = createModel({ IS: 1e-12, N: 1, RS: 50 });
		const s = scaleModel(model, 25);
		const { i, vd } = solveBias(s, 0.6);
		expect(vd).toBeLessThan(0.6 - 40 * i); // a real drop on RS
		expectRelClose(noisePower(s, vd), 2 * q * (s.IS * Math.expm1(vd / s.nvt) + 2 * s.IS), 1e-12);
	});

	// H. Nyquist, Phys. Rev. 32 (1928) 110: a conductance G in thermal equilibrium shows
	// S_I = 4kT·G. At zero bias an N = 1 junction is such a conductance, G0 = IS/Vt (+ 1/RSH).
	it('equals the Nyquist value 4kT·G0 at zero bias for N = 1', () => {
		for (const params of [{ IS: 1e-15 }, { IS: 3e-12, RSH: 1e10 }, { IS: 1e-9, RSH: 1e6 }]) {
			const model = createModel({ ...params, N: 1 });
			for (const tC of [0, 27, 125]) {
				const T = celsiusToKelvin(tC);
				expectRelClose(noisePower(scaleModel(model, tC), 0), 4 * k * T * zeroBiasConductance(model, tC), 1e-12, `${JSON.stringify(params)} at ${tC} °C`);
			}
			expect(noiseIsApproximate(model.N)).toBe(false);
		}
	});

	it('gives N times the Nyquist value at zero bias when N > 1, and says it is approximate', () => {
		const model = createModel({ IS: 1e-13, N: 1.8 });
		const T = celsiusToKelvin(25);
		const ratio = noisePower(scaleModel(model, 25), 0) / (4 * k * T * zeroBiasConductance(model, 25));
		expectRelClose(ratio, 1.8, 1e-12);
		expect(noiseIsApproximate(1.8)).toBe(true);
	});

	// Textbook limits of the same statement: reverse-biased well beyond kT/q the density is the
	// shot noise of the saturation current, 2q·IS; forward-biased well beyond it, 2q·I.
	it('tends to 2q·IS in deep reverse and 2q·I in strong forward bias', () => {
		const s = scaleModel(createModel({ IS: 1e-14, N: 1 }), 27);
		expectRelClose(noisePower(s, -2), 2 * q * s.IS, 1e-12);
		const i = s.IS * Math.expm1(0.6 / s.nvt);
		expectRelClose(noisePower(s, 0.6), 2 * q * i, 1e-9);
	});

	it('is the square root of the power as a density, and follows the constants given', () => {
		const s = scaleModel(createModel({ IS: 1e-14, N: 1, RSH: 1e9, TNOM: 25 }), 25, CODATA_2014);
		expect(noiseDensity(s, -1, CODATA_2014)).toBe(Math.sqrt(noisePower(s, -1, CODATA_2014)));
		expect(noisePower(s, -1, CODATA_2014)).not.toBe(noisePower(s, -1, SI_2019));
		// √(4kT/R) of 1 GΩ at 25 °C is about 4 fA/√Hz (a common rule of thumb); the shunt dominates here.
		expect(noiseDensity(s, -1, CODATA_2014)).toBeGreaterThan(4e-15);
		expect(noiseDensity(s, -1, CODATA_2014)).toBeLessThan(4.2e-15);
	});

	it('refuses a junction voltage that is not a number', () => {
		const s = scaleModel(createModel({ IS: 1e-14 }), 25);
		expect(() => noisePower(s, Number.NaN)).toThrow(RangeError);
	});
});
