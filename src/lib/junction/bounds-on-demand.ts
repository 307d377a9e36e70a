/**
 * Statistical bounds of the catalogue table computed only where a ranking needs them.
 * A part's bound exp(ȳ + k·s) over y = ln|I| of its samples takes one logarithm a sample,
 * the costliest step of a ranking after the evaluation; a short list on the bound needs
 * few of them exactly. A part whose bound is not computed yet is "pending" and keeps its
 * least sample, a lower bound of its statistical bound: exp(ȳ) is at least the smallest
 * value and k·s ≥ 0 (k ≥ 0 for coverage and confidence of at least one half).
 */
import { orderByKey } from './rank-order';

export class BoundsOnDemand {
	/** 1 while part p's bound is not computed (the ranking's per-part pass sets it). */
	readonly pending: Uint8Array;
	/** Part p's least sample |I| while its bound is pending (0 when unknown, e.g. a NaN sample). */
	readonly least: Float64Array;
	/** Parts whose bound a pass found due now (`dueCount[0]` of them), for `settleDue`. */
	readonly due: Int32Array;
	readonly dueCount = new Int32Array(1);
	private readonly key: Float64Array;
	private readonly logs: Float64Array;

	/**
	 * @param start index of each part's first sample in the sample columns; `count` its number of samples
	 */
	constructor(
		private readonly start: Int32Array,
		private readonly count: Int32Array,
		maxSamples: number
	) {
		this.pending = new Uint8Array(start.length);
		this.least = new Float64Array(start.length);
		this.key = new Float64Array(start.length);
		this.due = new Int32Array(start.length);
		this.logs = new Float64Array(maxSamples);
	}

	/**
	 * Part p's bound from its samples' currents `hotI` and the tolerance factor by sample
	 * count (two passes, as tolerance.ts), written to boundA[p]; p is no longer pending.
	 */
	settle(p: number, hotI: Float64Array, factors: Float64Array, boundA: Float64Array): number {
		const s0 = this.start[p];
		const c = this.count[p];
		const y = this.logs;
		let sum = 0;
		for (let k = 0; k < c; k++) sum += y[k] = Math.log(Math.abs(hotI[s0 + k]));
		const mean = sum / c;
		let ss = 0;
		for (let k = 0; k < c; k++) ss += (y[k] - mean) * (y[k] - mean);
		this.pending[p] = 0;
		return (boundA[p] = Math.exp(mean + factors[c] * Math.sqrt(ss / (c - 1))));
	}

	/** Settles the parts a pass found due. */
	settleDue(hotI: Float64Array, factors: Float64Array, boundA: Float64Array): void {
		for (let i = 0; i < this.dueCount[0]; i++) this.settle(this.due[i], hotI, factors, boundA);
	}

	/** Settles every pending part among `parts` (the listed ones show their bound). */
	settleAll(parts: Int32Array, hotI: Float64Array, factors: Float64Array, boundA: Float64Array): void {
		for (let i = 0; i < parts.length; i++) if (this.pending[parts[i]]) this.settle(parts[i], hotI, factors, boundA);
	}

	/**
	 * Ordering keys on the bound for a group's members of which `take` will be listed: exact
	 * where it can matter, +Infinity for parts that cannot reach the list. The bounds of any
	 * `take` members cap the list: the largest of them, U, is at or above the list's last
	 * bound, so a part whose least sample is above U cannot enter it. The `take` members
	 * whose worst samples leak least give the cap: their bounds are usually among the
	 * smallest (a part with a leaky sample has a large bound), which keeps U tight. For a
	 * list of more than a sixteenth of the group every bound is computed.
	 * @param scratch work array for `orderByKey`
	 */
	keys(
		members: Int32Array,
		take: number,
		hotI: Float64Array,
		factors: Float64Array,
		columns: { boundA: Float64Array; worstA: Float64Array; typicalA: Float64Array },
		scratch: Float64Array
	): Float64Array {
		const { boundA, worstA, typicalA } = columns;
		const pending = this.pending;
		if (take * 16 > members.length) {
			this.settleAll(members, hotI, factors, boundA);
			return boundA;
		}
		let cap = -Infinity;
		for (const p of orderByKey(members, worstA, typicalA, take, scratch)) {
			const b = pending[p] ? this.settle(p, hotI, factors, boundA) : boundA[p];
			cap = b > cap || b !== b ? b : cap;
		}
		const key = this.key;
		const least = this.least;
		// A NaN bound among them leaves no usable cap: every part gets its exact bound.
		const open = cap !== cap;
		for (let i = 0; i < members.length; i++) {
			const p = members[i];
			if (!pending[p]) key[p] = boundA[p];
			// The margin covers exp(ln a) rounding just below a when a part's samples are all equal.
			else if (open || least[p] * (1 - 1e-12) <= cap) key[p] = this.settle(p, hotI, factors, boundA);
			else key[p] = Infinity;
		}
		return key;
	}
}
