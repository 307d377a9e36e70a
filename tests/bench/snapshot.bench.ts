/**
 * Where ranking in the browser stops paying (the size limit in src/lib/rank/snapshot-limits.ts):
 * model snapshots of catalogues of the scale seed's parts, 10k to 200k, encoded, decoded and
 * built into the engine's table as the ranking worker does, then ranked as the screen asks
 * (best 100 listed, 5 with models) at alternating biases. Reported:
 *  - snapshot-rank-vs-frame: the engine's re-ranking time at the size limit against one
 *    16.7 ms animation frame (target ≤ 1: at the limit a slider still re-ranks every frame);
 *  - the detail: bytes per part and, per size, the snapshot's size, its decode and table
 *    build time (the first load, besides the download) and the re-ranking time.
 * Run in Node's V8, the engine Chromium runs too, on the same machine.
 */
import { createModel } from '../../src/lib/junction';
import { gzipSync } from 'node:zlib';
import { encodeSnapshot, type SnapshotPart } from '../../src/lib/junction/model-snapshot';
import { gaussian, mulberry32 } from '../../src/lib/random';
import { SnapshotCatalogue } from '../../src/lib/rank/snapshot-catalogue';
import { SNAPSHOT_MAX_PARTS } from '../../src/lib/rank/snapshot-limits';
import { scalePart } from '../../seed/scale-parts';
import { record } from './results';

const FRAME_MS = 1000 / 60;
const SIZES = [10_000, 25_000, 50_000, 100_000, 200_000];

/** n scale-seed parts as the model cache would hold them (a given model each). */
function scaleSnapshotParts(n: number): SnapshotPart[] {
	const rand = mulberry32(4242);
	const normal = gaussian(rand);
	return Array.from({ length: n }, (_, i) => {
		const p = scalePart(i, rand, normal);
		const typical = Object.fromEntries(Object.entries(p.model).filter(([, v]) => v !== undefined)) as SnapshotPart['typical'];
		const model = createModel({ ...(typical as { IS: number }), shuntFactorPer10K: 2 }, p.kind === 'schottky' ? 'metal-semiconductor' : p.kind === 'led' ? 'wide-gap' : 'silicon');
		return {
			id: i + 1,
			modelVersion: 1,
			record: {
				id: String(i + 1),
				kind: p.kind,
				samples: [model],
				sampleUnits: [],
				evidence: 'given',
				ratings: { reverseV: p.ratings.reverseV },
				measured: { minAbsCurrentA: 0, temperaturesC: [], reverseMeasured: false },
				transparentPackage: /glass|clear/.test(p.package)
			},
			typical,
			partNumber: p.partNumber,
			maker: p.maker,
			package: p.package,
			lifecycle: p.lifecycle,
			material: 'silicon',
			search: [p.partNumber, p.maker, ...p.tags].join(' ').toLowerCase(),
			givenSource: p.modelSource,
			capacitanceSource: null
		};
	});
}

function median(xs: number[]) {
	const s = [...xs].sort((a, b) => a - b);
	return s[s.length >> 1];
}

export type SnapshotCost = { parts: number; bytes: number; gzipBytes: number; loadMs: number; rankMs: number };

export function snapshotCost(n: number): SnapshotCost {
	const bytes = encodeSnapshot({ version: 'bench', partial: false, parts: scaleSnapshotParts(n), catalogueIds: new Int32Array(0) });
	const loads: number[] = [];
	let catalogue = new SnapshotCatalogue();
	for (let k = 0; k < 3; k++) {
		const t0 = performance.now();
		catalogue = new SnapshotCatalogue();
		catalogue.applyBytes(bytes);
		loads.push(performance.now() - t0);
	}
	const ranks: number[] = [];
	for (let k = 0; k < 15; k++) {
		const op = { biasV: -(1 + (k % 8)), temperatureRangeC: [0, 85] as [number, number] };
		const t0 = performance.now();
		catalogue.rank(op, 100, 5);
		if (k >= 3) ranks.push(performance.now() - t0);
	}
	// As the endpoint sends it to a browser (gzip, zlib's default level).
	return { parts: n, bytes: bytes.byteLength, gzipBytes: gzipSync(bytes).byteLength, loadMs: median(loads), rankMs: median(ranks) };
}

export async function runSnapshotBenchmarks(): Promise<SnapshotCost[]> {
	const costs = SIZES.map(snapshotCost);
	const atLimit = costs.find((c) => c.parts === SNAPSHOT_MAX_PARTS) ?? snapshotCost(SNAPSHOT_MAX_PARTS);
	const mb = (b: number) => (b / 1e6).toFixed(1);
	const detail = costs.map((c) => `${c.parts / 1000}k parts: ${mb(c.bytes)} MB (${mb(c.gzipBytes)} MB gzipped), load ${c.loadMs.toFixed(0)} ms, re-rank ${c.rankMs.toFixed(1)} ms`).join('; ');
	record(
		'snapshot-rank-vs-frame',
		atLimit.rankMs / FRAME_MS,
		1,
		`engine re-ranking in the browser's code at the snapshot limit (${SNAPSHOT_MAX_PARTS} parts) against a 16.7 ms frame; ${(atLimit.bytes / atLimit.parts).toFixed(0)} bytes per part; ${detail}`
	);
	for (const c of costs) console.log(`snapshot ${c.parts}: ${mb(c.bytes)} MB, load ${c.loadMs.toFixed(0)} ms, rank ${c.rankMs.toFixed(2)} ms`);
	return costs;
}

if (import.meta.url === `file://${process.argv[1]}`) await runSnapshotBenchmarks();
