import { describe, expect, it } from 'vitest';
import type { RankItem } from '$lib/schemas/rank';
import { limitMisses, nearestMisses } from './limit-misses';

type Item = Parameters<typeof limitMisses>[0] & Pick<RankItem, 'meetsLimits'> & { name: string };
const base: Omit<Item, 'name'> = {
	flags: [],
	forwardDropV: { cold: 0.6, hot: 0.5, worst: 0.6 },
	leakageA: { typical: 1e-12, worst: 2e-12, bound: 4e-12 },
	capacitanceF: 2e-12,
	ratedReverseV: 50,
	ratedForwardA: 0.2,
	meetsLimits: false
};
const op = { biasV: -5, temperatureRangeC: [25, 85] as [number, number], clampCurrentA: 1e-3, maxForwardDropV: 0.7, reverseMarginV: 1, maxCapacitanceF: 1e-12 };
const ranked = { basis: 'bound' as const, leakageBudgetA: 1e-12 };

describe('limit misses', () => {
	it('says which limit fails and by how much, value against limit', () => {
		const item: Item = {
			...base,
			name: 'a',
			forwardDropV: { cold: 1.42, hot: 1.3, worst: 1.42 },
			ratedReverseV: 5,
			flags: ['over-reverse-rating', 'forward-drop-over-limit', 'over-leakage-target', 'over-capacitance-limit']
		};
		const texts = limitMisses(item, op, ranked).map((m) => m.text);
		// The drop as in the example a designer reads: two decimals, value against limit.
		expect(texts).toEqual([
			'reverse 5 V + margin 1 V > rated 5 V',
			'drop 1.42 V > 0.70 V',
			'leakage 4 pA (statistical bound) > 1 pA',
			'capacitance 2 pF > 1 pF'
		]);
	});

	it('judges the budget on the worst sample where a part has no bound, and names the clamp above its forward rating', () => {
		const item: Item = { ...base, name: 'b', leakageA: { typical: 1e-12, worst: 3e-12, bound: null }, ratedForwardA: 1e-4, flags: ['over-leakage-target', 'over-forward-rating'] };
		const m = limitMisses(item, op, ranked);
		expect(m.map((x) => x.limit)).toEqual(['forward rating', 'leakage budget']);
		expect(m[0].text).toBe('clamp 1 mA > rated 100 µA');
		expect(m[0].ratio).toBeCloseTo(10, 12);
		expect(m[1].text).toMatch(/worst measured sample/);
	});

	it('lists nearest misses only when no part meets every limit: fewest failures first, then the smallest overshoot', () => {
		const twoFails: Item = { ...base, name: 'two', flags: ['forward-drop-over-limit', 'over-capacitance-limit'], forwardDropV: { cold: 0.71, hot: 0.7, worst: 0.71 } };
		const farDrop: Item = { ...base, name: 'far', flags: ['forward-drop-over-limit'], forwardDropV: { cold: 1.4, hot: 1.3, worst: 1.4 } };
		const nearDrop: Item = { ...base, name: 'near', flags: ['forward-drop-over-limit'], forwardDropV: { cold: 0.8, hot: 0.7, worst: 0.8 } };
		expect(nearestMisses([twoFails, farDrop, nearDrop], op, ranked).map((m) => m.item.name)).toEqual(['near', 'far', 'two']);
		expect(nearestMisses([twoFails, { ...nearDrop, meetsLimits: true, flags: [] }], op, ranked)).toEqual([]);
		expect(nearestMisses([], op, ranked)).toEqual([]);
	});
});
