/**
 * A compact binary snapshot of the catalogue's ranking inputs: every part's sample models
 * (engine form, as the server's model cache holds them), its ratings and measured facts,
 * its typical model as stored, and the few words the ranked list shows. The browser
 * decodes it and builds the same CatalogueTable the server ranks with, so the numbers and
 * the order are the engine's own, not a copy of them.
 *
 * Layout (little-endian; every section starts on an 8-byte boundary):
 *   header   10 × u32: magic 'JSNP', format version, flags (bit 0: partial), parts n,
 *            samples m, temperatures t, catalogue ids k, string bytes, 2 reserved
 *   f64      m × 17 sample parameters (SAMPLE_KEYS; NaN = absent)
 *   f64      n × 15 typical parameters as stored (TYPICAL_KEYS; NaN = absent)
 *   f64      n × 4  rated reverse V, rated forward A, least measured |I|, worst fit RMS (NaN = none)
 *   f64      t      measured temperatures, part after part
 *   i32      n × 4  ids, model versions, sample counts, temperature counts (each a column)
 *   i32      k      every part id in the catalogue now (partial snapshots: what to keep)
 *   u8       m      material index | egAssumed << 3
 *   u8       n      given bit 0, admits light bit 1, reverse measured bit 2, light known bit 3
 *   utf-8    JSON   { version, parts: [[kind, partNumber, maker, package, lifecycle,
 *                    material, search, givenSource, capacitanceSource, sampleUnits]] }
 * Float64 carries every number exactly, so a decoded model is the encoded one bit for bit.
 */
import type { JunctionModel } from './model';
import { MATERIALS, type JunctionKind, type Material } from './names';
import type { PartRecord } from './rank-types';

/** Bumped whenever the layout changes; a decoder refuses any other. */
export const SNAPSHOT_FORMAT_VERSION = 1;
const MAGIC = 0x504e534a; // 'JSNP'
const HEADER_WORDS = 10;
const FLAG_PARTIAL = 1;

const SAMPLE_KEYS = ['IS', 'N', 'RS', 'RSH', 'ISR', 'NR', 'BV', 'IBV', 'NBV', 'EG', 'XTI', 'TNOM', 'CJO', 'VJ', 'M', 'FC', 'shuntFactorPer10K'] as const;
const TYPICAL_KEYS = ['IS', 'N', 'RS', 'RSH', 'ISR', 'NR', 'BV', 'IBV', 'EG', 'XTI', 'TNOM', 'CJO', 'VJ', 'M', 'FC'] as const;
const PART_NUMBERS = 4;
type TypicalKey = (typeof TYPICAL_KEYS)[number];

/** A part's ranking inputs plus what the ranked list shows of it. */
export interface SnapshotPart {
	id: number;
	modelVersion: number;
	record: PartRecord;
	/** The typical model as stored (SPICE names; absent parameters take the engine's defaults). */
	typical: Partial<Record<TypicalKey, number>>;
	partNumber: string;
	maker: string;
	package: string;
	lifecycle: string;
	material: string;
	/** Lower-cased part number, maker and tags, for the text filter. */
	search: string;
	givenSource: string | null;
	capacitanceSource: 'measured' | 'given' | null;
}

export interface ModelSnapshot {
	/** Identifies the catalogue content this snapshot was taken from (changes when any part does). */
	version: string;
	/** Only some parts: the others are unchanged, and `catalogueIds` lists every part to keep. */
	partial: boolean;
	parts: SnapshotPart[];
	/** Every part id in the catalogue at `version` (partial snapshots only; empty otherwise). */
	catalogueIds: Int32Array;
}

/** What is wrong with bytes that are not a snapshot this code can read. */
export class SnapshotFormatError extends Error {}

const align8 = (n: number) => (n + 7) & ~7;
const orNaN = (v: number | undefined | null) => (v === undefined || v === null ? NaN : v);

