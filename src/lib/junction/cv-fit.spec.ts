/**
 * The C–V fit against the reference simulator: sweeps are generated from the depletion
 * formula, checked point by point against the junction capacitance ngspice 39 reports for the
 * same .model card (`@d[cd]` at each DC operating point, TT = 0 so only the depletion part),
 * given seeded 0.5 % reading noise, and fitted.
 */
import { describe, expect, it } from 'vitest';
import { runNgspiceOp } from '../../../tests/reference/ngspice';
import { createModel } from './model';
import { emitModelCard } from './spice-card';
import { depletionCapacitanceAt, type DepletionParameters } from './capacitance';
import { fitCapacitance, fitCapacitanceCsv } from './cv-fit';
import type { CapacitanceRun } from './cv-csv';
import { FitError } from './errors';
import { gaussian, mulberry32 } from '../random';
import { expectRelClose } from './test-helpers';

/** Capacitance ngspice reports at each bias for a diode with these depletion parameters (27 °C = TNOM, RS = 0). */
function ngspiceCapacitance(p: DepletionParameters, biases: number[]): number[] {
	const card = emitModelCard('cv', createModel({ IS: 1e-14, N: 1, RS: 0, ...p }), { forSimulator: true });
	const lines = [card];
	biases.forEach((v, k) => lines.push(`v${k} n${k} 0 dc ${v}`, `d${k} n${k} 0 cv temp=27`));
	const res = runNgspiceOp({ netlist: lines.join('\n'), prints: biases.map((_, k) => `@d${k}[cd]`) });
	return biases.map((_, k) => res.get(`@d${k}[cd]`) as number);
}

function biasGrid(lo: number, hi: number, n: number): number[] {
	return Array.from({ length: n }, (_, k) => Number((lo + ((hi - lo) * k) / (n - 1)).toFixed(6)));
}

function run(V: number[], C: number[]): CapacitanceRun {
	return { temperatureC: 27, voltageV: Float64Array.from(V), capacitanceF: Float64Array.from(C), count: new Int32Array(V.length).fill(1), points: V.length };
}

/** Invented junctions: a small-signal PN clamp, a larger abrupt junction, a graded one, a metal–semiconductor one. */
const CASES: { name: string; truth: DepletionParameters; lo: number; hi: number; seed: number }[] = [
	{ name: 'small-signal PN, graded', truth: { CJO: 4e-12, VJ: 0.75, M: 0.33, FC: 0.5 }, lo: -10, hi: 0.5, seed: 11 },
	{ name: 'rectifier, abrupt', truth: { CJO: 1.5e-10, VJ: 0.6, M: 0.5, FC: 0.5 }, lo: -5, hi: 0.4, seed: 12 },
	{ name: 'low-capacitance PN', truth: { CJO: 0.8e-12, VJ: 0.9, M: 0.28, FC: 0.5 }, lo: -15, hi: 0.3, seed: 13 },
	{ name: 'metal–semiconductor', truth: { CJO: 2.5e-11, VJ: 0.45, M: 0.45, FC: 0.5 }, lo: -8, hi: 0.2, seed: 14 }
];

