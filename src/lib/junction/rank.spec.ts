import { describe, expect, it } from 'vitest';
import { CatalogueTable, explainFlag, FLAG_CODES, type PartRecord } from './rank';
import { ModelTable } from './model-table';
import { createModel, type JunctionModelInput } from './model';
import { diodeCurrent, forwardVoltage } from './shockley';
import { junctionCapacitance } from './capacitance';
import { expectRelClose } from './test-helpers';

function part(id: string, IS: number, over: Partial<PartRecord> = {}, extra: Partial<JunctionModelInput> = {}): PartRecord {
	return {
		id,
		kind: 'diode',
		samples: [0.9, 1, 1.2].map((f) => createModel({ IS: IS * f, N: 1.1, RS: 1, ...extra })),
		ratings: { reverseV: 50 },
		measured: { minAbsCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true },
		fitRmsResidualV: 2e-4,
		...over
	};
}

describe('model table (vectorised) equals the scalar engine', () => {
	it('for plain, shunted, recombination and breakdown models', () => {
		const models = [
			createModel({ IS: 1e-15, N: 1, RS: 0 }),
			createModel({ IS: 1e-12, N: 1.8, RS: 3, RSH: 1e8 }),
			createModel({ IS: 1e-14, N: 1.1, RS: 0.5, ISR: 1e-11 }),
			createModel({ IS: 1e-14, N: 1.1, RS: 0.5, BV: 6.2 }),
			createModel({ IS: 1e-8, N: 1.05, RS: 2, EG: 0.69, XTI: 2 }, 'schottky')
		];
		const t = new ModelTable(models);
		const out = new Float64Array(models.length);
		for (const V of [-10, -1, -0.01, 0.3, 0.7])
			for (const tC of [-40, 25, 125]) {
				t.currents(V, tC, out);
				models.forEach((m, j) => expectRelClose(out[j], diodeCurrent(m, V, tC), 1e-12, `${j} ${V} ${tC}`));
			}
		t.forwardVoltages(1e-3, 85, out);
		models.forEach((m, j) => expectRelClose(out[j], forwardVoltage(m, 1e-3, 85), 1e-12));
	});
});

describe('rank core', () => {
	it('orders by worst-case leakage at the hot end, lowest first', () => {
		const table = new CatalogueTable([part('mid', 1e-13), part('low', 1e-15), part('high', 1e-11)]);
		const op = { biasV: -5, temperatureRangeC: [0, 70] as [number, number] };
		const res = table.rank(op);
		const rows = table.rows(res, op);
		expect(rows.map((r) => r.id)).toEqual(['low', 'mid', 'high']);
		// worst = largest sample at the hot end; typical = median sample.
		const low = table.part(1);
		expectRelClose(rows[0].leakageA.worst, -diodeCurrent(low.samples[2], -5, 70), 1e-12);
		expectRelClose(rows[0].leakageA.typical, -diodeCurrent(low.samples[1], -5, 70), 1e-12);
		expect(rows[0].flags).toEqual([]);
	});

	it('reports forward drop at the clamp current: worst at the cold end', () => {
		const table = new CatalogueTable([part('a', 1e-14)]);
		const op = { biasV: -1, temperatureRangeC: [-20, 80] as [number, number], clampCurrentA: 1e-3, maxForwardDropV: 0.5 };
		const [row] = table.rows(table.rank(op), op);
		const d = row.forwardDropV as { hot: number; cold: number; worst: number };
		expect(d.cold).toBeGreaterThan(d.hot);
		expectRelClose(d.worst, forwardVoltage(table.part(0).samples[0], 1e-3, -20), 1e-12);
		expect(row.flags).toContain('forward-drop-over-limit');
	});

	it('gives capacitance at the bias when CJO is known', () => {
		const table = new CatalogueTable([part('c', 1e-14, {}, { CJO: 2e-12, VJ: 0.7, M: 0.4 })]);
		const op = { biasV: -5, temperatureC: 27 };
		const [row] = table.rows(table.rank(op), op);
		expectRelClose(row.capacitanceF as number, junctionCapacitance(table.part(0).samples[1], -5, 27), 1e-12);
	});

	// Each crafted part raises one flag.
	const cases: [string, PartRecord, Record<string, unknown>][] = [
		['current-extrapolated', part('x', 1e-15, { measured: { minAbsCurrentA: 1e-9, temperaturesC: [25], reverseMeasured: true } }), {}],
		['temperature-extrapolated', part('x', 1e-15, { measured: { minAbsCurrentA: 1e-15, temperaturesC: [25], reverseMeasured: true } }), { temperatureC: 60 }],
		['reverse-not-measured', part('x', 1e-15, { measured: { minAbsCurrentA: 1e-15, temperaturesC: [25], reverseMeasured: false } }), {}],
		['metal-semiconductor', part('x', 1e-15, { kind: 'schottky' }), {}],
		['light-sensitive', part('x', 1e-15, { transparentPackage: true }), {}],
		['light-sensitive', part('x', 1e-15, { kind: 'led' }), {}],
		['poor-fit', part('x', 1e-15, { fitRmsResidualV: 0.01 }), {}],
		['few-samples', { ...part('x', 1e-15), samples: [createModel({ IS: 1e-15 })] }, {}],
		['over-reverse-rating', part('x', 1e-15, { ratings: { reverseV: 6 } }), { includeOverRating: true, reverseMarginV: 2 }]
	];
	it.each(cases)('raises %s', (code, rec, opExtra) => {
		const table = new CatalogueTable([rec]);
		const op = { biasV: -5, temperatureC: 25, ...opExtra };
		const rows = table.rows(table.rank(op), op);
		expect(rows[0].flags).toContain(code);
		expect(explainFlag(code as (typeof FLAG_CODES)[number]).length).toBeGreaterThan(20);
	});

	it('excludes parts biased beyond their rating unless asked', () => {
		const table = new CatalogueTable([part('ok', 1e-13), part('low-rated', 1e-15, { ratings: { reverseV: 5 } })]);
		const op = { biasV: -5, temperatureC: 25, reverseMarginV: 1 };
		const res = table.rank(op);
		expect(table.rows(res, op).map((r) => r.id)).toEqual(['ok']);
		expect(Array.from(res.excluded)).toEqual([1]);
		const res2 = table.rank({ ...op, includeOverRating: true });
		expect(table.rows(res2, op).map((r) => r.id)).toEqual(['low-rated', 'ok']);
	});

	it('source resistance only lowers the forward current; refresh replaces content', () => {
		const table = new CatalogueTable([part('a', 1e-14)]);
		const f1 = table.rank({ biasV: 0.7, temperatureC: 25 }).worstA[0];
		const f2 = table.rank({ biasV: 0.7, temperatureC: 25, sourceResistanceOhm: 100 }).worstA[0];
		expect(f2).toBeLessThan(f1);
		table.refresh([part('b', 1e-15), part('c', 1e-16)]);
		expect(table.size).toBe(2);
		expect(table.sampleCount).toBe(6);
		expect(() => table.rank({ biasV: -1 })).toThrow(RangeError);
		expect(() => new CatalogueTable([{ ...part('e', 1e-15), samples: [] }])).toThrow(RangeError);
	});

	it('every flag has an explanation', () => {
		for (const c of FLAG_CODES) expect(explainFlag(c)).toMatch(/\w/);
	});
});
