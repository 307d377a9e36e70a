/**
 * A short list in one pass (order rules in rank.ts): each part's rank group and key are
 * found and compared at once against the best `take` so far, kept in a bounded max-heap,
 * so a part that cannot be listed costs one pass over a few of its columns and nothing
 * is written for it. The flags, which only listed parts show, are left to the caller for
 * those parts. A pending bound (bounds-on-demand.ts) is compared by its least sample, a
 * lower bound, and computed only when that could put the part on the list.
 *
 * The pass runs in batches: a loop without calls gathers parts that could beat the list's
 * last entry as it stood at the batch's start, up to a batch full, then the heap takes
 * them in and the loop goes on from there with the new last entry. V8 keeps a call-free
 * loop's arrays in registers; a call anywhere in the loop, however rarely taken, made it
 * reload them on every part (twice the time, measured). When every part is listed (no
 * filter, no limit but the leakage budget), the parts with one sample — most of a large
 * catalogue — go through a loop that reads their leakage alone (`gatherBelow`).
 *
 * Meant for a list of at most a sixteenth of the catalogue: a longer one is ordered
 * whole (rank-order.ts), as the heap would take most parts in.
 */
import type { BoundsOnDemand } from './bounds-on-demand';
import type { FlagInputs, PartColumns, PartLayout } from './rank-pass';
import { compareNumbers, GROUP_FAILS_LIMIT, GROUP_GIVEN, GROUP_NO_VALUE } from './rank-order';

// Imported names held in module constants, read once: a loader with live bindings (tsx, the
// dev server) reads an imported name through a getter at every use.
const [FAILS, GIVEN, NO_VALUE] = [GROUP_FAILS_LIMIT, GROUP_GIVEN, GROUP_NO_VALUE];
const compare = compareNumbers;

/** A part's state before its leakage is looked at (`ShortList.states`). */
const LISTED = 0;
const FAILS_OTHER = 1;
const EXCLUDED = 2;
const FILTERED = 3;
/** Where `tally` keeps the parts excluded over their rating, failing a limit, filtered out. */
const EXCLUDED_AT = 0;
const FAILING_AT = 1;
const FILTERED_AT = 2;
/** Most parts gathered in one batch, and in a batch once the list is full. */
const BATCH = 4096;
const LATER_BATCH = 16;
/** Group above every listed one: the threshold while the list is not full. */
const ANY_GROUP = 255;

/** The heap and the work arrays of the pass, kept by the catalogue table between rankings. */
export class ShortList {
	private part = new Int32Array(0);
	private group = new Int32Array(0);
	private key = new Float64Array(0);
	private tie = new Float64Array(0);
	private size = 0;
	/** The parts one batch gathered. */
	private readonly candidates = new Int32Array(BATCH);
	/** Every part listed, no limit failed: zeros. */
	private listed = new Uint8Array(0);
	private state = new Uint8Array(0);
	private readonly tally = new Int32Array(3);

	/**
	 * Ranks the listed parts (not filtered out, not excluded over their reverse rating) and
	 * returns the best `take` in order, how many were ranked and how many of those fail a
	 * limit; the excluded parts' indices go to `excluded` in index order (`excludedCount` of
	 * them). Parts with several samples must have their statistics already (`multiSampleStatistics`).
	 */
	select(
		x: FlagInputs,
		layout: PartLayout,
		columns: { start: Int32Array; count: Int32Array; given: Uint8Array; ratedReverse: Float64Array; ratedForward: Float64Array },
		bounds: BoundsOnDemand,
		hotI: Float64Array,
		factors: Float64Array,
		out: PartColumns,
		take: number,
		excluded: Int32Array
	): { order: Int32Array; ranked: number; failing: number; excludedCount: number } {
		const { count, given } = columns;
		const n = count.length;
		const state = this.states(x, layout, columns.ratedReverse, columns.ratedForward, out, n, excluded);
		this.reset(take);
		const c = this.candidates;
		// The parts with one sample, then those with several: each list in batches.
		for (const list of [layout.singles, layout.multiples]) {
			const single = list === layout.singles;
			if (single && state === this.listed) {
				this.listSingles(x, columns, layout, bounds, hotI, factors, out, take);
				continue;
			}
			for (let from = 0; from < list.length; ) {
				// A list of none takes no part: no group comes before −1.
				const topGroup = take === 0 ? -1 : this.size === take ? this.group[0] : ANY_GROUP;
				const topKey = this.size === take ? this.key[0] : Infinity;
				const cap = this.batchCap(take);
				const m = single
					? gatherSingles(x.basis, x.maxLeak, state, list, layout.singleSample, given, hotI, from, topGroup, topKey, c, cap, this.tally)
					: gather(x.basis, x.maxLeak, state, list, given, layout.boundable, bounds.pending, bounds.least, out, from, topGroup, topKey, c, cap, this.tally);
				for (let i = 0; i < m; i++) this.offer(list[c[i]], state[list[c[i]]], x, columns, layout, bounds, hotI, factors, out, take);
				// A full batch stopped just after its last entry; else the pass reached the list's end.
				from = m === cap ? c[m - 1] + 1 : list.length;
			}
		}
		const excludedCount = this.tally[EXCLUDED_AT];
		return { order: this.sorted(), ranked: n - this.tally[FILTERED_AT] - excludedCount, failing: this.tally[FAILING_AT], excludedCount };
	}