/** Encodes parts (in the order given) into one snapshot buffer. */
export function encodeSnapshot(snapshot: ModelSnapshot): Uint8Array<ArrayBuffer> {
	const { parts } = snapshot;
	const n = parts.length;
	let m = 0;
	let t = 0;
	for (const p of parts) {
		m += p.record.samples.length;
		t += p.record.measured.temperaturesC.length;
	}
	const k = snapshot.partial ? snapshot.catalogueIds.length : 0;
	const words = parts.map((p) => [
		p.record.kind,
		p.partNumber,
		p.maker,
		p.package,
		p.lifecycle,
		p.material,
		p.search,
		p.givenSource,
		p.capacitanceSource,
		p.record.sampleUnits ?? null
	]);
	const text = new TextEncoder().encode(JSON.stringify({ version: snapshot.version, parts: words }));
	const layout = sections(n, m, t, k, text.length);
	const buffer = new ArrayBuffer(layout.total);
	new Uint32Array(buffer, 0, HEADER_WORDS).set([MAGIC, SNAPSHOT_FORMAT_VERSION, snapshot.partial ? FLAG_PARTIAL : 0, n, m, t, k, text.length, 0, 0]);
	const v = views(buffer, layout, n, m, t, k, text.length);
	let s = 0;
	let tt = 0;
	parts.forEach((p, i) => {
		const r = p.record;
		for (const model of r.samples) {
			SAMPLE_KEYS.forEach((key, j) => (v.sampleParams[s * SAMPLE_KEYS.length + j] = orNaN(model[key])));
			const material = MATERIALS.indexOf(model.material);
			if (material < 0) throw new RangeError(`part ${p.id}: unknown material '${model.material}'`);
			v.sampleBits[s] = material | (model.egAssumed ? 8 : 0);
			s++;
		}
		TYPICAL_KEYS.forEach((key, j) => (v.typicalParams[i * TYPICAL_KEYS.length + j] = orNaN(p.typical[key])));
		v.partFloats.set([orNaN(r.ratings.reverseV), orNaN(r.ratings.forwardCurrentA), r.measured.minAbsCurrentA, orNaN(r.fitRmsResidualV)], i * PART_NUMBERS);
		v.temps.set(r.measured.temperaturesC, tt);
		tt += r.measured.temperaturesC.length;
		v.ids[i] = p.id;
		v.versions[i] = p.modelVersion;
		v.sampleCounts[i] = r.samples.length;
		v.tempCounts[i] = r.measured.temperaturesC.length;
		v.partBits[i] =
			(r.evidence === 'given' ? 1 : 0) | (r.transparentPackage ? 2 : 0) | (r.measured.reverseMeasured ? 4 : 0) | (r.transparentPackage !== undefined ? 8 : 0);
	});
	if (k) v.catalogueIds.set(snapshot.catalogueIds);
	v.text.set(text);
	return new Uint8Array(buffer);
}

/**
 * Decodes a snapshot buffer.
 * @throws SnapshotFormatError for bytes that are not a snapshot, are cut short, or carry
 * another format version.
 */
