import { describe, expect, it } from 'vitest';
import { bestOf, inRankOrder } from './compare';

const part = (partNumber: string, typical: number, worst: number, bound: number | null, meetsLimits = true, evidence: 'measured' | 'given' = 'measured') => ({
	partNumber,
	meetsLimits,
	evidence,
	leakageA: { typical, worst, bound }
});

describe('compare order and best values', () => {
	it('orders as the ranking does, whatever order the parts came in', () => {
		const a = part('A', 1e-12, 3e-12, 9e-12);
		const b = part('B', 2e-12, 2e-12, 4e-12);
		const noBound = part('C', 1e-13, 1e-13, null);
		const given = part('D', 1e-15, 1e-15, 1e-15, true, 'given');
		const failing = part('E', 1e-16, 1e-16, 1e-16, false);
		const ticked = [failing, given, noBound, a, b];
		expect(inRankOrder(ticked, 'bound').map((p) => p.partNumber)).toEqual(['B', 'A', 'C', 'D', 'E']);
		expect(inRankOrder(ticked, 'typical').map((p) => p.partNumber)).toEqual(['C', 'A', 'B', 'D', 'E']);
		expect(inRankOrder([b, a], 'worst').map((p) => p.partNumber)).toEqual(inRankOrder([a, b], 'worst').map((p) => p.partNumber));
	});

	it('marks the lowest value (or the highest margin), ties included, and nothing when there is nothing to choose', () => {
		expect(bestOf([3, 1, 2])).toEqual([1]);
		expect(bestOf([3, 1, 1])).toEqual([1, 2]);
		expect(bestOf([3, 1, 2], true)).toEqual([0]);
		expect(bestOf([2, 2])).toEqual([]);
		expect(bestOf([null, 2])).toEqual([]);
		expect(bestOf([null, 2, 5])).toEqual([1]);
	});
});