	private reset(take: number): void {
		if (this.part.length < take) {
			this.part = new Int32Array(take);
			this.group = new Int32Array(take);
			this.key = new Float64Array(take);
			this.tie = new Float64Array(take);
		}
		this.size = 0;
	}

	/**
	 * How many parts the next batch gathers: until the list is full a batch fills it; then
	 * small batches keep the bar close to the list's last entry (fewer parts offered that
	 * the heap then turns away).
	 */
	private batchCap(take: number): number {
		return Math.min(this.size < take ? take - this.size : LATER_BATCH, this.candidates.length);
	}

	/**
	 * The parts with one sample when every part is listed (`states`), the common case: no
	 * state to read, and only the leakage budget fails a part. A part's group is then at
	 * least `least` (on the bound basis a part with one sample has no value), so once the
	 * list's last entry is in that group a part with a larger key cannot be listed, and
	 * `gatherBelow` turns it away on its key alone; `offer` finds the group of those it takes.
	 */
	private listSingles(
		x: FlagInputs,
		columns: { start: Int32Array; count: Int32Array; given: Uint8Array },
		layout: PartLayout,
		bounds: BoundsOnDemand,
		hotI: Float64Array,
		factors: Float64Array,
		out: PartColumns,
		take: number
	): void {
		const c = this.candidates;
		const list = layout.singles;
		const least = x.basis === 0 ? NO_VALUE : 0;
		for (let from = 0; from < list.length; ) {
			const top = this.size === take ? (take === 0 ? -1 : this.group[0]) : ANY_GROUP;
			const quickKey = top > least ? Infinity : top < least ? -Infinity : this.key[0];
			const cap = this.batchCap(take);
			const m = gatherBelow(list, layout.singleSample, hotI, x.maxLeak, from, quickKey, c, cap, this.tally);
			for (let i = 0; i < m; i++) this.offer(list[c[i]], LISTED, x, columns, layout, bounds, hotI, factors, out, take);
			from = m === cap ? c[m - 1] + 1 : list.length;
		}
	}

	/**
	 * Each part's state before its leakage is looked at (`partStates`). Without a filter and
	 * without a limit other than the leakage budget (no part rated below the bias) every
	 * part is listed, and a shared column of zeros says so.
	 */
	private states(x: FlagInputs, layout: PartLayout, ratedReverse: Float64Array, ratedForward: Float64Array, out: PartColumns, n: number, excluded: Int32Array): Uint8Array {
		this.tally.fill(0);
		if (this.listed.length !== n) this.listed = new Uint8Array(n);
		// Below every part's rating (less the margin) no part needs its own comparison.
		const checkOver = x.reverseV > layout.leastReverseRatingV - x.marginV;
		if (!x.include && x.maxDrop === Infinity && !(x.clampA > 0) && x.maxCap === Infinity && !checkOver) return this.listed;
		if (this.state.length !== n) this.state = new Uint8Array(n);
		partStates(x, checkOver, ratedReverse, ratedForward, out, this.state, excluded, this.tally);
		return this.state;
	}

