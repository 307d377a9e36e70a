import { expect, test } from 'vitest';
import { WindowLimiter } from './rate-limit';

test('a window limiter allows max hits per window per key, then resets', () => {
	const limiter = new WindowLimiter(3, 1000);
	const at = 10_000;
	expect([1, 2, 3, 4].map(() => limiter.allow('a', at))).toEqual([true, true, true, false]);
	expect(limiter.allow('b', at)).toBe(true);
	expect(limiter.allow('a', at + 999)).toBe(false);
	expect(limiter.allow('a', at + 1000)).toBe(true);
});
