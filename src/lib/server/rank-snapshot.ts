/**
 * The model cache as a binary snapshot for ranking in the browser (codec:
 * src/lib/junction/model-snapshot.ts). Each cache snapshot is encoded at most once, when
 * first asked for; each part's fingerprint is kept with the cached part, so a rebuild
 * after one part changed fingerprints that part only.
 *
 * The snapshot's version is a digest of every part's id and fingerprint, so every server
 * process over the same catalogue names it alike (and the browser's ETag stays valid from
 * one process to the next). `since` answers only the parts that changed after a version
 * this process has served recently; for a version it does not know, everything.
 */
import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import { encodeSnapshot, type SnapshotPart } from '$lib/junction/model-snapshot';
import type { CacheSnapshot, CachedPart } from './model-cache';

/** Versions remembered for `since` (each is an id → fingerprint map of the catalogue then). */
const HISTORY = 16;

type Encoded = { version: string; fingerprints: Map<number, string>; full?: Uint8Array<ArrayBuffer> };

const fingerprintOf = new WeakMap<CachedPart, string>();
const encodedOf = new WeakMap<CacheSnapshot, Encoded>();
const history = new Map<string, Map<number, string>>();

/** The snapshot form of a cached part: its engine record as the cache holds it, and its listed words. */
export function snapshotPart(part: CachedPart): SnapshotPart {
	return {
		id: part.id,
		modelVersion: part.modelVersion,
		record: part.record,
		typical: part.typical,
		partNumber: part.partNumber,
		maker: part.maker,
		package: part.package,
		lifecycle: part.lifecycle,
		material: part.material,
		search: part.search,
		givenSource: part.givenSource,
		capacitanceSource: part.capacitanceSource
	};
}

function fingerprint(part: CachedPart): string {
	let f = fingerprintOf.get(part);
	if (!f) {
		// JSON writes every double in its shortest exact form, so equal text is equal input.
		f = createHash('sha1').update(JSON.stringify(snapshotPart(part))).digest('base64url').slice(0, 16);
		fingerprintOf.set(part, f);
	}
	return f;
}

/** The version and fingerprints of a cache snapshot (computed once per snapshot). */
function encoded(snap: CacheSnapshot): Encoded {
	let e = encodedOf.get(snap);
	if (!e) {
		const digest = createHash('sha1');
		const fingerprints = new Map<number, string>();
		for (const p of snap.parts) {
			const f = fingerprint(p);
			fingerprints.set(p.id, f);
			digest.update(`${p.id}:${f};`);
		}
		e = { version: digest.digest('base64url').slice(0, 20), fingerprints };
		encodedOf.set(snap, e);
		history.delete(e.version);
		history.set(e.version, fingerprints);
		if (history.size > HISTORY) history.delete(history.keys().next().value as string);
	}
	return e;
}

export type SnapshotAnswer = { bytes: Uint8Array<ArrayBuffer>; version: string; partial: boolean; parts: number };

/**
 * The snapshot to send: everything; only the parts changed since `since` (a version this
 * process still remembers); or only the parts named in `partIds` (those still in the
 * catalogue). Partial answers list every catalogue id, so parts taken out are noticed.
 */
export function snapshotAnswer(snap: CacheSnapshot, request: { since?: string; partIds?: number[] }): SnapshotAnswer {
	const e = encoded(snap);
	const then = request.since !== undefined ? history.get(request.since) : undefined;
	let chosen: CachedPart[] | null = null;
	if (request.partIds) {
		chosen = [];
		for (const id of new Set(request.partIds)) {
			const k = snap.indexOf.get(id);
			if (k !== undefined) chosen.push(snap.parts[k]);
		}
		chosen.sort((a, b) => a.id - b.id);
	} else if (then) chosen = snap.parts.filter((p) => then.get(p.id) !== e.fingerprints.get(p.id));
	if (!chosen) {
		e.full ??= encodeSnapshot({ version: e.version, partial: false, parts: snap.parts.map(snapshotPart), catalogueIds: new Int32Array(0) });
		return { bytes: e.full, version: e.version, partial: false, parts: snap.parts.length };
	}
	const catalogueIds = Int32Array.from(snap.parts, (p) => p.id);
	const bytes = encodeSnapshot({ version: e.version, partial: true, parts: chosen.map(snapshotPart), catalogueIds });
	return { bytes, version: e.version, partial: true, parts: chosen.length };
}

const gzipAsync = promisify(gzip);
const gzippedOf = new WeakMap<Uint8Array, Promise<Buffer>>();

/**
 * The answer's bytes gzipped (in zlib's thread pool, so the event loop goes on): a full
 * snapshot once per version, as it is kept. The models' doubles repeat much between parts
 * and samples: at 10k demo-like parts 4.6 MB went to 0.75 MB (measured).
 */
export function gzipped(answer: SnapshotAnswer): Promise<Buffer> {
	if (answer.partial) return gzipAsync(answer.bytes);
	let z = gzippedOf.get(answer.bytes);
	if (!z) {
		z = gzipAsync(answer.bytes);
		gzippedOf.set(answer.bytes, z);
	}
	return z;
}
