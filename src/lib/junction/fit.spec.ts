import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { runNgspiceOp } from '../../../tests/reference/ngspice';
import { createModel, type JunctionModelInput } from './model';
import { emitModelCard } from './spice-card';
import { fitSweepCsv } from './fit';
import { FitError } from './errors';
import { MATERIAL_DEFAULTS } from './model';
import { thermalVoltage, celsiusToKelvin } from './constants';
import { mulberry32 } from '../random';

const CURRENTS = Array.from({ length: 36 }, (_, k) => 10 ** (-9 + k / 5)); // 1 nA … ~10 mA, 5 per decade

/** Voltages at forced currents from ngspice (current-source drive), per temperature. */
function ngspiceForward(input: JunctionModelInput, tempsC: number[], reverse?: { v: number[]; rsh: number }) {
	const m = createModel(input);
	const lines = [emitModelCard('dut', m, { forSimulator: true })];
	const prints: string[] = [];
	let k = 0;
	for (const t of tempsC) {
		for (const i of CURRENTS) {
			k++;
			lines.push(`i${k} 0 n${k} dc ${i}`, `d${k} n${k} 0 dut temp=${t}`);
			prints.push(`v(n${k})`);
		}
	}
	const rev: string[] = [];
	if (reverse) {
		for (const v of reverse.v) {
			k++;
			lines.push(`v${k} n${k} 0 dc ${v}`, `d${k} n${k} 0 dut temp=${tempsC[0]}`, `r${k} n${k} 0 ${reverse.rsh}`);
			rev.push(`@d${k}[id]`, `@r${k}[i]`);
		}
	}
	const res = runNgspiceOp({ netlist: lines.join('\n'), prints: [...prints, ...rev], options: 'gmin=0 reltol=1e-8' });
	const fwd = tempsC.map((t, ti) => CURRENTS.map((i, j) => ({ t, i, v: res.get(prints[ti * CURRENTS.length + j]) as number })));
	const revPts = reverse
		? reverse.v.map((v, j) => ({ t: tempsC[0], v, i: (res.get(rev[2 * j]) as number) + (res.get(rev[2 * j + 1]) as number) }))
		: [];
	return { fwd: fwd.flat(), rev: revPts };
}

/** CSV with 3 traces, two current ranges, 2 % current noise and ±0.2 mV voltage noise (seeded). */
function noisyCsv(points: { t: number; i: number; v: number }[], seed: number, noise = true): string {
	const rand = mulberry32(seed);
	const rows = ['V (V),I (A),Trace,Range,Temp (°C)'];
	for (let trace = 1; trace <= 3; trace++)
		for (const p of points) {
			const dv = noise ? (rand() - 0.5) * 4e-4 : 0;
			const di = noise ? 1 + (rand() - 0.5) * 0.04 : 1;
			rows.push(`${p.v + dv},${p.i * di},${trace},${Math.abs(p.i) < 1e-6 ? '1uA' : '10mA'},${p.t}`);
		}
	return rows.join('\n');
}