export function decodeSnapshot(bytes: Uint8Array | ArrayBuffer): ModelSnapshot {
	const source = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
	if (source.byteLength < HEADER_WORDS * 4) throw new SnapshotFormatError(`a snapshot has at least ${HEADER_WORDS * 4} bytes, got ${source.byteLength}`);
	// Typed views need aligned offsets: a buffer shared at an odd place is copied once.
	const buffer = source.byteOffset % 8 === 0 ? source.buffer : source.slice().buffer;
	const base = source.byteOffset % 8 === 0 ? source.byteOffset : 0;
	const header = new DataView(buffer, base, HEADER_WORDS * 4);
	const word = (i: number) => header.getUint32(i * 4, true);
	if (word(0) !== MAGIC) throw new SnapshotFormatError('not a model snapshot (its first bytes are not the snapshot mark)');
	if (word(1) !== SNAPSHOT_FORMAT_VERSION)
		throw new SnapshotFormatError(`snapshot format version ${word(1)} cannot be read here (this code reads version ${SNAPSHOT_FORMAT_VERSION})`);
	const [flags, n, m, t, k, textBytes] = [word(2), word(3), word(4), word(5), word(6), word(7)];
	const layout = sections(n, m, t, k, textBytes);
	if (source.byteLength < layout.total) throw new SnapshotFormatError(`snapshot cut short: ${source.byteLength} of ${layout.total} bytes`);
	const v = views(buffer, layout, n, m, t, k, textBytes, base);
	const words = JSON.parse(new TextDecoder().decode(v.text)) as { version: string; parts: unknown[][] };
	if (!Array.isArray(words.parts) || words.parts.length !== n) throw new SnapshotFormatError(`snapshot lists ${n} parts but names ${words.parts?.length}`);
	const parts: SnapshotPart[] = new Array(n);
	let s = 0;
	let tt = 0;
	for (let i = 0; i < n; i++) {
		const [kind, partNumber, maker, pkg, lifecycle, material, search, givenSource, capacitanceSource, sampleUnits] = words.parts[i] as [
			JunctionKind, string, string, string, string, string, string, string | null, SnapshotPart['capacitanceSource'], string[] | null
		];
		const samples: JunctionModel[] = new Array(v.sampleCounts[i]);
		for (let j = 0; j < samples.length; j++, s++) samples[j] = sampleModel(v.sampleParams, v.sampleBits[s], s);
		const bits = v.partBits[i];
		const f = i * PART_NUMBERS;
		const record: PartRecord = {
			id: String(v.ids[i]),
			kind,
			samples,
			...(sampleUnits ? { sampleUnits } : {}),
			evidence: bits & 1 ? 'given' : 'measured',
			ratings: {
				...(v.partFloats[f] === v.partFloats[f] ? { reverseV: v.partFloats[f] } : {}),
				...(v.partFloats[f + 1] === v.partFloats[f + 1] ? { forwardCurrentA: v.partFloats[f + 1] } : {})
			},
			measured: {
				minAbsCurrentA: v.partFloats[f + 2],
				temperaturesC: Array.from(v.temps.subarray(tt, tt + v.tempCounts[i])),
				reverseMeasured: (bits & 4) !== 0
			},
			...(bits & 8 ? { transparentPackage: (bits & 2) !== 0 } : {}),
			...(v.partFloats[f + 3] === v.partFloats[f + 3] ? { fitRmsResidualV: v.partFloats[f + 3] } : {})
		};
		tt += v.tempCounts[i];
		const typical: SnapshotPart['typical'] = {};
		TYPICAL_KEYS.forEach((key, j) => {
			const x = v.typicalParams[i * TYPICAL_KEYS.length + j];
			if (x === x) typical[key] = x;
		});
		parts[i] = {
			id: v.ids[i],
			modelVersion: v.versions[i],
			record,
			typical,
			partNumber,
			maker,
			package: pkg,
			lifecycle,
			material,
			search,
			givenSource,
			capacitanceSource
		};
	}
	return { version: words.version, partial: (flags & FLAG_PARTIAL) !== 0, parts, catalogueIds: k ? v.catalogueIds.slice() : new Int32Array(0) };
}

/** One engine model from its row of parameters (absent ones left out, as createModel leaves them). */
function sampleModel(params: Float64Array, bits: number, s: number): JunctionModel {
	const row = s * SAMPLE_KEYS.length;
	const model = { material: MATERIALS[bits & 7] as Material } as JunctionModel;
	const out = model as unknown as Record<string, number>;
	SAMPLE_KEYS.forEach((key, j) => {
		const x = params[row + j];
		if (x === x) out[key] = x;
	});
	if (bits & 8) model.egAssumed = true;
	return model;
}

type Layout = { offsets: number[]; total: number };

/** Byte offsets of every section after the header, in layout order. */
function sections(n: number, m: number, t: number, k: number, textBytes: number): Layout {
	const sizes = [m * SAMPLE_KEYS.length * 8, n * TYPICAL_KEYS.length * 8, n * PART_NUMBERS * 8, t * 8, n * 16, k * 4, m, n, textBytes];
	const offsets: number[] = [];
	let at = align8(HEADER_WORDS * 4);
	for (const size of sizes) {
		offsets.push(at);
		at = align8(at + size);
	}
	return { offsets, total: at };
}

function views(buffer: ArrayBufferLike, { offsets: o }: Layout, n: number, m: number, t: number, k: number, textBytes: number, base = 0) {
	const columns = new Int32Array(buffer, base + o[4], 4 * n);
	return {
		sampleParams: new Float64Array(buffer, base + o[0], m * SAMPLE_KEYS.length),
		typicalParams: new Float64Array(buffer, base + o[1], n * TYPICAL_KEYS.length),
		partFloats: new Float64Array(buffer, base + o[2], n * PART_NUMBERS),
		temps: new Float64Array(buffer, base + o[3], t),
		ids: columns.subarray(0, n),
		versions: columns.subarray(n, 2 * n),
		sampleCounts: columns.subarray(2 * n, 3 * n),
		tempCounts: columns.subarray(3 * n, 4 * n),
		catalogueIds: new Int32Array(buffer, base + o[5], k),
		sampleBits: new Uint8Array(buffer, base + o[6], m),
		partBits: new Uint8Array(buffer, base + o[7], n),
		text: new Uint8Array(buffer, base + o[8], textBytes)
	};
}
