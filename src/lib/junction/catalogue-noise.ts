/**
 * A catalogue part's current noise at an operating point, from its samples' noise power
 * densities S_s at the bias and hot end (noise.ts: shot noise 2q·(I + 2·IS) of the ideal
 * junction plus the shunt's 4kT/RSH). Over the samples, as for leakage (rank.ts):
 *  - typical = the median, worst = the noisiest sample;
 *  - bound = exp(ȳ + k·s) over y = ln S_s, s the sample standard deviation (n − 1), k the
 *    one-sided normal tolerance factor (tolerance.ts) for the part's sample count; taking
 *    lot-to-lot noise power as log-normal like the leakage it comes from is common practice.
 *    No bound (NaN) without k (fewer than two measured samples, or a given model).
 * Results are densities √S [A/√Hz].
 */
import type { PhysicalConstants } from './constants';
import { medianOfPrefix } from './catalogue-caches';
import type { ModelTable } from './model-table';
import type { RankBasis } from './operating-point';
import { BIT_OVER_NOISE_LIMIT } from './rank-flags';
import { GROUP_FAILS_LIMIT, GROUP_UNLISTED } from './rank-order';
import type { RankedPart, RankResult } from './rank-types';

/** Where partNoise writes: typical, worst, bound [A/√Hz]. */
export const NOISE_TYPICAL = 0;
export const NOISE_WORST = 1;
export const NOISE_BOUND = 2;

/**
 * Noise figures of one part from its samples' powers `powers[s0 … s0 + c − 1]` [A²/Hz],
 * with tolerance factor `k` (NaN: no bound), into `out` (NOISE_TYPICAL …); `sort` is work
 * space of at least c entries.
 */
export function partNoise(powers: Float64Array, s0: number, c: number, k: number, sort: Float64Array, out: Float64Array): void {
	let worst = 0;
	let sum = 0;
	for (let i = 0; i < c; i++) {
		const w = powers[s0 + i];
		sort[i] = w;
		if (w > worst) worst = w;
		sum += Math.log(w);
	}
	let bound = NaN;
	if (c >= 2 && k === k) {
		const mean = sum / c;
		let ss = 0;
		for (let i = 0; i < c; i++) {
			const d = Math.log(powers[s0 + i]) - mean;
			ss += d * d;
		}
		bound = Math.exp(mean + k * Math.sqrt(ss / (c - 1)));
	}
	out[NOISE_TYPICAL] = Math.sqrt(medianOfPrefix(sort, c));
	out[NOISE_WORST] = Math.sqrt(worst);
	out[NOISE_BOUND] = Math.sqrt(bound);
}

/** What the noise limit pass needs of a ranking. */
export interface NoiseLimitInput {
	/** Largest allowed density on the basis [A/√Hz]. */
	limit: number;
	biasV: number;
	/** Hot end [°C]. */
	hot: number;
	/** Every sample model's current at the bias and hot end [A]. */
	currents: Float64Array;
	include: Uint8Array | undefined;
	constants: PhysicalConstants;
	basis: RankBasis;
	/** Tolerance factor by sample count (NaN: no bound). */
	factors: Float64Array;
}

/** The catalogue table's noise figures: a pass over every part for a noise limit, and one listed row. */
export class CatalogueNoise {
	private readonly powers: Float64Array;
	private readonly sort: Float64Array;
	private readonly figures = new Float64Array(3);

	constructor(
		private readonly models: ModelTable,
		private readonly start: Int32Array,
		private readonly count: Int32Array,
		/** 1 for a part with only a given model (no bound). */
		private readonly given: Uint8Array,
		maxSamples: number
	) {
		this.powers = new Float64Array(models.length);
		this.sort = new Float64Array(maxSamples);
	}

	/**
	 * Every listed part's noise figures into `columns` (typical, worst, bound), held against
	 * the limit on the basis (the noisiest sample where a part has no value on it): a part over
	 * it gets the flag and moves from its rank group to the one failing a limit (`bucket`, `counts`).
	 */
	limitPass(input: NoiseLimitInput, columns: Float64Array[], flags: Uint32Array, bucket: Uint8Array, counts: Int32Array): void {
		const powers = this.models.noisePowers(input.biasV, input.hot, input.currents, this.powers, input.constants);
		const at = input.basis === 'bound' ? NOISE_BOUND : input.basis === 'worst' ? NOISE_WORST : NOISE_TYPICAL;
		const f = this.figures;
		for (let p = 0; p < this.count.length; p++) {
			if (input.include && input.include[p] === 0) continue;
			const c = this.count[p];
			partNoise(powers, this.start[p], c, this.given[p] === 1 ? NaN : input.factors[c], this.sort, f);
			for (let i = 0; i < 3; i++) columns[i][p] = f[i];
			const value = f[at] === f[at] ? f[at] : f[NOISE_WORST];
			if (!(value > input.limit)) continue;
			flags[p] |= BIT_OVER_NOISE_LIMIT;
			const b = bucket[p];
			if (b !== GROUP_UNLISTED && (b & GROUP_FAILS_LIMIT) === 0) {
				counts[b]--;
				counts[b | GROUP_FAILS_LIMIT]++;
				bucket[p] = b | GROUP_FAILS_LIMIT;
			}
		}
	}

	/** A listed part's figures from the ranking, computed now for its samples when the ranking did not (no limit). */
	row(result: RankResult, p: number, biasV: number, constants: PhysicalConstants): RankedPart['noiseA_rtHz'] {
		const f = this.figures;
		if (Number.isNaN(result.noiseWorst[p])) {
			const s0 = this.start[p];
			const c = this.count[p];
			for (let k = 0; k < c; k++) this.powers[s0 + k] = this.models.noisePowerAt(s0 + k, biasV, result.sampleA[s0 + k], result.hotC, constants);
			partNoise(this.powers, s0, c, this.given[p] === 1 ? NaN : result.factorByCount[c], this.sort, f);
		} else [f[0], f[1], f[2]] = [result.noiseTypical[p], result.noiseWorst[p], result.noiseBound[p]];
		return { typical: f[NOISE_TYPICAL], worst: f[NOISE_WORST], bound: Number.isNaN(f[NOISE_BOUND]) ? null : f[NOISE_BOUND] };
	}
}
