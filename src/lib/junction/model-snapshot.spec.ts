import { describe, expect, it } from 'vitest';
import { createModel } from './model';
import { CatalogueTable } from './catalogue-table';
import { decodeSnapshot, encodeSnapshot, SNAPSHOT_FORMAT_VERSION, SnapshotFormatError, type SnapshotPart } from './model-snapshot';
import { mulberry32 } from '../random';

/** A varied catalogue: measured parts with several samples, given parts, every optional field present and absent. */
function catalogue(n: number): SnapshotPart[] {
	const rand = mulberry32(77);
	return Array.from({ length: n }, (_, i) => {
		const given = i % 4 === 3;
		const samples = Array.from({ length: given ? 1 : 1 + (i % 5) }, () =>
			createModel(
				{
					IS: 1e-14 * Math.exp(4 * rand()),
					N: 1 + rand(),
					RS: rand() * 5,
					...(i % 2 ? { RSH: 10 ** (8 + 4 * rand()) } : {}),
					...(i % 3 === 0 ? { ISR: 1e-11 * rand(), NR: 2 } : {}),
					...(i % 5 === 0 ? { BV: 30 + rand(), NBV: 1.5 } : {}),
					...(i % 7 === 0 ? { CJO: 2e-12 * (1 + rand()), VJ: 0.7, M: 0.4 } : {})
				},
				(['silicon', 'schottky', 'germanium', 'wide-gap'] as const)[i % 4]
			)
		);
		return {
			id: 10 + i * 3,
			modelVersion: 1 + (i % 9),
			record: {
				id: String(10 + i * 3),
				kind: (['diode', 'schottky', 'led', 'bjt-be'] as const)[i % 4],
				samples,
				...(given ? {} : { sampleUnits: samples.map((_, k) => `U${k + 1}`) }),
				evidence: given ? 'given' : 'measured',
				ratings: i % 6 ? { reverseV: 40 + i, ...(i % 4 ? { forwardCurrentA: 0.2 } : {}) } : {},
				measured: { minAbsCurrentA: given ? 0 : 1e-13 * (1 + rand()), temperaturesC: given ? [] : [25, 85].slice(0, 1 + (i % 2)), reverseMeasured: i % 3 !== 1 },
				...(i % 8 ? { transparentPackage: i % 5 === 0 } : {}),
				...(given ? {} : { fitRmsResidualV: 1e-4 * (1 + rand()) })
			},
			typical: { IS: samples[0].IS, N: samples[0].N, ...(i % 2 ? { RSH: samples[0].RSH } : {}), ...(i % 7 === 0 ? { CJO: 1e-12 } : {}) },
			partNumber: `TQ-${i}${i % 11 === 0 ? 'µ Ω "quoted"' : ''}`,
			maker: 'Orrin Semiconductor',
			package: ['SOD-323', 'TO-92', ''][i % 3],
			lifecycle: ['in-use', 'not-for-new', 'retired'][i % 3],
			material: 'silicon',
			search: `tq-${i} orrin semiconductor`,
			givenSource: given ? 'card' : null,
			capacitanceSource: i % 7 === 0 ? 'given' : null
		};
	});
}

describe('model snapshot codec', () => {
	it('decodes exactly what it encoded (every number bit for bit, optional fields as they were)', () => {
		const parts = catalogue(60);
		const bytes = encodeSnapshot({ version: 'v-1', partial: false, parts, catalogueIds: new Int32Array(0) });
		const back = decodeSnapshot(bytes);
		expect(back.version).toBe('v-1');
		expect(back.partial).toBe(false);
		// toStrictEqual tells an absent key from one holding undefined, and compares numbers with Object.is.
		expect(back.parts).toStrictEqual(parts);
	});

	it('keeps a partial snapshot and its list of every catalogue id', () => {
		const parts = catalogue(5);
		const ids = Int32Array.from([1, 10, 13, 99]);
		const back = decodeSnapshot(encodeSnapshot({ version: 'v-2', partial: true, parts: parts.slice(1, 3), catalogueIds: ids }));
		expect(back.partial).toBe(true);
		expect([...back.catalogueIds]).toEqual([1, 10, 13, 99]);
		expect(back.parts).toStrictEqual(parts.slice(1, 3));
	});

	it('ranks to the same numbers and order from the decoded records', () => {
		const parts = catalogue(40);
		const back = decodeSnapshot(encodeSnapshot({ version: 'x', partial: false, parts, catalogueIds: new Int32Array(0) })).parts;
		const a = new CatalogueTable(parts.map((p) => p.record));
		const b = new CatalogueTable(back.map((p) => p.record));
		for (const basis of ['bound', 'worst', 'typical'] as const) {
			const op = { biasV: -4, temperatureRangeC: [0, 85] as [number, number], clampCurrentA: 1e-3, maxCapacitanceF: 5e-12, basis };
			const ra = a.rank(op);
			const rb = b.rank(op);
			expect([...rb.order]).toEqual([...ra.order]);
			expect(b.rows(rb, op, 0, 40)).toStrictEqual(a.rows(ra, op, 0, 40));
		}
	});

	it('reads a snapshot that starts at an unaligned place in a larger buffer', () => {
		const parts = catalogue(3);
		const bytes = encodeSnapshot({ version: 'y', partial: false, parts, catalogueIds: new Int32Array(0) });
		const shifted = new Uint8Array(bytes.length + 3);
		shifted.set(bytes, 3);
		expect(decodeSnapshot(shifted.subarray(3)).parts).toStrictEqual(parts);
	});

	it('refuses another format version, foreign bytes and a cut-off buffer', () => {
		const bytes = encodeSnapshot({ version: 'z', partial: false, parts: catalogue(4), catalogueIds: new Int32Array(0) });
		const other = bytes.slice();
		new DataView(other.buffer).setUint32(4, SNAPSHOT_FORMAT_VERSION + 1, true);
		expect(() => decodeSnapshot(other)).toThrow(SnapshotFormatError);
		expect(() => decodeSnapshot(other)).toThrow(/format version 2 cannot be read/);
		expect(() => decodeSnapshot(new TextEncoder().encode('{"items":[]} plus some padding bytes here'))).toThrow(/not a model snapshot/);
		expect(() => decodeSnapshot(bytes.slice(0, bytes.length - 9))).toThrow(/cut short/);
		expect(() => decodeSnapshot(new Uint8Array(8))).toThrow(SnapshotFormatError);
	});
});