	/**
	 * Puts a gathered part (in state `st`) on the list if it belongs among the best `take`:
	 * its group and key found again as `gather` found them (the pass stores only the part,
	 * so it keeps few arrays live), a pending bound computed now.
	 */
	private offer(
		p: number,
		st: number,
		x: FlagInputs,
		columns: { start: Int32Array; count: Int32Array; given: Uint8Array },
		layout: PartLayout,
		bounds: BoundsOnDemand,
		hotI: Float64Array,
		factors: Float64Array,
		out: PartColumns,
		take: number
	): void {
		const single = columns.count[p] === 1;
		const typical = single ? Math.abs(hotI[columns.start[p]]) : out.typicalA[p];
		const raw = single ? (typical > 0 ? typical : 0) : out.worstA[p];
		const basis = x.basis;
		const hasValue = basis === 0 ? layout.boundable[p] === 1 : basis === 1 ? raw === raw : typical === typical;
		const isPending = basis === 0 && hasValue && bounds.pending[p] === 1;
		const value = basis === 0 ? (hasValue ? (isPending ? bounds.least[p] : out.boundA[p]) : NaN) : basis === 1 ? raw : typical;
		const fails = st === FAILS_OTHER || (hasValue ? value : raw) > x.maxLeak;
		const g = (fails ? FAILS : 0) | (columns.given[p] === 1 ? GIVEN : 0) | (hasValue ? 0 : NO_VALUE);
		const key = isPending ? bounds.settle(p, hotI, factors, out.boundA) : hasValue ? value : typical;
		if (this.size < take) {
			const at = this.size++;
			this.set(at, p, g, key, typical);
			this.siftUp(at);
		} else if (this.size > 0 && this.before(g, key, typical, p, 0)) {
			// (A list of none is offered parts by `listSingles`: the heap stays empty.)
			this.set(0, p, g, key, typical);
			this.siftDown(0);
		}
	}

	private set(i: number, p: number, g: number, key: number, tie: number): void {
		this.part[i] = p;
		this.group[i] = g;
		this.key[i] = key;
		this.tie[i] = tie;
	}

	/** Whether (g, key, tie, p) comes before heap entry i in the rank order (NaN after every number). */
	private before(g: number, key: number, tie: number, p: number, i: number): boolean {
		if (g !== this.group[i]) return g < this.group[i];
		const c = compare(key, this.key[i]) || compare(tie, this.tie[i]);
		return c !== 0 ? c < 0 : p < this.part[i];
	}

	/** Heap entries i before j in the rank order. */
	private entryBefore(i: number, j: number): boolean {
		return this.before(this.group[i], this.key[i], this.tie[i], this.part[i], j);
	}

	private swap(i: number, j: number): void {
		const { part, group, key, tie } = this;
		const p = part[i];
		const g = group[i];
		const k = key[i];
		const t = tie[i];
		part[i] = part[j];
		group[i] = group[j];
		key[i] = key[j];
		tie[i] = tie[j];
		part[j] = p;
		group[j] = g;
		key[j] = k;
		tie[j] = t;
	}

	/** Max-heap: the entry listed last at the root. */
	private siftUp(i: number): void {
		while (i > 0) {
			const up = (i - 1) >> 1;
			if (!this.entryBefore(up, i)) break;
			this.swap(i, up);
			i = up;
		}
	}

	private siftDown(i: number): void {
		const n = this.size;
		for (;;) {
			const l = 2 * i + 1;
			if (l >= n) break;
			let c = l;
			if (l + 1 < n && this.entryBefore(l, l + 1)) c = l + 1;
			if (!this.entryBefore(i, c)) break;
			this.swap(i, c);
			i = c;
		}
	}

	/** The heap's parts in rank order (empties the heap). */
	private sorted(): Int32Array {
		const order = new Int32Array(this.size);
		while (this.size > 0) {
			order[this.size - 1] = this.part[0];
			this.size--;
			if (this.size > 0) {
				this.swap(0, this.size);
				this.siftDown(0);
			}
		}
		return order;
	}
}

/**
 * Entries of `list` (parts with several samples) from `from` on that could come before
 * (topGroup, topKey), the list's last entry, into `out` as positions in `list`, at most
 * `cap` of them (returns how many); counts the parts failing a limit into `tally` (up to
 * the last entry gathered, when the batch is full). Group and value as the flag pass
 * (rank-pass.ts): a pending bound stands for a value above the budget, and its least
 * sample (a lower bound) is its key here.
 */
function gather(
	basis: number,
	maxLeak: number,
	state: Uint8Array,
	list: Int32Array,
	given: Uint8Array,
	boundable: Uint8Array,
	pending: Uint8Array,
	least: Float64Array,
	columns: PartColumns,
	from: number,
	topGroup: number,
	topKey: number,
	out: Int32Array,
	cap: number,
	tally: Int32Array
): number {
	const { typicalA, worstA, boundA } = columns;
	let m = 0;
	const n = list.length;
	for (let i = from; i < n; i++) {
		const p = list[i];
		const st = state[p];
		if (st >= EXCLUDED) continue;
		const typical = typicalA[p];
		const worst = worstA[p];
		const hasValue = basis === 0 ? boundable[p] === 1 : basis === 1 ? worst === worst : typical === typical;
		const isPending = basis === 0 && hasValue && pending[p] === 1;
		const value = basis === 0 ? (hasValue ? (isPending ? least[p] : boundA[p]) : NaN) : basis === 1 ? worst : typical;
		const fails = st === FAILS_OTHER || (hasValue ? value : worst) > maxLeak;
		if (fails) tally[FAILING_AT]++;
		const g = (fails ? FAILS : 0) | (given[p] === 1 ? GIVEN : 0) | (hasValue ? 0 : NO_VALUE);
		if (g > topGroup) continue;
		const k = hasValue ? value : typical;
		// The margin covers exp(ln a) rounding just below a when a part's samples are all equal.
		if (g === topGroup && (isPending ? k * (1 - 1e-12) : k) > topKey) continue;
		out[m++] = i;
		if (m === cap) break;
	}
	return m;
}

