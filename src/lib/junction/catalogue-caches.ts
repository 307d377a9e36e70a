/**
 * What the catalogue table keeps between rankings that does not depend on the bias: per
 * part, whether a temperature is far from every measured one, and the forward drops at a
 * clamp current at both temperature ends. Built for one table content and dropped with it.
 */
import type { PhysicalConstants } from './constants';
import type { ModelTable } from './model-table';
import { TEMPERATURE_EXTRAPOLATION_K } from './rank-flags';

/** How many clamp current and temperature pairs' forward-drop columns are kept. */
const DROP_CACHE_SIZE = 4;
/** How many temperatures' extrapolation columns are kept. */
const FAR_CACHE_SIZE = 8;

/** Forward-drop columns for one current and pair of temperatures. */
interface DropColumns {
	currentA: number;
	cold: number;
	hot: number;
	constants: PhysicalConstants;
	columns: Float64Array;
}

/** Median of a[0…n−1] (mean of the middle two for even n); sorts that prefix in place. */
export function medianOfPrefix(a: Float64Array, n: number): number {
	for (let i = 1; i < n; i++) {
		const x = a[i];
		let j = i - 1;
		while (j >= 0 && a[j] > x) {
			a[j + 1] = a[j];
			j--;
		}
		a[j + 1] = x;
	}
	return n % 2 ? a[n >> 1] : 0.5 * (a[(n >> 1) - 1] + a[n >> 1]);
}

export class CatalogueCaches {
	private farCache = new Map<number, Uint8Array>();
	private dropCache: DropColumns[] = [];
	private readonly scratchHot: Float64Array;
	private readonly scratchCold: Float64Array;
	private readonly scratchSort: Float64Array;

	/**
	 * @param models every sample model, parts' samples consecutive
	 * @param start index of each part's first model; `count` its number of models
	 * @param temps measured temperatures [°C] of all parts, part p's at tempOffsets[p] … tempOffsets[p + 1]
	 */
	constructor(
		private readonly models: ModelTable,
		private readonly start: Int32Array,
		private readonly count: Int32Array,
		private readonly temps: Float64Array,
		private readonly tempOffsets: Int32Array,
		maxSamples: number
	) {
		this.scratchHot = new Float64Array(models.length);
		this.scratchCold = new Float64Array(models.length);
		this.scratchSort = new Float64Array(maxSamples);
	}

	/**
	 * Per part, 1 when a temperature [°C] lies more than TEMPERATURE_EXTRAPOLATION_K from every
	 * temperature the part was measured at (kept for the last few temperatures asked for).
	 */
	farAt(tC: number): Uint8Array {
		const hit = this.farCache.get(tC);
		if (hit) return hit;
		const n = this.start.length;
		const far = new Uint8Array(n);
		for (let p = 0; p < n; p++) {
			let best = Infinity;
			for (let k = this.tempOffsets[p]; k < this.tempOffsets[p + 1]; k++) best = Math.min(best, Math.abs(this.temps[k] - tC));
			far[p] = best > TEMPERATURE_EXTRAPOLATION_K ? 1 : 0;
		}
		if (this.farCache.size >= FAR_CACHE_SIZE) this.farCache.delete(this.farCache.keys().next().value as number);
		this.farCache.set(tC, far);
		return far;
	}

	/**
	 * Per part, the forward drop at a current [A] at the hot and cold ends (median over
	 * samples) and the worst (largest over samples and both ends), as columns [hot | cold |
	 * worst] of the part count each; kept for the last DROP_CACHE_SIZE current and
	 * temperature pairs asked for (least recently used dropped), like the scaled parameters.
	 */
	dropsAt(currentA: number, cold: number, hot: number, constants: PhysicalConstants): Float64Array {
		const cache = this.dropCache;
		for (let i = 0; i < cache.length; i++) {
			const d = cache[i];
			if (d.currentA === currentA && d.cold === cold && d.hot === hot && d.constants === constants) {
				if (i > 0) {
					cache.splice(i, 1);
					cache.unshift(d);
				}
				return d.columns;
			}
		}
		const n = this.start.length;
		const hotV = this.models.forwardVoltages(currentA, hot, this.scratchHot, constants);
		const coldV = cold === hot ? hotV : this.models.forwardVoltages(currentA, cold, this.scratchCold, constants);
		const columns = new Float64Array(3 * n);
		const sort = this.scratchSort;
		for (let p = 0; p < n; p++) {
			const s0 = this.start[p];
			const c = this.count[p];
			let cw = 0;
			for (let k = 0; k < c; k++) {
				sort[k] = hotV[s0 + k];
				if (hotV[s0 + k] > cw) cw = hotV[s0 + k];
				if (coldV[s0 + k] > cw) cw = coldV[s0 + k];
			}
			columns[p] = medianOfPrefix(sort, c);
			for (let k = 0; k < c; k++) sort[k] = coldV[s0 + k];
			columns[n + p] = medianOfPrefix(sort, c);
			columns[2 * n + p] = cw;
		}
		cache.unshift({ currentA, cold, hot, constants, columns });
		if (cache.length > DROP_CACHE_SIZE) cache.pop();
		return columns;
	}
}