describe('fitting ngspice-generated sweeps', () => {
	it.each([
		{ IS: 1e-14, N: 1.05, RS: 5 },
		{ IS: 1e-12, N: 1.8, RS: 10 },
		{ IS: 2e-15, N: 1.3, RS: 8 },
		{ IS: 1e-8, N: 1.1, RS: 3, EG: 0.69, XTI: 2 }
	])('recovers %j (N 2 %, IS ×1.3, RS 20 %)', (truth) => {
		const { fwd } = ngspiceForward(truth, [25]);
		// The RS criterion only applies where RS·Imax is at least 5 % of the voltage.
		const last = fwd[fwd.length - 1];
		expect(truth.RS * last.i).toBeGreaterThanOrEqual(0.05 * last.v);
		const r = fitSweepCsv(noisyCsv(fwd, 42), { material: truth.EG ? 'schottky' : 'silicon' });
		// Compare IS at the fit's TNOM (25 °C) with the truth scaled to 25 °C.
		const m = createModel(truth);
		const Tk = celsiusToKelvin(25);
		const ratio = Tk / celsiusToKelvin(27);
		const is25 = m.IS * Math.pow(ratio, m.XTI / m.N) * Math.exp(((ratio - 1) * m.EG) / (m.N * thermalVoltage(Tk)));
		expect(r.model.TNOM).toBe(25);
		expect(Math.abs(r.model.N / truth.N - 1)).toBeLessThan(0.02);
		expect(Math.max(r.model.IS / is25, is25 / r.model.IS)).toBeLessThan(1.3);
		expect(Math.abs(r.model.RS / truth.RS - 1)).toBeLessThan(0.2);
		expect(r.interval.N[0]).toBeLessThan(r.model.N);
		expect(r.interval.N[1]).toBeGreaterThan(r.model.N);
		expect(r.interval.IS[0]).toBeLessThan(r.model.IS);
		expect(r.quality.points).toBeGreaterThan(30);
		expect(r.quality.rmsResidualV).toBeLessThan(1e-3);
		expect(r.range.currentA[0]).toBeGreaterThan(0);
		expect(r.range.currentA[1]).toBeGreaterThan(1e-3);
	});

	it('RS = 0: agrees with an independent linear regression (simple-statistics)', () => {
		const truth = { IS: 5e-15, N: 1.0, RS: 0 };
		const { fwd } = ngspiceForward(truth, [25]);
		const csv = noisyCsv(fwd, 7);
		const r = fitSweepCsv(csv);
		// V = N·Vt·ln I − N·Vt·ln IS when I ≫ IS: regress V on ln I over the same noisy rows.
		const pts = csv
			.split('\n')
			.slice(1)
			.map((l) => l.split(',').map(Number))
			.map(([v, i]) => [Math.log(i), v]);
		const { m: slope, b } = linearRegression(pts);
		const vt = thermalVoltage(celsiusToKelvin(25));
		expect(Math.abs(r.model.N / (slope / vt) - 1)).toBeLessThan(0.01);
		const isReg = Math.exp(-b / slope);
		expect(Math.max(r.model.IS / isReg, isReg / r.model.IS)).toBeLessThan(1.3);
		expect(r.model.RS).toBeLessThan(0.05);
	});

	it('estimates EG from two temperatures with XTI held', () => {
		const truth = { IS: 1e-14, N: 1.2, RS: 2, EG: 1.11, XTI: 3 };
		const { fwd } = ngspiceForward(truth, [25, 85]);
		const r = fitSweepCsv(noisyCsv(fwd, 3));
		expect(r.interval.EG).toBeDefined();
		expect(Math.abs((r.model.EG as number) - 1.11)).toBeLessThan(0.03);
		expect(r.range.temperatureC).toEqual([25, 85]);
		expect(Math.abs(r.model.N / 1.2 - 1)).toBeLessThan(0.02);
	});

	it('fits a shunt from reverse points and records that reverse leakage was measured', () => {
		const truth = { IS: 1e-13, N: 1.5, RS: 5 };
		const rsh = 2e8;
		const { fwd, rev } = ngspiceForward(truth, [25], { v: [-10, -7, -5, -3, -2, -1, -0.5], rsh });
		// Forward points include the shunt too, negligible against µA-level currents; reverse points use ngspice values.
		const r = fitSweepCsv(noisyCsv([...rev, ...fwd.filter((p) => p.i > 1e-7)], 5));
		expect(r.model.RSH).toBeDefined();
		expect(Math.abs((r.model.RSH as number) / rsh - 1)).toBeLessThan(0.2);
		// The shunt is kept only when resolved from zero, so its 95 % interval is finite on both ends.
		const iv = r.interval.RSH as [number, number];
		expect(iv[0]).toBeLessThan(r.model.RSH as number);
		expect(iv[1]).toBeGreaterThan(r.model.RSH as number);
		expect(Number.isFinite(iv[1])).toBe(true);
		expect(r.range.reverseMeasured).toBe(true);
		expect(r.range.voltageV[0]).toBeCloseTo(-10, 2);
	});
});

