/**
 * Assertion helpers shared by the junction specs (not exported from index.ts).
 */
import { expect } from 'vitest';
import { createModel, type JunctionModelInput } from './model';
import type { PartRecord } from './rank-types';

/** |a − b| / max(|a|, |b|), with 0 when both are exactly 0. */
export function relativeDifference(a: number, b: number): number {
	if (a === b) return 0;
	return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

/** Assert |actual − expected| ≤ rel·max(|actual|, |expected|), with a readable message. */
export function expectRelClose(actual: number, expected: number, rel: number, label = ''): void {
	const d = relativeDifference(actual, expected);
	expect(
		d <= rel,
		`${label} actual ${actual} vs expected ${expected}: relative difference ${d.toExponential(3)} > ${rel}`
	).toBe(true);
}

/** Assert |actual − expected| ≤ abs. */
export function expectAbsClose(actual: number, expected: number, abs: number, label = ''): void {
	const d = Math.abs(actual - expected);
	expect(d <= abs, `${label} actual ${actual} vs expected ${expected}: |difference| ${d.toExponential(3)} > ${abs}`).toBe(
		true
	);
}

/** A measured catalogue part of three samples around IS (×0.9, ×1, ×1.2) for the rank specs. */
export function part(id: string, IS: number, over: Partial<PartRecord> = {}, extra: Partial<JunctionModelInput> = {}): PartRecord {
	return {
		id,
		kind: 'diode',
		samples: [0.9, 1, 1.2].map((f) => createModel({ IS: IS * f, N: 1.1, RS: 1, ...extra })),
		ratings: { reverseV: 50 },
		measured: { minAbsCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true },
		fitRmsResidualV: 2e-4,
		...over
	};
}
