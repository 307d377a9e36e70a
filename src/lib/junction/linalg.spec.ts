import { describe, expect, it } from 'vitest';
import { invert, leastSquares, tQuantile975 } from './linalg';
import { numpyInverse, numpyLeastSquares, scipyTQuantiles } from '../../../tests/reference/scipy';

const relErr = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

/** A forward sweep of a diode with series resistance, as the fitter's linear start sees it. */
function diodeDesign(n: number): { columns: number[][]; y: number[] } {
	const I: number[] = [];
	const V: number[] = [];
	for (let k = 0; k < n; k++) {
		const i = 1e-12 * 10 ** ((k / (n - 1)) * 10); // 1 pA … 10 mA
		I.push(i);
		// V = N·Vt·ln(I/IS) + RS·I with a little bench noise (deterministic).
		V.push(1.8 * 0.025693 * Math.log(i / 2e-15) + 4.7 * i + 1e-4 * Math.sin(7 * k));
	}
	return { columns: [I.map(Math.log), I, I.map(() => 1)], y: V };
}

describe('least squares, against numpy.linalg.lstsq (Debian python3-numpy)', () => {
	it('solves the fitter’s (ln I, I, 1) design over ten decades of current', () => {
		const { columns, y } = diodeDesign(400);
		const ours = leastSquares(columns, y);
		const ref = numpyLeastSquares(columns, y);
		ours.forEach((v, i) => expect(relErr(v, ref[i])).toBeLessThan(1e-8));
		// and it recovers the generating line's slope and resistance (noise 0.1 mV)
		expect(relErr(ours[0], 1.8 * 0.025693)).toBeLessThan(1e-3);
		expect(relErr(ours[1], 4.7)).toBeLessThan(1e-2);
	});

	it('solves the temperature start’s (−q/kT, 1) design for temperatures 20 K apart', () => {
		const T = [298.15, 308.15, 318.15];
		const x = T.map((t) => -1.602176634e-19 / (1.380649e-23 * t));
		const y = x.map((v, i) => 1.12 * v + 30 + [0.01, -0.02, 0.01][i]);
		const ours = leastSquares([x, x.map(() => 1)], y);
		const ref = numpyLeastSquares([x, x.map(() => 1)], y);
		ours.forEach((v, i) => expect(relErr(v, ref[i])).toBeLessThan(1e-9));
	});

	it('refuses linearly dependent columns', () => {
		const x = [1, 2, 3, 4, 5];
		expect(() => leastSquares([x, x.map((v) => 2 * v)], [1, 2, 3, 4, 5])).toThrow(RangeError);
		expect(() => leastSquares([x, x.map(() => 0)], [1, 2, 3, 4, 5])).toThrow(RangeError);
	});
});

describe('inverse of JᵀJ, against numpy.linalg.inv', () => {
	it('inverts a JᵀJ whose parameters differ by twenty decades in scale', () => {
		// J columns: d/d lnIS ~ 1, d/dN ~ 30, d/dRS ~ 1e-3 (amperes) — the fitter's usual spread.
		const rows = Array.from({ length: 50 }, (_, k) => [1 + 0.01 * k, 30 - 0.2 * k, 1e-3 * 10 ** (k / 25)]);
		const jtj = [0, 1, 2].map((i) => [0, 1, 2].map((j) => rows.reduce((s, r) => s + r[i] * r[j], 0)));
		const ours = invert(jtj);
		const ref = numpyInverse(jtj);
		ours.forEach((row, i) => row.forEach((v, j) => expect(relErr(v, ref[i][j])).toBeLessThan(1e-7)));
	});

	it('refuses a singular matrix', () => {
		expect(() => invert([[1, 2], [2, 4]])).toThrow(RangeError);
		expect(() => invert([[1, 0], [0, 0]])).toThrow(RangeError);
	});
});

describe('t(0.975, df)', () => {
	it('matches the NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.2 (three decimals)', () => {
		const table: [number, number][] = [[1, 12.706], [2, 4.303], [5, 2.571], [10, 2.228], [30, 2.042], [100, 1.984]];
		for (const [df, t] of table) expect(Math.abs(tQuantile975(df) - t)).toBeLessThan(5e-4);
	});

	it('matches scipy.stats.t.ppf to 1e-9 (two quantile algorithms)', () => {
		const dfs = [1, 2, 3, 4, 7, 13, 29, 31, 57, 200, 5000];
		const ref = scipyTQuantiles(dfs.map((df) => [0.975, df]));
		dfs.forEach((df, i) => expect(relErr(tQuantile975(df), ref[i])).toBeLessThan(1e-9));
	});

	it('refuses fewer than one degree of freedom', () => {
		expect(() => tQuantile975(0)).toThrow(RangeError);
		expect(() => tQuantile975(Number.NaN)).toThrow(RangeError);
	});
});
