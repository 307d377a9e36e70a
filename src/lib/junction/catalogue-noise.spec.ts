import { describe, expect, it } from 'vitest';
import { CatalogueTable, toleranceFactor, type PartRecord } from './rank';
import { createModel } from './model';
import { scaleModel } from './temperature';
import { solveBias } from './shockley';
import { SI_2019, celsiusToKelvin } from './constants';
import { expectRelClose } from './test-helpers';

const { q, k } = SI_2019;

function lot(id: string, IS: number, spread: number[], rsh?: number, over: Partial<PartRecord> = {}): PartRecord {
	return {
		id,
		kind: 'diode',
		samples: spread.map((f) => createModel({ IS: IS * f, N: 1, RS: 2, ...(rsh ? { RSH: rsh / f } : {}) })),
		ratings: { reverseV: 50 },
		measured: { minAbsCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true },
		fitRmsResidualV: 2e-4,
		...over
	};
}

/** 2q·(I + 2·IS) + 4kT/RSH of one sample written out (van der Ziel's form, Nyquist's shunt), I at the junction voltage. */
function samplePower(m: ReturnType<typeof createModel>, v: number, tC: number): number {
	const s = scaleModel(m, tC);
	const vd = solveBias(s, v).vd;
	const T = celsiusToKelvin(tC);
	const rsh = m.RSH === undefined ? Infinity : m.RSH / m.shuntFactorPer10K ** ((tC - m.TNOM) / 10);
	return 2 * q * (s.IS * Math.expm1(vd / s.nvt) + 2 * s.IS) + (4 * k * T) / rsh;
}

describe('current noise in the single-junction ranking', () => {
	const op = { biasV: -0.02, temperatureRangeC: [0, 70] as [number, number] };

	it('gives each listed part the median, noisiest and bound noise density at the bias and hot end', () => {
		const part = lot('a', 1e-12, [1, 3, 0.5, 1.4], 5e10);
		const table = new CatalogueTable([part]);
		const [row] = table.rows(table.rank(op), op);
		const powers = part.samples.map((m) => samplePower(m, op.biasV, 70));
		const sorted = [...powers].sort((x, y) => x - y);
		expectRelClose(row.noiseA_rtHz.typical, Math.sqrt(0.5 * (sorted[1] + sorted[2])), 1e-9);
		expectRelClose(row.noiseA_rtHz.worst, Math.sqrt(sorted[3]), 1e-9);
		// Log-normal tolerance bound over the powers, written out: exp(ȳ + k·s), y = ln S.
		const y = powers.map(Math.log);
		const mean = y.reduce((a, b) => a + b, 0) / y.length;
		const sd = Math.sqrt(y.reduce((a, b) => a + (b - mean) ** 2, 0) / (y.length - 1));
		expectRelClose(row.noiseA_rtHz.bound!, Math.sqrt(Math.exp(mean + toleranceFactor(4, 0.95, 0.9) * sd)), 1e-9);
		expect(row.noiseA_rtHz.bound!).toBeGreaterThan(row.noiseA_rtHz.worst);
	});

	it('has no bound for one sample or a given model', () => {
		const table = new CatalogueTable([lot('one', 1e-12, [1]), lot('given', 1e-12, [1, 2, 3], undefined, { evidence: 'given' })]);
		const rows = table.rows(table.rank({ ...op, basis: 'worst' }), op);
		for (const r of rows) expect(r.noiseA_rtHz.bound).toBeNull();
	});

	it('flags parts over a noise limit on the basis and lists them after those meeting it, with the same figures', () => {
		// At −5 V: the junction part sits on its saturation current (2q·IS of shot noise) and leaks
		// picoamps; the shunted part leaks V/RSH, far more, but its 4kT/RSH is the quieter.
		const op5 = { biasV: -5, temperatureRangeC: [0, 70] as [number, number] };
		const junction = lot('junction', 1e-14, [1, 1.2, 0.9]);
		const shunt = lot('shunt', 1e-17, [1, 1.2, 0.9], 1e12);
		const table = new CatalogueTable([junction, shunt]);
		const free = table.rows(table.rank(op5), op5);
		expect(free.map((r) => r.id)).toEqual(['junction', 'shunt']);
		const [j, s] = free.map((r) => r.noiseA_rtHz.bound!);
		expect(j).toBeGreaterThan(s);
		const limited = { ...op5, maxNoiseA_rtHz: Math.sqrt(j * s) };
		const res = table.rank(limited);
		const rows = table.rows(res, limited);
		expect(rows.map((r) => r.id)).toEqual(['shunt', 'junction']);
		expect(rows[1].flags).toContain('over-noise-limit');
		expect(rows[1].meetsLimits).toBe(false);
		expect(rows[0].flags).not.toContain('over-noise-limit');
		expect(res.meetingLimits).toBe(1);
		// The limit pass and the per-row figures agree.
		for (const r of rows) expect(r.noiseA_rtHz).toEqual(free.find((f) => f.id === r.id)!.noiseA_rtHz);
		// On the typical basis the junction part's median is held instead.
		const typical = { ...limited, basis: 'typical' as const, maxNoiseA_rtHz: 0.5 * (free[0].noiseA_rtHz.typical + free[0].noiseA_rtHz.worst) };
		expect(table.rows(table.rank(typical), typical).find((r) => r.id === 'junction')!.flags).not.toContain('over-noise-limit');
	});

	it('holds a part without a bound to its noisiest sample under the bound basis', () => {
		const single = lot('single', 1e-16, [1], 1e9);
		const table = new CatalogueTable([single]);
		const limited = { ...op, maxNoiseA_rtHz: 2e-15 };
		const [row] = table.rows(table.rank(limited), limited);
		expect(row.flags).toContain('over-noise-limit');
		expect(row.noiseA_rtHz.bound).toBeNull();
	});
});
