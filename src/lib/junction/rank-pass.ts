/**
 * The per-part passes of a ranking over the catalogue table's columns (definitions in
 * rank.ts): sample statistics (typical, worst, the bound or its pending lower bound), then
 * flags and rank groups. What does not depend on the operating point is prepared once per
 * table content (`PartLayout`): which parts have several samples, which can have a bound,
 * a tenth of the least measured current. Each pass is a plain loop over typed arrays; the
 * flag pass reads only the columns of limits the operating point states, since at 100k
 * parts the time goes into memory traffic more than into arithmetic.
 */
import {
	BIT_CURRENT_EXTRAPOLATED,
	BIT_FORWARD_DROP_OVER_LIMIT,
	BIT_OVER_CAPACITANCE_LIMIT,
	BIT_OVER_FORWARD_RATING,
	BIT_OVER_LEAKAGE_TARGET,
	BIT_OVER_REVERSE_RATING,
	BIT_TEMPERATURE_EXTRAPOLATED,
	LIMIT_BITS
} from './rank-flags';
import { medianOfPrefix } from './catalogue-caches';
import type { BoundsOnDemand } from './bounds-on-demand';
import { GROUP_FAILS_LIMIT, GROUP_GIVEN, GROUP_NO_VALUE, GROUP_UNLISTED } from './rank-order';

// Imported names held in module constants, read once: a loader with live bindings (tsx, the
// dev server) reads an imported name through a getter at every use, here once per part per flag.
const [CUR_X, TEMP_X, LEAK, DROP, FWD, CAP, REV, LIMITS] = [
	BIT_CURRENT_EXTRAPOLATED,
	BIT_TEMPERATURE_EXTRAPOLATED,
	BIT_OVER_LEAKAGE_TARGET,
	BIT_FORWARD_DROP_OVER_LIMIT,
	BIT_OVER_FORWARD_RATING,
	BIT_OVER_CAPACITANCE_LIMIT,
	BIT_OVER_REVERSE_RATING,
	LIMIT_BITS
];
const [UNLISTED, FAILS, GIVEN, NO_VALUE] = [GROUP_UNLISTED, GROUP_FAILS_LIMIT, GROUP_GIVEN, GROUP_NO_VALUE];
const median = medianOfPrefix;

/** Facts about the parts that no operating point changes, prepared with the table. */
export interface PartLayout {
	/** Parts with two or more samples, in index order. */
	multiples: Int32Array;
	/** Parts with one sample, in index order, and that sample's index. */
	singles: Int32Array;
	singleSample: Int32Array;
	/** 1 for a measured part with two or more samples: it has a statistical bound. */
	boundable: Uint8Array;
	/** A tenth of the least measured |current| [A]: typical leakage below it is an extrapolation. */
	extrapolationA: Float64Array;
	/** 0 … n − 1: the members of a group that holds every part. */
	all: Int32Array;
	/** The least reverse rating of any part [V] (Infinity: none rated). */
	leastReverseRatingV: number;
}

export function partLayout(start: Int32Array, count: Int32Array, given: Uint8Array, minMeasuredA: Float64Array, ratedReverseV: Float64Array): PartLayout {
	const n = count.length;
	let multiples = 0;
	for (let p = 0; p < n; p++) if (count[p] > 1) multiples++;
	const layout: PartLayout = {
		multiples: new Int32Array(multiples),
		singles: new Int32Array(n - multiples),
		singleSample: new Int32Array(n - multiples),
		boundable: new Uint8Array(n),
		extrapolationA: new Float64Array(n),
		all: Int32Array.from({ length: n }, (_, p) => p),
		leastReverseRatingV: Infinity
	};
	let m = 0;
	let one = 0;
	for (let p = 0; p < n; p++) {
		if (count[p] > 1) layout.multiples[m++] = p;
		else {
			layout.singles[one] = p;
			layout.singleSample[one++] = start[p];
		}
		layout.boundable[p] = given[p] === 0 && count[p] >= 2 ? 1 : 0;
		layout.extrapolationA[p] = minMeasuredA[p] / 10;
		if (ratedReverseV[p] < layout.leastReverseRatingV) layout.leastReverseRatingV = ratedReverseV[p];
	}
	return layout;
}

/**
 * Several samples: median, largest, and for a measured part the bound, left pending (NaN
 * in boundA; bounds-on-demand.ts); when the leakage budget needs it now — ranked on the
 * bound (`onBound`) with a budget at or above the part's least sample — the part is due,
 * and `bounds.settleDue` must follow. A part whose samples all leak exactly zero (zero
 * bias) has a zero bound.
 */
export function multiSampleStatistics(
	multiples: Int32Array,
	start: Int32Array,
	count: Int32Array,
	given: Uint8Array,
	hotI: Float64Array,
	sort: Float64Array,
	onBound: boolean,
	maxLeak: number,
	bounds: BoundsOnDemand,
	typicalA: Float64Array,
	worstA: Float64Array,
	boundA: Float64Array
): void {
	const least = bounds.least;
	const pending = bounds.pending;
	const due = bounds.due;
	const dueCount = bounds.dueCount;
	dueCount[0] = 0;
	const n = multiples.length;
	for (let i = 0; i < n; i++) {
		const p = multiples[i];
		const s0 = start[p];
		const c = count[p];
		let worst = 0;
		for (let k = 0; k < c; k++) {
			const a = Math.abs(hotI[s0 + k]);
			sort[k] = a;
			if (a > worst) worst = a;
		}
		const typical = median(sort, c);
		let bound = NaN;
		pending[p] = 0;
		if (given[p] === 0) {
			// sort[0] is the least sample now (NaN, if any, sorts nowhere in particular: then no cap).
			const low = sort[0];
			if (worst === 0) bound = 0;
			else if (onBound && maxLeak !== Infinity && !(low > maxLeak)) {
				// Due now: the caller settles it after this pass (`settleDue`), as a call in this
				// loop would make V8 reload every column on every part.
				least[p] = low;
				pending[p] = 1;
				due[dueCount[0]++] = p;
			} else {
				least[p] = low === low ? low : 0;
				pending[p] = 1;
			}
		}
		typicalA[p] = typical;
		worstA[p] = worst;
		boundA[p] = bound;
	}
}

