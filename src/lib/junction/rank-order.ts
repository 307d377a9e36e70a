/**
 * Ordering and selection for the rank core: part indices ordered by a key column
 * ascending, ties by a second column, then by index, optionally only the best `limit`.
 * Pure functions over typed arrays; the catalogue table calls them once per group of parts.
 */

/**
 * Rank groups, in list order (rank.ts): bit 2 = fails a stated limit, bit 1 = given model
 * only, bit 0 = no value on the ranking's basis (e.g. one sample under `bound`). The
 * catalogue table and the protected node's ranking both sort parts into them.
 */
export const RANK_GROUPS = 8;
export const GROUP_FAILS_LIMIT = 4;
export const GROUP_GIVEN = 2;
export const GROUP_NO_VALUE = 1;
/** Bucket of a part that is not listed (filtered out or excluded by its reverse rating). */
export const GROUP_UNLISTED = 255;

/** The rank group of a listed part. */
export function rankGroup(failsLimit: boolean, given: boolean, hasValue: boolean): number {
	return (failsLimit ? GROUP_FAILS_LIMIT : 0) | (given ? GROUP_GIVEN : 0) | (hasValue ? 0 : GROUP_NO_VALUE);
}

const LOW_WORD = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 0 : 1;

/** Numeric order with NaN after every number (the sort key order of `orderByKey`). */
export function compareNumbers(x: number, y: number): number {
	if (x < y) return -1;
	if (x > y) return 1;
	if (x === y) return 0;
	return Number.isNaN(x) ? (Number.isNaN(y) ? 0 : 1) : -1;
}

/**
 * Order parts by `key` ascending, then `tie` ascending, then part index (NaN after every
 * number), returning at most `limit` of them. The rank core passes the leakage on the
 * ranking's basis as the key and typical leakage as the tie.
 *
 * Method: each part's key (≥ 0, so its IEEE-754 bit pattern orders like its value) has
 * the low ⌈log₂ m⌉ mantissa bits replaced by its position in `parts`; these packed doubles
 * sort natively (or, with a limit, the smallest `limit` are selected by Hoare's FIND,
 * C. A. R. Hoare, Comm. ACM 4 (1961) 321, then sorted). Truncating the low bits keeps the
 * order between different truncated values, so only runs of equal truncated value can be
 * out of the exact order; each such run is re-sorted with the exact comparison. With a
 * limit, the run at the cut may continue among the parts not selected: its members are
 * gathered and only the best of them that fit are selected exactly (a bounded heap), so a
 * long run of ties costs one comparison per member rather than a sort. A limit of at most
 * a sixteenth of the parts is first tried in one pass with a bounded heap under the exact
 * comparison (`smallestByScan`), which needs no packing and no selection.
 * @param parts part indices in ascending order
 * @param key the primary sort key per part index (≥ 0 or NaN)
 * @param tie the second sort key per part index
 * @param scratch optional work array of at least parts.length entries (else one is allocated)
 */
export function orderByKey(
	parts: Int32Array,
	key: Float64Array,
	tie: Float64Array,
	limit = Infinity,
	scratch?: Float64Array
): Int32Array {
	const m = parts.length;
	const take = Math.min(m, Math.max(0, Math.floor(limit)));
	if (take === 0) return new Int32Array(0);
	const cmp = (a: number, b: number) => compareNumbers(key[a], key[b]) || compareNumbers(tie[a], tie[b]) || a - b;
	if (take * 16 <= m) {
		const best = smallestByScan(parts, key, take, cmp);
		if (best) return best;
	}
	const bits = Math.max(1, Math.ceil(Math.log2(m)));
	if (bits > 31) throw new RangeError(`too many parts to order (${m})`);
	const keys = scratch && scratch.length >= m ? scratch.subarray(0, m) : new Float64Array(m);
	const words = new Uint32Array(keys.buffer, keys.byteOffset, 2 * m);
	for (let j = 0; j < m; j++) {
		const w = key[parts[j]];
		// NaN and ±Infinity would not survive packing; they join the largest finite value's run.
		keys[j] = w <= Number.MAX_VALUE ? w : Number.MAX_VALUE;
		const at = 2 * j + LOW_WORD;
		words[at] = (((words[at] >>> bits) << bits) | j) >>> 0;
	}
	if (take < m) selectSmallest(keys, take - 1);
	keys.subarray(0, take).sort();
	const mask = 2 ** bits - 1;
	const out = new Int32Array(take);
	for (let i = 0; i < take; i++) out[i] = parts[words[2 * i + LOW_WORD] & mask];
	// Re-sort runs of equal truncated key exactly.
	for (let i = 0; i < take; ) {
		const hi = words[2 * i + 1 - LOW_WORD];
		const lo = words[2 * i + LOW_WORD] >>> bits;
		let e = i + 1;
		while (e < take && words[2 * e + 1 - LOW_WORD] === hi && words[2 * e + LOW_WORD] >>> bits === lo) e++;
		if (e === take && take < m) {
			// The run at the cut: its members among the parts not selected compete for its places.
			// One pass moves them down to keys[take …] (never past the entry read).
			let extra = 0;
			for (let j = take; j < m; j++)
				if (words[2 * j + 1 - LOW_WORD] === hi && words[2 * j + LOW_WORD] >>> bits === lo) keys[take + extra++] = keys[j];
			if (extra > 0) {
				const run = new Int32Array(e - i + extra);
				run.set(out.subarray(i, e));
				for (let x = 0; x < extra; x++) run[e - i + x] = parts[words[2 * (take + x) + LOW_WORD] & mask];
				out.set(smallestSorted(run, take - i, cmp), i);
				break;
			}
		}
		if (e - i > 1) out.subarray(i, e).sort(cmp);
		i = e;
	}
	return out;
}

