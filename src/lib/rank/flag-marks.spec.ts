import { describe, expect, it } from 'vitest';
import { FLAG_CODES } from '$lib/junction/rank-flags';
import { FLAG_MARKS } from './flag-marks';

describe('flag marks', () => {
	it('gives every flag a mark of at most three characters, no two alike', () => {
		const marks = FLAG_CODES.map((c) => FLAG_MARKS[c]);
		for (const m of marks) expect([...m].length).toBeLessThanOrEqual(3);
		expect(new Set(marks).size).toBe(FLAG_CODES.length);
	});
});
