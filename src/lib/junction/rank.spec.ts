import { describe, expect, it } from 'vitest';
import { CatalogueTable, explainFlag, FLAG_CODES, logNormalUpperBound, orderByKey, toleranceFactor, type PartRecord } from './rank';
import { JUNCTION_KINDS } from './names';
import { mulberry32 } from '../random';
import { ModelTable } from './model-table';
import { createModel, type JunctionModelInput } from './model';
import { diodeCurrent, forwardVoltage } from './shockley';
import { junctionCapacitance } from './capacitance';
import { expectRelClose } from './test-helpers';
import { CODATA_2014 } from './constants';

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

describe('ranking basis, statistical bound and evidence', () => {
	const op = { biasV: -5, temperatureRangeC: [0, 85] as [number, number] };
	/** A part whose samples' IS are the given multiples of `IS`. */
	const spread = (id: string, IS: number, factors: number[], over: Partial<PartRecord> = {}): PartRecord => ({
		...part(id, IS),
		samples: factors.map((f) => createModel({ IS: IS * f, N: 1.1, RS: 1 })),
		...over
	});

	it('gives the bound exp(ȳ + k·s) over the samples at the operating point, with its terms', () => {
		const rec = spread('p', 1e-14, [0.7, 1, 1.9, 1.3]);
		const table = new CatalogueTable([rec]);
		const [row] = table.rows(table.rank(op), op);
		// By hand from the engine's own per-sample currents at −5 V, 85 °C.
		const y = rec.samples.map((m) => Math.log(Math.abs(diodeCurrent(m, -5, 85))));
		const mean = y.reduce((a, b) => a + b) / 4;
		const sd = Math.sqrt(y.reduce((a, b) => a + (b - mean) ** 2, 0) / 3);
		const k = toleranceFactor(4, 0.95, 0.9); // 3.957, Natrella NBS Handbook 91 Table A-7 (γ 0.90, p 0.95, n 4)
		expectRelClose(k, 3.957, 2e-4);
		expectRelClose(row.leakageA.bound!, Math.exp(mean + k * sd), 1e-12);
		expect(row.bound).toEqual({ n: 4, k, coverage: 0.95, confidence: 0.9 });
		expect(row.evidence).toBe('measured');
		// Coverage and confidence are the designer's: a wider bound for 99 % of parts.
		const [wide] = table.rows(table.rank({ ...op, coverage: 0.99, confidence: 0.95 }), op);
		expectRelClose(wide.leakageA.bound!, Math.exp(mean + toleranceFactor(4, 0.99, 0.95) * sd), 1e-12);
		expect(wide.leakageA.bound!).toBeGreaterThan(row.leakageA.bound!);
		expect(() => table.rank({ ...op, coverage: 1.2 })).toThrow(RangeError);
		expect(() => table.rank({ ...op, basis: 'best' as never })).toThrow(RangeError);
	});

	it('a short list on the bound is the full order cut, each listed bound exact, with and without a budget', () => {
		// Short lists compute bounds only where they can matter (least sample below the list's
		// largest bound); this checks that shortcut against the full order, which computes all.
		const r = mulberry32(17);
		const recs: PartRecord[] = [];
		for (let k = 0; k < 1500; k++) {
			const n = 2 + Math.floor(r() * 5);
			// Half tight (bound just above the least sample, the case the shortcut must not cut), half up to two decades apart.
			const spreadOf = r() < 0.5 ? 1 + 0.05 * r() : 10 ** (2 * r());
			recs.push(spread(`p${k}`, 10 ** (-15 + 2 * r()), Array.from({ length: n }, () => spreadOf ** (r() - 0.5))));
		}
		// Equal samples and a one-sample part, where bound and least sample meet or there is no bound.
		recs.push(spread('flat', 3e-15, [1, 1, 1]), spread('one', 1e-16, [1]));
		// Leading the list: pairs with a low worst sample but a wide bound (k = 13.09 at n = 2) and
		// a ten-sample part whose worst sample is higher but whose bound is lowest; its least
		// sample sits just below the pairs' bounds, so only an exact cap keeps it in.
		for (let k = 0; k < 40; k++) recs.push(spread(`pair${k}`, 1e-17 * (1 + 0.001 * k), [1, 1.15]));
		recs.push(spread('tight', 1e-17, Array.from({ length: 10 }, (_, k) => 3.5 + 0.02 * k)));
		const table = new CatalogueTable(recs);
		for (const extra of [{}, { maxLeakageA: 2e-12 }, { coverage: 0.999, confidence: 0.999 }]) {
			const at = { ...op, ...extra };
			const full = table.rank(at);
			expect(table.part(full.order[0]).id).toBe('tight');
			for (const limit of [1, 10, 50, 93]) {
				const cut = table.rank(at, undefined, { limit });
				expect(Array.from(cut.order), `${JSON.stringify(extra)} limit ${limit}`).toEqual(Array.from(full.order.subarray(0, limit)));
				expect(cut.meetingLimits).toBe(full.meetingLimits);
				for (const row of table.rows(cut, at, 0, limit)) {
					const i = recs.findIndex((x) => x.id === row.id);
					const values = Array.from({ length: recs[i].samples.length }, (_, k) => Math.abs(cut.sampleA[table.sampleStart(i) + k]));
					if (values.length < 2) expect(row.leakageA.bound).toBeNull();
					else expectRelClose(row.leakageA.bound!, logNormalUpperBound(values, row.bound!.k), 1e-12);
				}
			}
		}
	});

	it('ranks a given-model part with the lowest IS after every measured part, under every basis', () => {
		const given = { ...spread('given', 1e-18, [1]), evidence: 'given' as const, measured: { minAbsCurrentA: 0, temperaturesC: [], reverseMeasured: false } };
		const table = new CatalogueTable([given, spread('a', 1e-13, [0.9, 1, 1.1]), spread('b', 1e-15, [0.9, 1, 1.1]), spread('one', 1e-12, [1])]);
		for (const basis of ['bound', 'worst', 'typical'] as const) {
			const rows = table.rows(table.rank({ ...op, basis }), op);
			expect(rows.at(-1)!.id, basis).toBe('given');
			expect(rows.at(-1)!.evidence).toBe('given');
			expect(rows.at(-1)!.bound).toBeNull();
		}
		// Even when it is the only part meeting a budget, it leads only the group meeting it.
		const budget = { ...op, maxLeakageA: 1e-20 };
		expect(table.rows(table.rank(budget), budget).map((r) => r.id)).toEqual(['b', 'a', 'one', 'given']);
	});

	it('under "bound" ranks a one-sample part after the parts with a bound; under "worst" by its one sample', () => {
		// 'one' leaks least of all, but one sample says nothing about the next reel.
		const table = new CatalogueTable([spread('wide', 1e-14, [0.2, 1, 5]), spread('one', 1e-16, [1]), spread('tight', 1e-13, [0.98, 1, 1.02])]);
		const bound = table.rows(table.rank(op), op);
		expect(bound.map((r) => r.id)).toEqual(['tight', 'wide', 'one']);
		expect(bound[2].leakageA.bound).toBeNull();
		// The wide spread makes its bound larger than tight's, although its worst sample leaks less.
		expect(bound[1].leakageA.worst).toBeLessThan(bound[0].leakageA.worst);
		expect(table.rows(table.rank({ ...op, basis: 'worst' }), op).map((r) => r.id)).toEqual(['one', 'wide', 'tight']);
		expect(table.rows(table.rank({ ...op, basis: 'typical' }), op).map((r) => r.id)).toEqual(['one', 'wide', 'tight']);
		// Limits cut the same first parts as the full order.
		const full = table.rank(op).order;
		for (const limit of [1, 2, 3]) expect(Array.from(table.rank(op, undefined, { limit }).order)).toEqual(Array.from(full.subarray(0, limit)));
	});

	it('judges the leakage budget on the basis (the worst sample where there is no bound)', () => {
		const table = new CatalogueTable([spread('wide', 1e-14, [0.2, 1, 5]), spread('one', 1e-14, [1])]);
		const res = table.rank(op);
		const budget = 0.5 * (res.worstA[0] + res.boundA[0]); // above wide's worst sample, below its bound
		const onBound = { ...op, maxLeakageA: budget };
		const rows = table.rows(table.rank(onBound), onBound);
		expect(rows.map((r) => [r.id, r.meetsLimits])).toEqual([
			['one', true],
			['wide', false]
		]);
		expect(rows[1].flags).toContain('over-leakage-target');
		const onWorst = { ...onBound, basis: 'worst' as const };
		expect(table.rows(table.rank(onWorst), onWorst).every((r) => r.meetsLimits)).toBe(true);
	});

	it('lists every sample at the operating point with withSamples', () => {
		const rec = spread('p', 1e-14, [0.5, 1, 2]);
		const table = new CatalogueTable([rec]);
		const [row] = table.rows(table.rank(op), op, 0, 10, undefined, { withSamples: true });
		row.sampleLeakageA!.forEach((a, i) => expectRelClose(a, -diodeCurrent(rec.samples[i], -5, 85), 1e-12));
		expect(row.leakageA.worst).toBe(Math.max(...row.sampleLeakageA!));
		expect(table.rows(table.rank(op), op)[0].sampleLeakageA).toBeUndefined();
	});

	it('flags a clamp current above the rated forward current as a limit', () => {
		const table = new CatalogueTable([part('small', 1e-14, { ratings: { reverseV: 50, forwardCurrentA: 0.01 } }), part('big', 1e-13)]);
		const clamp = { ...op, clampCurrentA: 0.05 };
		const rows = table.rows(table.rank(clamp), clamp);
		expect(rows.map((r) => [r.id, r.meetsLimits])).toEqual([
			['big', true],
			['small', false]
		]);
		expect(rows[1].flags).toEqual(['over-forward-rating']);
		expect(table.rows(table.rank({ ...op, clampCurrentA: 0.005 }), op)[0].flags).toEqual([]);
	});
});

