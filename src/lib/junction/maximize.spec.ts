import { describe, expect, it } from 'vitest';
import { evenGrid, refineMaximum } from './maximize';

describe('evenGrid', () => {
	it('includes both ends exactly and spaces the points evenly', () => {
		const xs = evenGrid(-2, 2, 101);
		expect(xs.length).toBe(101);
		expect(xs[0]).toBe(-2);
		expect(xs[100]).toBe(2);
		expect(xs[50]).toBeCloseTo(0, 14);
		expect(Array.from(evenGrid(1, 1, 7))).toEqual([1]);
	});

	it('refuses an empty or reversed interval', () => {
		expect(() => evenGrid(1, 0, 5)).toThrow(RangeError);
		expect(() => evenGrid(0, 1, 0)).toThrow(RangeError);
		expect(() => evenGrid(0, Number.NaN, 5)).toThrow(RangeError);
	});
});

describe('refineMaximum', () => {
	const sample = (f: (x: number) => number, lo: number, hi: number, n: number) => {
		const xs = evenGrid(lo, hi, n);
		return { xs, ys: xs.map(f) };
	};

	// A Lorentzian peak narrower than the grid step: the best grid point alone misses its
	// height by far; the refinement recovers it (the peak is at 0.3137, height 1).
	it('finds a peak between grid points to well within 1 %', () => {
		const f = (x: number) => 1 / (1 + ((x - 0.3137) / 0.006) ** 2);
		const { xs, ys } = sample(f, -1, 1, 101);
		expect(Math.max(...ys)).toBeLessThan(0.7);
		const m = refineMaximum(f, xs, ys);
		expect(m.y).toBeGreaterThan(0.999999);
		expect(m.x).toBeCloseTo(0.3137, 5);
	});

	it('keeps an end of the interval when the function rises towards it', () => {
		const f = (x: number) => Math.exp(3 * x);
		const { xs, ys } = sample(f, -2, 2, 21);
		expect(refineMaximum(f, xs, ys)).toEqual({ x: 2, y: Math.exp(6) });
		const g = (x: number) => -x;
		const s = sample(g, -2, 2, 21);
		expect(refineMaximum(g, s.xs, s.ys)).toEqual({ x: -2, y: 2 });
	});

	it('is never worse than the best grid point, even for a function that is not unimodal there', () => {
		const f = (x: number) => Math.sin(40 * x) + 0.1 * x;
		const { xs, ys } = sample(f, 0, 1, 11);
		expect(refineMaximum(f, xs, ys).y).toBeGreaterThanOrEqual(Math.max(...ys));
	});

	it('handles a one-point grid and refuses a mismatched one', () => {
		expect(refineMaximum(() => 1, [0], [5])).toEqual({ x: 0, y: 5 });
		expect(() => refineMaximum(() => 1, [0, 1], [5])).toThrow(RangeError);
	});
});