/** The operating point's limits and the columns the flag pass reads besides the statistics. */
export interface FlagInputs {
	/** 0 bound, 1 worst, 2 typical. */
	basis: number;
	maxLeak: number;
	/** Forward-drop limit [V] (Infinity: none, or no clamp current to judge it at). */
	maxDrop: number;
	/** Clamp current [A] (0 without one: never over a forward rating). */
	clampA: number;
	/** Capacitance limit [F] (Infinity: none). */
	maxCap: number;
	/** Reverse bias [V] (−Infinity when forward). */
	reverseV: number;
	marginV: number;
	keepOverRating: boolean;
	include: Uint8Array | undefined;
	farCold: Uint8Array;
	farHot: Uint8Array;
}

/** The columns a ranking writes per part. */
export interface PartColumns {
	typicalA: Float64Array;
	worstA: Float64Array;
	boundA: Float64Array;
	dropWorstV: Float64Array;
	capacitanceF: Float64Array;
	flags: Uint32Array;
}

/**
 * Statistics of the parts with one sample (it is the median and the worst, NaN kept out of
 * the worst; no bound), then flags of every part and its rank group in `bucket` (UNLISTED
 * when filtered out or left out over its reverse rating), with `counts` per group and the
 * parts left out over their rating in counts[excludedAt]. Parts with several samples have
 * their statistics from `multiSampleStatistics` already. A limit the operating point does
 * not state is not looked at (its column is not read). With `parts`, only those parts are
 * flagged (and counted).
 */
export function flagPass(
	x: FlagInputs,
	layout: PartLayout,
	start: Int32Array,
	count: Int32Array,
	given: Uint8Array,
	staticFlags: Uint32Array,
	ratedReverse: Float64Array,
	ratedForward: Float64Array,
	least: Float64Array,
	pending: Uint8Array,
	hotI: Float64Array,
	out: PartColumns,
	bucket: Uint8Array,
	counts: Int32Array,
	excludedAt: number,
	parts?: Int32Array
): void {
	const { basis, maxLeak, maxDrop, clampA, maxCap, reverseV, marginV, keepOverRating, include, farCold, farHot } = x;
	const { typicalA, worstA, boundA, dropWorstV, capacitanceF, flags } = out;
	const boundable = layout.boundable;
	const extrapolationA = layout.extrapolationA;
	const checkDrop = maxDrop !== Infinity;
	const checkForward = clampA > 0;
	const checkCap = maxCap !== Infinity;
	const n = flags.length;
	counts.fill(0);
	const m = parts ? parts.length : n;
	for (let i = 0; i < m; i++) {
		const p = parts ? parts[i] : i;
		let typical: number;
		let worst: number;
		if (count[p] === 1) {
			typical = Math.abs(hotI[start[p]]);
			worst = typical > 0 ? typical : 0;
			typicalA[p] = typical;
			worstA[p] = worst;
		} else {
			typical = typicalA[p];
			worst = worstA[p];
		}
		// A pending bound is above the budget (its least sample is) or there is no budget.
		const hasValue = basis === 0 ? boundable[p] === 1 : basis === 1 ? worst === worst : typical === typical;
		const value = basis === 0 ? (hasValue ? (pending[p] ? least[p] : boundA[p]) : NaN) : basis === 1 ? worst : typical;
		let f = staticFlags[p];
		if (typical < extrapolationA[p]) f |= CUR_X;
		if (farCold[p] | farHot[p]) f |= TEMP_X;
		// Without a value on the basis (no bound), the budget is held against the worst sample.
		if ((hasValue ? value : worst) > maxLeak) f |= LEAK;
		if (checkDrop && dropWorstV[p] > maxDrop) f |= DROP;
		if (checkForward && clampA > ratedForward[p]) f |= FWD;
		// NaN (not computed: no CJO, or filtered out) never exceeds the limit.
		if (checkCap && capacitanceF[p] > maxCap) f |= CAP;
		const over = reverseV > ratedReverse[p] - marginV;
		if (over) f |= REV;
		flags[p] = f;
		let b = UNLISTED;
		if (include && include[p] === 0) b = UNLISTED;
		else if (over && !keepOverRating) counts[excludedAt]++;
		else {
			b = ((f & LIMITS) !== 0 ? FAILS : 0) | (given[p] === 1 ? GIVEN : 0) | (hasValue ? 0 : NO_VALUE);
			counts[b]++;
		}
		bucket[p] = b;
	}
	// Nothing after the loop: code the first (on-stack-replaced) run never reached would make
	// V8 drop the optimised loop at its end on every call.
}

/** The `count` parts flagged over their reverse rating (among the included ones), in index order. */
export function overRating(flags: Uint32Array, include: Uint8Array | undefined, count: number): Int32Array {
	const out = new Int32Array(count);
	let e = 0;
	for (let p = 0; p < flags.length; p++) if (flags[p] & REV && !(include && include[p] === 0)) out[e++] = p;
	return out;
}
