// The rank core's ordering of part indices against a plain comparator sort.
import { describe, expect, it } from 'vitest';
import { orderByKey } from './rank';
import { mulberry32 } from '../random';

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