/**
 * `gather` for parts with one sample (`sample[i]` is list[i]'s): the sample is the typical
 * and the worst (NaN kept out of the worst) and there is no bound, so a part has a value on
 * the worst and typical bases only. The common case, in a loop of its own that reads four
 * columns.
 */
function gatherSingles(
	basis: number,
	maxLeak: number,
	state: Uint8Array,
	list: Int32Array,
	sample: Int32Array,
	given: Uint8Array,
	hotI: Float64Array,
	from: number,
	topGroup: number,
	topKey: number,
	out: Int32Array,
	cap: number,
	tally: Int32Array
): number {
	const onBound = basis === 0;
	const onWorst = basis === 1;
	let m = 0;
	const n = list.length;
	for (let i = from; i < n; i++) {
		const p = list[i];
		const st = state[p];
		if (st >= EXCLUDED) continue;
		const typical = Math.abs(hotI[sample[i]]);
		const worst = typical > 0 ? typical : 0;
		const hasValue = !onBound && (onWorst || typical === typical);
		const k = onWorst ? worst : typical;
		const fails = st === FAILS_OTHER || (hasValue ? k : worst) > maxLeak;
		if (fails) tally[FAILING_AT]++;
		const g = (fails ? FAILS : 0) | (given[p] === 1 ? GIVEN : 0) | (hasValue ? 0 : NO_VALUE);
		if (g > topGroup || (g === topGroup && k > topKey)) continue;
		out[m++] = i;
		if (m === cap) break;
	}
	return m;
}

/**
 * `gatherSingles` while every part is listed (`ShortList.listSingles`): every entry of
 * `list` from `from` on whose leakage is not above `quickKey` (or is NaN), at most `cap`;
 * their groups are left to the caller. Counts the parts over the leakage budget.
 */
function gatherBelow(
	list: Int32Array,
	sample: Int32Array,
	hotI: Float64Array,
	maxLeak: number,
	from: number,
	quickKey: number,
	out: Int32Array,
	cap: number,
	tally: Int32Array
): number {
	let m = 0;
	let failing = 0;
	const n = list.length;
	for (let i = from; i < n; i++) {
		const k = Math.abs(hotI[sample[i]]);
		// Counted without a branch (one per part cost a third of the loop, measured).
		failing += k > maxLeak ? 1 : 0;
		if (k > quickKey) continue;
		out[m++] = i;
		if (m === cap) break;
	}
	tally[FAILING_AT] += failing;
	return m;
}

/**
 * Each part's state before its leakage is looked at: listed, failing a limit other than
 * the leakage budget, excluded over its reverse rating (its index to `excluded`), or
 * filtered out; counted into `tally`.
 */
function partStates(
	x: FlagInputs,
	checkOver: boolean,
	ratedReverse: Float64Array,
	ratedForward: Float64Array,
	out: PartColumns,
	state: Uint8Array,
	excluded: Int32Array,
	tally: Int32Array
): void {
	const { maxDrop, clampA, maxCap, reverseV, marginV, keepOverRating, include } = x;
	const checkDrop = maxDrop !== Infinity;
	const checkForward = clampA > 0;
	const checkCap = maxCap !== Infinity;
	const { dropWorstV, capacitanceF } = out;
	const n = state.length;
	for (let p = 0; p < n; p++) {
		if (include && include[p] === 0) {
			state[p] = FILTERED;
			tally[FILTERED_AT]++;
			continue;
		}
		const over = checkOver && reverseV > ratedReverse[p] - marginV;
		if (over && !keepOverRating) {
			state[p] = EXCLUDED;
			excluded[tally[EXCLUDED_AT]++] = p;
			continue;
		}
		const fails = over || (checkDrop && dropWorstV[p] > maxDrop) || (checkForward && clampA > ratedForward[p]) || (checkCap && capacitanceF[p] > maxCap);
		state[p] = fails ? FAILS_OTHER : LISTED;
	}
	// Nothing after the loop (see `gather`).
}