describe('refusing to fit', () => {
	const base = (rows: [number, number][]) => 'V,I\n' + rows.map(([v, i]) => `${v},${i}`).join('\n');
	const fitErr = (text: string) => {
		try {
			fitSweepCsv(text, { temperatureC: 25 });
		} catch (e) {
			expect(e).toBeInstanceOf(FitError);
			return (e as FitError).reasons.join(' | ');
		}
		throw new Error('expected FitError');
	};
	it.each([
		['too few points', base([[0.3, 1e-9], [0.4, 5e-8], [0.5, 2e-6], [0.6, 1e-4]]), /too few forward points/],
		['less than a decade', base([[0.50, 1e-6], [0.51, 1.3e-6], [0.52, 1.6e-6], [0.53, 2e-6], [0.54, 2.5e-6], [0.55, 3e-6]]), /decades/],
		['non-monotonic', base([[0.3, 1e-9], [0.35, 1e-6], [0.4, 1e-9], [0.45, 1e-5], [0.5, 1e-8], [0.55, 1e-4], [0.6, 1e-3]]), /not monotonic/],
		['wrong sign', base([[0.3, -1e-9], [0.4, -5e-8], [0.5, -2e-6], [0.6, -1e-4], [0.7, -1e-3]]), /wrong sign/],
		['reverse only', base([[-1, -1e-12], [-2, -2e-12], [-3, -3e-12], [-4, -4e-12]]), /no forward-bias points/]
	] as const)('%s', (_n, text, pattern) => {
		expect(fitErr(text)).toMatch(pattern);
	});

});

describe('wide-gap parts measured at one temperature', () => {
	it('use the assumed EG of 1.9 eV, marked on the model and in a warning', () => {
		const { fwd } = ngspiceForward({ IS: 1e-14, N: 1.05, RS: 5 }, [25]);
		const r = fitSweepCsv(noisyCsv(fwd, 1), { material: 'wide-gap' });
		expect(r.model.EG).toBe(MATERIAL_DEFAULTS['wide-gap'].EG);
		expect(r.model.egAssumed).toBe(true);
		expect(r.warnings.some((w) => /EG 1\.9 eV assumed/.test(w.message))).toBe(true);
	});

	it('are not marked when EG is given', () => {
		const { fwd } = ngspiceForward({ IS: 1e-14, N: 1.05, RS: 5 }, [25]);
		const r = fitSweepCsv(noisyCsv(fwd, 1), { material: 'wide-gap', EG: 2.4 });
		expect(r.model.EG).toBe(2.4);
		expect(r.model.egAssumed).toBeUndefined();
		expect(r.warnings.some((w) => /assumed/.test(w.message))).toBe(false);
	});
});

describe('excluding a voltage window', () => {
	// A heating tail: above 0.75 V the measured current sags to a third of the model's.
	const truth = { IS: 2e-15, N: 1.3, RS: 8 };
	const withTail = () => {
		const { fwd } = ngspiceForward(truth, [25]);
		return fwd.map((p) => (p.v > 0.75 ? { ...p, i: p.i / 3 } : p));
	};

	it('leaves the points inside [lo, hi] out of the fit and counts them', () => {
		const pts = withTail();
		const inside = pts.filter((p) => p.v >= 0.75 && p.v <= 5).length;
		expect(inside).toBeGreaterThan(3);
		const csv = noisyCsv(pts, 9, false);
		const spoiled = fitSweepCsv(csv);
		const r = fitSweepCsv(csv, { excludeV: [0.75, 5] });
		// Three traces per point in the CSV, merged into one point each.
		expect(r.quality.excluded).toBe(3 * inside);
		expect(r.range.voltageV[1]).toBeLessThan(0.75);
		expect(Math.abs(r.model.N / truth.N - 1)).toBeLessThan(0.01);
		expect(Math.abs(spoiled.model.N / truth.N - 1)).toBeGreaterThan(Math.abs(r.model.N / truth.N - 1));
		expect(spoiled.quality.excluded).toBeUndefined();
	});

	it('refuses an inverted or non-finite window', () => {
		const csv = noisyCsv(withTail(), 9, false);
		expect(() => fitSweepCsv(csv, { excludeV: [0.8, 0.7] })).toThrow(RangeError);
		expect(() => fitSweepCsv(csv, { excludeV: [NaN, 1] })).toThrow(RangeError);
	});

	it('reports a run left without enough forward points as a fit error', () => {
		const csv = noisyCsv(withTail(), 9, false);
		expect(() => fitSweepCsv(csv, { excludeV: [0, 5] })).toThrow(FitError);
	});
});
