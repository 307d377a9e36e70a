import { describe, expect, it } from 'vitest';
import { decadeAmpsTick, isDecade } from './decade-ticks';

describe('decade ticks', () => {
	it('names whole decades, tiny and large, and nothing between', () => {
		for (const v of [1e-15, 1e-12, 1e-3, 1, 10, 1e3]) expect(isDecade(v), String(v)).toBe(true);
		// Chart.js hands log ticks as floats such as 1.0000000000000001e-15.
		expect(isDecade(1.0000000000000001e-15)).toBe(true);
		for (const v of [2e-15, 5e-12, 0.3, 0, -1, Number.NaN]) expect(isDecade(v), String(v)).toBe(false);
	});

	it('labels a decade with its SI prefix and leaves the rest blank', () => {
		expect(decadeAmpsTick(1e-12)).toMatch(/^1\s*pA$/);
		expect(decadeAmpsTick('1e-9')).toMatch(/^1\s*nA$/);
		expect(decadeAmpsTick(3e-12)).toBe('');
	});
});