describe('C–V fits of sweeps generated from the depletion formula, checked in ngspice', () => {
	it.each(CASES)('$name', ({ truth, lo, hi, seed }) => {
		const V = biasGrid(lo, hi, 36);
		const ng = ngspiceCapacitance(truth, V);
		// The generator is the formula ngspice evaluates: agreement to 1e-9 before noise is added.
		V.forEach((v, k) => expectRelClose(depletionCapacitanceAt(truth, v), ng[k], 1e-9, `formula at ${v} V`));
		const g = gaussian(mulberry32(seed));
		const measured = V.map((v) => depletionCapacitanceAt(truth, v) * (1 + 0.005 * g()));
		const fit = fitCapacitance(run(V, measured));
		// Points at or above FC·VJ are left out and counted.
		const above = V.filter((v) => v >= truth.FC * fit.model.VJ).length;
		expect(fit.quality.excluded).toBe(above);
		expect(fit.quality.points).toBe(V.length - above);
		// The fitted curve reproduces ngspice's capacitance at every fitted bias within 1 %.
		V.forEach((v, k) => {
			if (v < truth.FC * fit.model.VJ) expectRelClose(depletionCapacitanceAt(fit.model, v), ng[k], 0.01, `fit at ${v} V`);
		});
		expectRelClose(fit.model.CJO, truth.CJO, 0.03, 'CJO');
		expect(truth.VJ).toBeGreaterThanOrEqual(fit.interval.VJ[0]);
		expect(truth.VJ).toBeLessThanOrEqual(fit.interval.VJ[1]);
		expect(truth.M).toBeGreaterThanOrEqual(fit.interval.M[0]);
		expect(truth.M).toBeLessThanOrEqual(fit.interval.M[1]);
		expect(truth.CJO).toBeGreaterThanOrEqual(fit.interval.CJO[0]);
		expect(truth.CJO).toBeLessThanOrEqual(fit.interval.CJO[1]);
		// 0.5 % noise leaves an RMS relative residual near 0.5 %.
		expect(fit.quality.rmsRelative).toBeGreaterThan(0.003);
		expect(fit.quality.rmsRelative).toBeLessThan(0.008);
		expect(fit.residuals.percent).toHaveLength(fit.quality.points);
		expect(fit.warnings).toEqual([]);
	});

	it('finds the least-squares minimum: no junction potential on a fine scan does better', () => {
		const { truth, lo, hi, seed } = CASES[0];
		const V = biasGrid(lo, hi, 36);
		const g = gaussian(mulberry32(seed));
		const C = V.map((v) => depletionCapacitanceAt(truth, v) * (1 + 0.005 * g()));
		const fit = fitCapacitance(run(V, C));
		const used = V.map((v, k) => ({ v, y: Math.log(C[k]) })).filter((p) => p.v < 0.5 * fit.model.VJ);
		const ssr = (p: DepletionParameters) => used.reduce((a, q) => a + (q.y - Math.log(depletionCapacitanceAt(p, q.v))) ** 2, 0);
		const best = ssr(fit.model);
		// For each VJ the best (ln CJO, M) is a straight-line fit (simple least squares, closed form).
		for (let vj = Math.max(...used.map((q) => q.v)) / 0.5 + 1e-3; vj < 2; vj += 0.002) {
			const x = used.map((q) => Math.log(1 - q.v / vj));
			const mx = x.reduce((a, b) => a + b) / x.length;
			const my = used.reduce((a, q) => a + q.y, 0) / used.length;
			const b = x.reduce((a, xi, k) => a + (xi - mx) * (used[k].y - my), 0) / x.reduce((a, xi) => a + (xi - mx) ** 2, 0);
			expect(ssr({ CJO: Math.exp(my - b * mx), VJ: vj, M: -b, FC: 0.5 })).toBeGreaterThanOrEqual(best * (1 - 1e-9));
		}
	});

	it('says VJ and M trade off, with wide intervals, when only far reverse bias was measured', () => {
		const truth = { CJO: 2e-12, VJ: 0.9, M: 0.28, FC: 0.5 };
		const V = biasGrid(-20, -5, 31);
		const g = gaussian(mulberry32(21));
		const fit = fitCapacitance(run(V, V.map((v) => depletionCapacitanceAt(truth, v) * (1 + 0.005 * g()))));
		const near = fitCapacitance(run(biasGrid(-5, 0.3, 31), biasGrid(-5, 0.3, 31).map((v) => depletionCapacitanceAt(truth, v) * (1 + 0.005 * g()))));
		const width = (f: typeof fit) => f.interval.VJ[1] - f.interval.VJ[0];
		expect(Math.abs(fit.correlation)).toBeGreaterThan(0.95);
		// Far from zero bias the VJ interval is many times wider than one measured up to zero bias, and it covers the truth.
		expect(width(fit)).toBeGreaterThan(10 * width(near));
		expect(width(fit) / 2).toBeGreaterThan(0.5 * fit.model.VJ);
		expect(truth.VJ).toBeGreaterThanOrEqual(fit.interval.VJ[0]);
		expect(truth.VJ).toBeLessThanOrEqual(fit.interval.VJ[1]);
		expect(fit.warnings.map((w) => w.message).join(' ')).toMatch(/trade off/);
		// The capacitance over the measured span is still well determined.
		V.forEach((v) => expectRelClose(depletionCapacitanceAt(fit.model, v), depletionCapacitanceAt(truth, v), 0.01, `C at ${v} V`));
	});

	it('subtracts a stray capacitance before fitting', () => {
		const truth = CASES[0].truth;
		const V = biasGrid(-10, 0, 21);
		const stray = 0.7e-12;
		const fit = fitCapacitance(run(V, V.map((v) => depletionCapacitanceAt(truth, v) + stray)), { strayCapacitanceF: stray });
		expectRelClose(fit.model.CJO, truth.CJO, 1e-6, 'CJO');
		expectRelClose(fit.model.VJ, truth.VJ, 1e-4, 'VJ');
		expectRelClose(fit.model.M, truth.M, 1e-4, 'M');
		expect(fit.strayCapacitanceF).toBe(stray);
		// Without the subtraction the same readings fit a different, flatter junction.
		const raw = fitCapacitance(run(V, V.map((v) => depletionCapacitanceAt(truth, v) + stray)));
		expect(raw.model.M).toBeLessThan(0.9 * truth.M);
	});

	it('leaves a voltage window out when asked, and counts it', () => {
		const V = biasGrid(-10, 0, 21);
		const fit = fitCapacitance(run(V, V.map((v) => depletionCapacitanceAt(CASES[0].truth, v))), { excludeV: [-3, -1] });
		expect(fit.quality.leftOut).toBe(V.filter((v) => v >= -3 && v <= -1).length);
		expect(fit.quality.points).toBe(21 - (fit.quality.leftOut as number));
	});
});

