import { expect, test } from 'vitest';
import { match } from './id';

test.each([
	['1', true],
	['42', true],
	['2147483647', true], // PostgreSQL integer maximum (PostgreSQL 15 manual, §8.1.1)
	['2147483648', false],
	['9999999999', false],
	['0', false],
	['01', false],
	['-1', false],
	['1e3', false],
	['', false],
	['abc', false]
])('id matcher: %s → %s', (p, want) => expect(match(p)).toBe(want));
