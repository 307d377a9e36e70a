/**
 * The short list selected in one pass (rank-select.ts) against the catalogue ordered in full
 * (rank-order.ts, itself checked against the comparator sort and, through rank.spec.ts,
 * against Debian's ngspice): for random catalogues and operating points — ties, given
 * parts, one-sample parts, pending bounds, every basis, every limit, filters, parts over
 * their rating — the best k parts, their rows and every count must be the same.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CatalogueTable } from './catalogue-table';
import { createModel } from './model';
import type { OperatingPoint } from './operating-point';
import type { PartRecord } from './rank-types';

const RUNS = Number(process.env.FUZZ_RUNS ?? 150);

/** A few IS values, so that ties between parts (and between samples) are common. */
const IS_VALUES = [1e-15, 3e-14, 1e-12, 2e-12, 5e-11];

const sampleArb = fc.record({
	IS: fc.constantFrom(...IS_VALUES),
	N: fc.constantFrom(1, 1.05, 1.9),
	RS: fc.constantFrom(0, 5),
	RSH: fc.option(fc.constantFrom(1e9, 1e12), { nil: undefined }),
	CJO: fc.option(fc.constantFrom(1e-12, 8e-12), { nil: undefined })
});

const partArb = fc.record({
	samples: fc.array(sampleArb, { minLength: 1, maxLength: 4 }),
	given: fc.boolean(),
	reverseV: fc.option(fc.constantFrom(3, 10, 40), { nil: undefined }),
	forwardA: fc.option(fc.constantFrom(5e-3, 0.2), { nil: undefined }),
	included: fc.integer({ min: 0, max: 9 })
});

const opArb = fc.record({
	biasV: fc.constantFrom(-0.05, -2, -5, -12, -30, 0.3),
	temperatureC: fc.constantFrom(25, 85, 125),
	basis: fc.constantFrom('bound' as const, 'worst' as const, 'typical' as const),
	maxLeakageA: fc.option(fc.constantFrom(1e-13, 2e-12, 1e-9), { nil: undefined }),
	clamp: fc.boolean(),
	maxCapacitanceF: fc.option(fc.constantFrom(2e-12, 1e-11), { nil: undefined }),
	reverseMarginV: fc.option(fc.constantFrom(0, 2), { nil: undefined }),
	includeOverRating: fc.boolean(),
	filtered: fc.boolean()
});

type PartDraw = typeof partArb extends fc.Arbitrary<infer T> ? T : never;

function catalogue(parts: PartDraw[]): PartRecord[] {
	return parts.map((p, i) => ({
		id: `P${i}`,
		kind: 'diode',
		samples: p.samples.map((s) => createModel(s)),
		evidence: p.given ? 'given' : 'measured',
		ratings: { reverseV: p.reverseV, forwardCurrentA: p.forwardA },
		measured: { minAbsCurrentA: 1e-13, temperaturesC: [25, 85], reverseMeasured: true }
	}));
}

describe('the short list selected in one pass', () => {
	it('lists the same parts, rows and counts as the catalogue ordered in full', () => {
		fc.assert(
			fc.property(fc.array(partArb, { minLength: 32, maxLength: 160 }), opArb, fc.integer({ min: 0, max: 10 }), (parts, o, k) => {
				const records = catalogue(parts);
				const n = records.length;
				const limit = Math.min(k, Math.floor(n / 16));
				const op: OperatingPoint = {
					biasV: o.biasV,
					temperatureC: o.temperatureC,
					basis: o.basis,
					maxLeakageA: o.maxLeakageA,
					maxCapacitanceF: o.maxCapacitanceF,
					reverseMarginV: o.reverseMarginV,
					includeOverRating: o.includeOverRating,
					...(o.clamp ? { clampCurrentA: 0.05, maxForwardDropV: 0.72 } : {})
				};
				const include = o.filtered ? Uint8Array.from(parts, (p) => (p.included > 2 ? 1 : 0)) : undefined;
				const table = new CatalogueTable(records);
				const full = table.rank(op, undefined, include ? { include } : {});
				const fullRows = table.rows(full, op, 0, limit);
				const short = table.rank(op, undefined, { limit, reuse: true, ...(include ? { include } : {}) });
				expect([...short.order]).toEqual([...full.order.subarray(0, limit)]);
				expect(table.rows(short, op, 0, limit)).toEqual(fullRows);
				expect([short.ranked, short.meetingLimits]).toEqual([full.ranked, full.meetingLimits]);
				expect([...short.excluded]).toEqual([...full.excluded]);
			}),
			{ numRuns: RUNS }
		);
	});

	it('takes the short path for such lists (a sixteenth of the parts or fewer)', () => {
		// Parts listed from leaky to tight: the full ordering and the one pass differ in what they
		// touch, so a table that took the wrong path would still agree; what tells them apart is
		// that the one pass leaves the unlisted parts' flags unwritten.
		const records = catalogue(
			Array.from({ length: 64 }, (_, i) => ({ samples: [{ IS: 1e-12 / (i + 1), N: 1, RS: 0, RSH: undefined, CJO: undefined }], given: false, reverseV: undefined, forwardA: undefined, included: 9 }))
		);
		const table = new CatalogueTable(records);
		const op: OperatingPoint = { biasV: -5, temperatureC: 25 };
		const short = table.rank(op, undefined, { limit: 4 });
		expect([...short.order]).toEqual([63, 62, 61, 60]);
		expect(short.flags[0]).toBe(0);
		const full = table.rank(op, undefined, { limit: 5 * 16 });
		expect(full.flags[0]).not.toBe(0);
	});
});
