import { describe, expect, it } from 'vitest';
import { CatalogueTable, explainFlag, FLAG_CODES, type PartRecord } from './rank';
import { JUNCTION_KINDS } from './names';
import { mulberry32 } from '../random';
import { ModelTable } from './model-table';
import { createModel, type JunctionModelInput } from './model';
import { diodeCurrent, forwardVoltage } from './shockley';
import { junctionCapacitance } from './capacitance';
import { expectRelClose, part } from './test-helpers';
import { CODATA_2014 } from './constants';

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

	it('takes the worst forward drop from whichever end is higher: the hot end for a crafted N = 2 wide-gap part', () => {
		// V(I) = N·Vt·ln(I/IS(T) + 1) + I·RS with IS(T) = IS·(T/Tnom)^(XTI/N)·exp((T/Tnom − 1)·EG/(N·Vt)):
		// dV/dT > 0 when N·(k/q)·ln(I/IS) exceeds EG/Tnom + XTI·k/q, as here (IS 1e-20 A, N 2, EG 1.9 eV).
		const samples = [1, 1.3, 0.8].map((f) => createModel({ IS: 1e-20 * f, N: 2, RS: 5, EG: 1.9 }, 'wide-gap'));
		const rec: PartRecord = { ...part('led', 1e-20), kind: 'led', samples };
		const table = new CatalogueTable([rec]);
		const op = { biasV: -1, temperatureRangeC: [-20, 80] as [number, number], clampCurrentA: 1e-3, maxForwardDropV: 2.04 };
		const [row] = table.rows(table.rank(op), op);
		const d = row.forwardDropV as { hot: number; cold: number; worst: number };
		expect(d.hot).toBeGreaterThan(d.cold);
		// Largest sample (smallest IS, 0.8e-20 A) at the hot end.
		expectRelClose(d.worst, forwardVoltage(samples[2], 1e-3, 80), 1e-12);
		// The limit lies between the ends, so only the hot end can raise the flag.
		expect(forwardVoltage(samples[2], 1e-3, -20)).toBeLessThan(2.04);
		expect(d.worst).toBeGreaterThan(2.04);
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
		// Listed when asked for, but after the part within its rating (the rating is a limit it fails).
		const res2 = table.rank({ ...op, includeOverRating: true });
		expect(table.rows(res2, op).map((r) => [r.id, r.meetsLimits])).toEqual([
			['ok', true],
			['low-rated', false]
		]);
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

	it('uses the database kind names', () => {
		const table = new CatalogueTable(JUNCTION_KINDS.map((kind, k) => part(`k${k}`, 1e-15 * (k + 1), { kind })));
		const op = { biasV: -5, temperatureC: 25 };
		expect(table.rows(table.rank(op), op, 0, 10).map((r) => r.kind)).toEqual([...JUNCTION_KINDS]);
	});

	it('with a limit lists the same first parts as the full order, and counts all', () => {
		const r = mulberry32(5);
		// Twin parts (identical models) tie exactly and must stay in index order.
		const recs: PartRecord[] = [];
		for (let k = 0; k < 60; k++) recs.push(part(`p${k}`, 10 ** (-16 + 3 * r())));
		for (let k = 0; k < 20; k++) recs.push({ ...recs[k * 3], id: `twin${k}` });
		const table = new CatalogueTable(recs);
		const op = { biasV: -5, temperatureC: 60 };
		const full = table.rank(op);
		expect(full.ranked).toBe(80);
		for (const limit of [0, 1, 7, 79, 80, 500]) {
			const cut = table.rank(op, undefined, { limit });
			expect(cut.ranked).toBe(80);
			expect(Array.from(cut.order)).toEqual(Array.from(full.order.subarray(0, limit)));
		}
		expect(() => table.rank(op, undefined, { limit: -1 })).toThrow(RangeError);
	});

	it('gives the same result from the table\'s kept buffers (reuse) as from fresh arrays', () => {
		const r = mulberry32(9);
		const table = new CatalogueTable(Array.from({ length: 50 }, (_, k) => part(`p${k}`, 10 ** (-16 + 4 * r()), { ratings: { reverseV: 2 + 10 * r() } })));
		for (const op of [
			{ biasV: -5, temperatureRangeC: [0, 85] as [number, number], clampCurrentA: 1e-3, maxForwardDropV: 0.75 },
			{ biasV: -3, temperatureC: 40, includeOverRating: true, maxLeakageA: 1e-12 }
		]) {
			const fresh = table.rank(op, undefined, { limit: 20 });
			const kept = table.rank(op, undefined, { limit: 20, reuse: true });
			expect(table.rows(kept, op, 0, 20)).toEqual(table.rows(fresh, op, 0, 20));
			expect(Array.from(kept.excluded)).toEqual(Array.from(fresh.excluded));
			expect([kept.ranked, kept.meetingLimits]).toEqual([fresh.ranked, fresh.meetingLimits]);
		}
	});

	it('orders and counts only the parts an include mask lets through', () => {
		const table = new CatalogueTable([part('a', 1e-13), part('b', 1e-15, { ratings: { reverseV: 3 } }), part('c', 1e-14), part('d', 1e-16)]);
		const op = { biasV: -5, temperatureC: 25 };
		const res = table.rank(op, undefined, { include: Uint8Array.of(1, 1, 0, 1), limit: 1 });
		expect(Array.from(res.order)).toEqual([3]);
		expect(res.ranked).toBe(2);
		expect(Array.from(res.excluded)).toEqual([1]);
		expect(Array.from(table.rank(op, undefined, { include: Uint8Array.of(1, 0, 1, 0) }).excluded)).toEqual([]);
		expect(() => table.rank(op, undefined, { include: new Uint8Array(3) })).toThrow(RangeError);
	});

	it('lists parts meeting every stated limit first, each group by worst leakage', () => {
		// Invented: a red LED (N 2, IS 1e-20 A, EG 1.9 eV) drops about 1.9 V at 1 mA but leaks
		// almost nothing; silicon parts drop about 0.6–0.7 V. Under a 0.8 V limit the LED must
		// follow every silicon part that meets the limit, though its leakage is the lowest.
		const led: PartRecord = {
			...part('led', 1e-20, { kind: 'led' }),
			samples: [1, 1.2, 0.9].map((f) => createModel({ IS: 1e-20 * f, N: 2, RS: 5, EG: 1.9 }, 'wide-gap'))
		};
		const recs = [part('si-high', 1e-12), led, part('si-low', 1e-14), part('si-slow', 1e-15, {}, { RS: 300 }), part('si-mid', 1e-13)];
		const table = new CatalogueTable(recs);
		const op = { biasV: -5, temperatureRangeC: [0, 85] as [number, number], clampCurrentA: 1e-3, basis: 'worst' as const };
		// Without limits: leakage order only, and every part meets the (absent) limits.
		const free = table.rows(table.rank(op), op);
		expect(free.map((r) => r.id)).toEqual(['led', 'si-slow', 'si-low', 'si-mid', 'si-high']);
		expect(free.every((r) => r.meetsLimits)).toBe(true);
		const limited = { ...op, maxForwardDropV: 0.8 };
		const res = table.rank(limited);
		const rows = table.rows(res, limited);
		expect(rows.map((r) => [r.id, r.meetsLimits])).toEqual([
			['si-low', true],
			['si-mid', true],
			['si-high', true],
			['led', false],
			['si-slow', false]
		]);
		expect(rows[3].flags).toContain('forward-drop-over-limit');
		expect(rows[3].forwardDropV!.worst).toBeGreaterThan(1.5);
		expect(res.meetingLimits).toBe(3);
		expect(res.ranked).toBe(5);
		// A limit cutting inside either group gives the same first parts as the full order.
		for (const limit of [0, 1, 3, 4, 5, 9])
			expect(Array.from(table.rank(limited, undefined, { limit }).order)).toEqual(Array.from(res.order.subarray(0, limit)));
		// A leakage budget between si-low's and si-mid's worst leakage puts si-mid and si-high among the failing parts.
		const budget = { ...limited, maxLeakageA: 0.5 * (res.worstA[2] + res.worstA[4]) };
		const b = table.rows(table.rank(budget), budget);
		expect(b.map((r) => [r.id, r.meetsLimits])).toEqual([
			['si-low', true],
			['led', false],
			['si-slow', false],
			['si-mid', false],
			['si-high', false]
		]);
		expect(b[3].flags).toEqual(['over-leakage-target']);
	});

	it('holds capacitance against its limit for every part, not only the listed ones', () => {
		const cap = (id: string, IS: number, CJO: number) => part(id, IS, {}, { CJO, VJ: 0.7, M: 0.4 });
		const table = new CatalogueTable([cap('big', 1e-16, 50e-12), cap('small', 1e-13, 2e-12), part('unknown', 1e-14)]);
		const op = { biasV: -5, temperatureRangeC: [0, 50] as [number, number], maxCapacitanceF: 10e-12 };
		const res = table.rank(op, undefined, { limit: 2 });
		const rows = table.rows(res, op);
		// 'big' leaks least but is over the limit; a part without CJO is not held against it.
		expect(rows.map((r) => r.id)).toEqual(['unknown', 'small']);
		expectRelClose(res.capacitanceF[0], junctionCapacitance(table.part(0).samples[1], -5, 25), 1e-12);
		expect(res.flags[0] & (1 << FLAG_CODES.indexOf('over-capacitance-limit'))).not.toBe(0);
		expectRelClose(rows[1].capacitanceF!, junctionCapacitance(table.part(1).samples[1], -5, 25), 1e-12);
	});

	it('flags a wide-gap part whose band gap was assumed, and not one whose band gap was given', () => {
		const wide = (id: string, extra: Partial<JunctionModelInput>): PartRecord => ({
			...part(id, 1e-20),
			samples: [1, 1.1, 0.9].map((f) => createModel({ IS: 1e-20 * f, N: 2, ...extra }, 'wide-gap'))
		});
		const table = new CatalogueTable([wide('assumed', {}), wide('given', { EG: 2.9 }), part('silicon', 1e-15)]);
		const op = { biasV: -5, temperatureC: 25 };
		const flags = new Map(table.rows(table.rank(op), op).map((r) => [r.id, r.flags]));
		expect(flags.get('assumed')).toContain('band-gap-assumed');
		expect(flags.get('given')).not.toContain('band-gap-assumed');
		expect(flags.get('silicon')).not.toContain('band-gap-assumed');
	});

	it('gives the same numbers from kept temperature scaling as from a fresh table, across many temperatures and both constant sets', () => {
		const recs = [
			part('plain', 1e-14),
			part('shunt', 1e-13, {}, { RSH: 1e7 }),
			part('rec', 1e-14, {}, { ISR: 1e-11 }),
			part('bv', 1e-14, {}, { BV: 6.2, CJO: 2e-12 })
		];
		const table = new CatalogueTable(recs);
		const ops = Array.from({ length: 12 }, (_, k) => ({
			biasV: k % 2 ? -7 : -2,
			temperatureRangeC: [-40 + 5 * k, 25 + 10 * k] as [number, number],
			clampCurrentA: k % 3 ? 1e-3 : 1e-2,
			maxForwardDropV: 0.7,
			maxCapacitanceF: 1e-12
		}));
		const first = ops.map((op) => table.rank(op));
		// A caller writing into a result does not change the kept forward drops.
		table.rank(ops[0]).dropWorstV.fill(-1);
		// Repeat (kept scaling hits), after more temperatures than the table keeps (evictions), and with CODATA 2014.
		for (const [k, op] of ops.entries()) {
			const again = table.rank(op);
			const fresh = new CatalogueTable(recs).rank(op);
			for (const col of ['worstA', 'typicalA', 'dropWorstV', 'dropHotV', 'dropColdV', 'capacitanceF', 'flags'] as const) {
				expect(Array.from(again[col])).toEqual(Array.from(fresh[col]));
				expect(Array.from(first[k][col])).toEqual(Array.from(fresh[col]));
			}
			const codata = table.rank(op, CODATA_2014);
			const freshCodata = new CatalogueTable(recs).rank(op, CODATA_2014);
			expect(Array.from(codata.worstA)).toEqual(Array.from(freshCodata.worstA));
			expect(Array.from(codata.worstA)).not.toEqual(Array.from(fresh.worstA));
			expect(Array.from(codata.dropWorstV)).toEqual(Array.from(freshCodata.dropWorstV));
			expect(Array.from(codata.dropWorstV)).not.toEqual(Array.from(fresh.dropWorstV));
		}
		// Same temperatures, another clamp current: drops at that current.
		for (const clampCurrentA of [1e-4, 1e-3, 1e-1]) {
			const op = { ...ops[4], clampCurrentA };
			expect(Array.from(table.rank(op).dropWorstV)).toEqual(Array.from(new CatalogueTable(recs).rank(op).dropWorstV));
		}
		// And the kept values are the scalar engine's.
		const op = ops[5];
		const hot = op.temperatureRangeC[1];
		recs.forEach((r, p) => expectRelClose(table.rank(op).worstA[p], Math.max(...r.samples.map((m) => -diodeCurrent(m, op.biasV, hot))), 1e-12));
	});

	it('every flag has an explanation', () => {
		for (const c of FLAG_CODES) expect(explainFlag(c)).toMatch(/\w/);
	});
});