describe('C–V fits refused, with the reason', () => {
	const C = (v: number) => depletionCapacitanceAt(CASES[0].truth, v);
	const reasons = (V: number[], Cs: number[], opts = {}) => {
		let caught: unknown;
		try {
			fitCapacitance(run(V, Cs), opts);
		} catch (e) {
			caught = e;
		}
		expect(caught).toBeInstanceOf(FitError);
		return (caught as FitError).reasons.join('; ');
	};
	it('fewer than 5 points', () => expect(reasons([-4, -3, -2, -1], [-4, -3, -2, -1].map(C))).toMatch(/4 points; the fit needs at least 5/));
	it('under 1 V of bias', () => {
		const V = biasGrid(-0.8, 0, 9);
		expect(reasons(V, V.map(C))).toMatch(/spans 0\.800 V; the fit needs at least 1 V/);
	});
	it('capacitance rising with reverse bias (the voltage sign flipped)', () => {
		const V = biasGrid(-10, 0, 11);
		expect(reasons(V, V.map((v) => C(-10 - v)))).toMatch(/does not fall with reverse bias .* rises/);
	});
	it('capacitance flat with bias', () => {
		const V = biasGrid(-10, 0, 11);
		const g = gaussian(mulberry32(5));
		expect(reasons(V, V.map(() => 3e-12 * (1 + 0.005 * g())))).toMatch(/does not fall with reverse bias/);
	});
	it('negative once the stray capacitance is subtracted', () => {
		const V = biasGrid(-10, 0, 11);
		expect(reasons(V, V.map(C), { strayCapacitanceF: 2e-12 })).toMatch(/not above zero at −?-?10 V.*stray/);
	});
	it('too few points left below FC·VJ', () => {
		const V = [-1, -0.5, 0, 0.4, 0.6, 0.8, 1, 1.2];
		expect(reasons(V, V.map(C))).toMatch(/below FC·VJ/);
	});
});

describe('fitting a C–V file', () => {
	it('parses and fits in one call: reverse-voltage magnitudes, decimal commas, the frequency recorded', () => {
		const V = biasGrid(-10, 0, 21);
		const comma = (x: number) => String(x).replace('.', ',');
		const text = 'VR (V);C (pF);Freq (kHz)\n' + V.map((v) => `${comma(-v || 0)};${comma(depletionCapacitanceAt(CASES[0].truth, v) * 1e12)};1000`).join('\n');
		const fit = fitCapacitanceCsv(text, { temperatureC: 25 });
		expect(fit.sweep.frequencyHz).toBe(1e6);
		expect(fit.warnings.some((w) => /negated/.test(w.message))).toBe(true);
		expectRelClose(fit.model.CJO, CASES[0].truth.CJO, 1e-4, 'CJO');
		expect(fit.range.temperatureC).toBe(25);
	});
});
