/**
 * catalogue-search-vs-frame: one keystroke's typo-tolerant search (the catalogue page's own
 * index and search: literal hits plus fuse.js over gram-index candidates) over 10k parts,
 * against one 60 Hz frame (16.7 ms).
 * Ratio = median time per keystroke / frame; target ≤ 1 ("answers within a frame").
 */
import { buildIndex, search, type Filters } from '../../src/routes/catalogue/search';
import type { CompactPart } from '../../src/lib/catalogue/compact-part';
import { JUNCTION_KINDS } from '../../src/lib/junction/names';
import { mulberry32 } from '../../src/lib/random';
import { record } from './results';

const FRAME_MS = 1000 / 60;

function inventParts(n: number): CompactPart[] {
	const r = mulberry32(99);
	const makers = ['Tallowmere Devices', 'Quillmark Semi', 'Brightwater Test Fab', 'Hollin Reed Microsystems', 'Ostler & Vane'];
	const pkgs = ['SOD-323', 'SOT-23', 'DO-35 glass', 'TO-92', '0603 clear'];
	return Array.from({ length: n }, (_, i) => ({
		id: i + 1,
		pn: `${['LX', 'QM', 'HRB', 'OV', 'TD'][i % 5]}-${String(Math.floor(r() * 99999)).padStart(5, '0')}${['', 'A', 'GL', 'LL'][i % 4]}`,
		mk: makers[i % makers.length],
		kind: JUNCTION_KINDS[i % JUNCTION_KINDS.length],
		pkg: pkgs[i % pkgs.length],
		mat: 'silicon',
		life: 'in-use',
		tags: i % 3 ? ['low leakage'] : ['clamp', 'guard'],
		is: 1e-14,
		n: 1.5,
		rs: 2,
		rsh: null
	})) as unknown as CompactPart[];
}

export async function runSearchBenchmarks(): Promise<void> {
	const parts = inventParts(10_000);
	const t0 = performance.now();
	const index = buildIndex(parts);
	const buildMs = performance.now() - t0;
	// A person typing a part number with a slip in it, one keystroke at a time.
	const typed = 'HBR-0417GL';
	const times: number[] = [];
	for (let round = 0; round < 5; round++) {
		for (let k = 1; k <= typed.length; k++) {
			const f: Filters = { q: typed.slice(0, k), kind: '', pkg: '', mat: '', life: '' };
			const s = performance.now();
			search(parts, index, f);
			times.push(performance.now() - s);
		}
	}
	times.sort((a, b) => a - b);
	const median = times[times.length >> 1];
	const p95 = times[Math.floor(times.length * 0.95)];
	const worst = times[times.length - 1];
	record(
		'catalogue-search-vs-frame',
		median / FRAME_MS,
		1,
		`catalogue search over 10k parts: median ${median.toFixed(2)} ms, 95th percentile ${p95.toFixed(2)} ms, slowest ${worst.toFixed(2)} ms per keystroke (typing "${typed}"), against a ${FRAME_MS.toFixed(1)} ms frame; index built once in ${buildMs.toFixed(0)} ms`
	);
	console.log(`catalogue-search-vs-frame: ${(median / FRAME_MS).toFixed(2)} (median ${median.toFixed(2)} ms, p95 ${p95.toFixed(2)} ms, worst ${worst.toFixed(2)} ms)`);
}
