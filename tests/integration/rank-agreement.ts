// How far two ranked lists (RankResponse bodies) are apart: the largest relative
// difference between any two numbers at the same place, whether the order of part ids is
// the same, and the first place where anything but a number differs.
import type { RankResponse } from '../../src/lib/schemas/rank';

export type Agreement = { maxRelative: number; sameOrder: boolean; mismatch: string | null };

/** |a − b| / max(|a|, |b|), 0 when both are equal (NaN and ±Infinity only equal themselves). */
function relative(a: number, b: number): number {
	if (Object.is(a, b)) return 0;
	if (!Number.isFinite(a) || !Number.isFinite(b)) return Infinity;
	return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

export function agreement(browser: RankResponse, server: RankResponse): Agreement {
	let maxRelative = 0;
	let mismatch: string | null = null;
	const walk = (a: unknown, b: unknown, at: string) => {
		if (typeof a === 'number' && typeof b === 'number') maxRelative = Math.max(maxRelative, relative(a, b));
		else if (a && b && typeof a === 'object' && typeof b === 'object') {
			const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
			for (const k of keys) walk((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${at}.${k}`);
		} else if (a !== b && mismatch === null) mismatch = `${at}: ${JSON.stringify(a)} in the browser, ${JSON.stringify(b)} on the server`;
	};
	walk(browser, server, 'ranking');
	const ids = (r: RankResponse) => r.items.map((i) => i.id).join(',');
	return { maxRelative, sameOrder: ids(browser) === ids(server), mismatch };
}