/**
 * The `k` best parts under `cmp` (exact order), found in one pass with a max-heap of `k`
 * entries: a part whose key is above the heap's largest is passed over after one
 * comparison of numbers. For parts in no particular order of leakage few enter the heap;
 * when many do (parts listed from leaky to tight), this gives up (null) after m/4 entries
 * so the caller's selection takes over.
 */
function smallestByScan(parts: Int32Array, key: Float64Array, k: number, cmp: (a: number, b: number) => number): Int32Array | null {
	const m = parts.length;
	const heap = parts.slice(0, k);
	for (let i = (k >> 1) - 1; i >= 0; i--) siftDown(heap, i, cmp);
	let top = key[heap[0]];
	let entered = 0;
	const budget = m >> 2;
	for (let j = k; j < m; j++) {
		const p = parts[j];
		// A larger key never enters (NaN, ordered last, goes to the exact comparison).
		if (key[p] > top) continue;
		if (cmp(p, heap[0]) < 0) {
			if (++entered > budget) return null;
			heap[0] = p;
			siftDown(heap, 0, cmp);
			top = key[heap[0]];
		}
	}
	return heap.sort(cmp);
}

/**
 * The `k` smallest entries of `a` under `cmp` (a total order), sorted: a sort when `a` is
 * short, else a bounded max-heap of `k` entries (one comparison per entry that does not
 * enter it). Reorders `a`.
 */
function smallestSorted(a: Int32Array, k: number, cmp: (x: number, y: number) => number): Int32Array {
	if (a.length <= 4 * k) return a.sort(cmp).subarray(0, k);
	const heap = a.subarray(0, k);
	for (let i = (k >> 1) - 1; i >= 0; i--) siftDown(heap, i, cmp);
	for (let j = k; j < a.length; j++) {
		const x = a[j];
		if (cmp(x, heap[0]) < 0) {
			heap[0] = x;
			siftDown(heap, 0, cmp);
		}
	}
	return heap.sort(cmp);
}

/** Restores the max-heap order of `h` (under `cmp`) below position `i`. */
function siftDown(h: Int32Array, i: number, cmp: (x: number, y: number) => number): void {
	const n = h.length;
	const x = h[i];
	for (;;) {
		let c = 2 * i + 1;
		if (c >= n) break;
		if (c + 1 < n && cmp(h[c + 1], h[c]) > 0) c++;
		if (cmp(h[c], x) <= 0) break;
		h[i] = h[c];
		i = c;
	}
	h[i] = x;
}

/**
 * Rearrange `a` (distinct values) so that a[k] holds the value of rank k (0-based) and
 * every a[i] for i < k is smaller: Hoare's FIND (Comm. ACM 4 (1961) 321), in the form
 * given by N. Wirth, Algorithms + Data Structures = Programs (1976), §2.3.4, with a
 * median-of-three pivot.
 */
function selectSmallest(a: Float64Array, k: number): void {
	let l = 0;
	let r = a.length - 1;
	while (l < r) {
		const x0 = a[l];
		const x1 = a[(l + r) >> 1];
		const x2 = a[r];
		const x = x0 < x1 ? (x1 < x2 ? x1 : x0 < x2 ? x2 : x0) : x0 < x2 ? x0 : x1 < x2 ? x2 : x1;
		let i = l;
		let j = r;
		do {
			while (a[i] < x) i++;
			while (x < a[j]) j--;
			if (i <= j) {
				const t = a[i];
				a[i] = a[j];
				a[j] = t;
				i++;
				j--;
			}
		} while (i <= j);
		if (j < k) l = i;
		if (k < i) r = j;
	}
}

/**
 * Parts listed in rank groups, in order, at most `limit`: `bucket[p]` is part p's group
 * (0 … counts.length − 1, listed in that order; `unlisted` leaves it out) and `counts` the
 * size of each group. Members are gathered by a counting sort (index order kept), then
 * each group is ordered by `orderByKey` with `keyOf(group, members, take)` as key (its
 * members and how many of them will be taken, so a key computed on demand need only be
 * exact where it can matter) and `tie` as the tie,
 * until `limit` parts are taken.
 * @param groups work array of at least as many entries as listed parts
 * @param scratch work array for `orderByKey`
 * @param every optional 0 … bucket.length − 1: the members when one group holds every part
 */
export function orderGroups(
	bucket: Uint8Array,
	counts: Int32Array,
	unlisted: number,
	keyOf: (group: number, members: Int32Array, take: number) => Float64Array,
	tie: Float64Array,
	limit: number,
	groups: Int32Array,
	scratch?: Float64Array,
	every?: Int32Array
): Int32Array {
	const g = counts.length;
	const offsets = new Int32Array(g + 1);
	for (let b = 0; b < g; b++) offsets[b + 1] = offsets[b] + counts[b];
	let members: Int32Array = groups;
	if (every && counts.some((c) => c === bucket.length)) members = every;
	else {
		const next = offsets.slice(0, g);
		for (let p = 0; p < bucket.length; p++) {
			const b = bucket[p];
			if (b !== unlisted) groups[next[b]++] = p;
		}
	}
	const pieces: Int32Array[] = [];
	let taken = 0;
	for (let b = 0; b < g && taken < limit; b++) {
		if (counts[b] === 0) continue;
		const group = members.subarray(offsets[b], offsets[b + 1]);
		const take = Math.min(group.length, limit - taken);
		const piece = orderByKey(group, keyOf(b, group, take), tie, take, scratch);
		pieces.push(piece);
		taken += piece.length;
	}
	if (pieces.length === 1) return pieces[0];
	const order = new Int32Array(taken);
	let at = 0;
	for (const piece of pieces) {
		order.set(piece, at);
		at += piece.length;
	}
	return order;
}
