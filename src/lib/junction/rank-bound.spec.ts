// The rank core's statistical bound, the basis of ranking and measured before given evidence.
import { describe, expect, it } from 'vitest';
import { CatalogueTable, toleranceFactor, logNormalUpperBound, type PartRecord } from './rank';
import { createModel } from './model';
import { diodeCurrent } from './shockley';
import { mulberry32 } from '../random';
import { expectRelClose, part } from './test-helpers';

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