describe('ordering by leakage', () => {
	// The reference: the comparator sort the ranking used before (worst, then typical, then index).
	const reference = (idx: number[], worst: Float64Array, typical: Float64Array) =>
		[...idx].sort((a, b) => worst[a] - worst[b] || typical[a] - typical[b] || a - b);

	it('equals the comparator sort, with and without a limit, on values that tie or differ by one ulp', () => {
		const r = mulberry32(17);
		for (let trial = 0; trial < 40; trial++) {
			const n = 1 + Math.floor(r() * 400);
			const worst = new Float64Array(n);
			const typical = new Float64Array(n);
			const pool = Array.from({ length: 1 + Math.floor(r() * 8) }, () => 10 ** (-20 + 15 * r()));
			for (let i = 0; i < n; i++) {
				const u = r();
				const base = pool[Math.floor(r() * pool.length)];
				// Exact ties, neighbours a few ulps apart (same truncated key), zeros and spread-out values.
				worst[i] = u < 0.3 ? base : u < 0.6 ? base * (1 + Math.floor(r() * 4) * Number.EPSILON) : u < 0.65 ? 0 : 10 ** (-20 + 15 * r());
				typical[i] = r() < 0.5 ? worst[i] / 2 : worst[i] * r();
			}
			// Every other part, to check that positions (not indices) are packed.
			const idx = Array.from({ length: n }, (_, i) => i).filter((i) => i % 2 === 0 || r() < 0.5);
			const want = reference(idx, worst, typical);
			for (const limit of [Infinity, 0, 1, 2, Math.floor(idx.length / 2), idx.length - 1, idx.length]) {
				const got = Array.from(orderByKey(Int32Array.from(idx), worst, typical, limit));
				expect(got).toEqual(want.slice(0, Math.min(limit, idx.length)));
				// With a work array (offset inside its buffer) the answer is the same.
				const scratch = new Float64Array(idx.length + 3).subarray(3);
				expect(Array.from(orderByKey(Int32Array.from(idx), worst, typical, limit, scratch))).toEqual(got);
			}
		}
	});

	it('takes the best of a long run of ties at the cut, by typical leakage then index', () => {
		const r = mulberry32(5);
		const n = 5000;
		// Most parts tie at one worst leakage (identical models, or none evaluable); a few lie below.
		const worst = Float64Array.from({ length: n }, (_, i) => (i % 97 === 0 ? 1e-15 * (1 + (i % 7)) : 0.5e-9));
		const typical = Float64Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 0.25e-9 : (1e-10 * Math.floor(r() * 4))));
		const idx = Int32Array.from({ length: n }, (_, i) => i);
		const want = reference([...idx], worst, typical);
		for (const limit of [1, 3, 50, 51, 52, 60, 200, 1300]) expect(Array.from(orderByKey(idx, worst, typical, limit))).toEqual(want.slice(0, limit));
		// All tied, typical NaN: index order.
		const zero = new Float64Array(n);
		const nan = new Float64Array(n).fill(NaN);
		expect(Array.from(orderByKey(idx, zero, nan, 50))).toEqual(Array.from({ length: 50 }, (_, i) => i));
	});

	it('gives the same first parts whether they are listed from tight to leaky, leaky to tight or mixed', () => {
		const n = 3000;
		const r = mulberry32(9);
		const orders = {
			rising: Float64Array.from({ length: n }, (_, i) => 1e-12 * (1 + i)),
			falling: Float64Array.from({ length: n }, (_, i) => 1e-12 * (n - i)),
			mixed: Float64Array.from({ length: n }, () => 1e-12 * Math.floor(1 + 50 * r()))
		};
		const typical = Float64Array.from({ length: n }, () => 1e-13 * Math.floor(1 + 3 * r()));
		const idx = Int32Array.from({ length: n }, (_, i) => i);
		for (const worst of Object.values(orders)) {
			const want = reference([...idx], worst, typical);
			for (const limit of [1, 10, 100, 187, 188, 400]) expect(Array.from(orderByKey(idx, worst, typical, limit))).toEqual(want.slice(0, limit));
		}
	});

	it('puts infinite and NaN leakage last (NaN after Infinity), ties by typical then index', () => {
		const worst = Float64Array.of(NaN, Infinity, 1e-12, Infinity, Number.MAX_VALUE, NaN, 0);
		const typical = Float64Array.of(1, 2, 1e-13, 1, 5, 0, 0);
		const idx = Int32Array.of(0, 1, 2, 3, 4, 5, 6);
		const want = [6, 2, 4, 3, 1, 5, 0];
		expect(Array.from(orderByKey(idx, worst, typical))).toEqual(want);
		for (let limit = 0; limit <= 7; limit++) expect(Array.from(orderByKey(idx, worst, typical, limit))).toEqual(want.slice(0, limit));
	});
});
