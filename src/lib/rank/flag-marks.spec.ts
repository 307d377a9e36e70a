import { describe, expect, it } from 'vitest';
import { FLAG_CODES } from '$lib/junction/rank-flags';
import { NODE_FLAG_CODES } from '$lib/junction/node-limits';
import { FLAG_MARKS, flagMark } from './flag-marks';

describe('flag marks', () => {
	it('gives every flag a mark of at most three characters, no two alike', () => {
		const marks = FLAG_CODES.map((c) => FLAG_MARKS[c]);
		for (const m of marks) expect([...m].length).toBeLessThanOrEqual(3);
		expect(new Set(marks).size).toBe(FLAG_CODES.length);
	});

	it("gives the protected node's flags marks that no ranking flag uses for something else", () => {
		const codes = [...new Set([...FLAG_CODES, ...NODE_FLAG_CODES])];
		const marks = codes.map(flagMark);
		for (const m of marks) expect([...m].length).toBeLessThanOrEqual(3);
		expect(new Set(marks).size).toBe(codes.length);
	});
});
