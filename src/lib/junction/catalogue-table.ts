/**
 * The in-memory catalogue table: every part's sample models in one vectorised ModelTable,
 * evaluated at an operating point, with per-part statistics (typical, worst sample,
 * statistical bound), flags, the split into rank groups and the order within each
 * (definitions and order rules in rank.ts).
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { ModelTable } from './model-table';
import { judgementOf, temperatureEnds, type OperatingPoint, type RankBasis } from './operating-point';
import {
	BIT_CURRENT_EXTRAPOLATED,
	BIT_FORWARD_DROP_OVER_LIMIT,
	BIT_OVER_CAPACITANCE_LIMIT,
	BIT_OVER_FORWARD_RATING,
	BIT_OVER_LEAKAGE_TARGET,
	BIT_OVER_REVERSE_RATING,
	BIT_TEMPERATURE_EXTRAPOLATED,
	flagsFromBits,
	LIMIT_BITS,
	staticFlagsOf
} from './rank-flags';
import { CatalogueCaches, medianOfPrefix } from './catalogue-caches';
import { BoundsOnDemand } from './bounds-on-demand';
import {
	GROUP_FAILS_LIMIT as FAILS_LIMIT,
	GROUP_GIVEN as GIVEN,
	GROUP_NO_VALUE as NO_VALUE,
	GROUP_UNLISTED as UNLISTED,
	orderGroups,
	RANK_GROUPS as GROUPS
} from './rank-order';
import type { CatalogueView, PartRecord, RankedPart, RankOptions, RankResult } from './rank-types';
import { toleranceFactor } from './tolerance';
import { CatalogueNoise } from './catalogue-noise';

/** Where `counts` keeps the number of parts excluded by their reverse rating. */
const EXCLUDED = GROUPS;
const BASIS_INDEX: Record<RankBasis, number> = { bound: 0, worst: 1, typical: 2 };

/** Result columns per part, in the one buffer: typical, worst, bound, drops ×3, capacitance, noise ×3. */
const COLUMNS = 10;

/**
 * In-memory catalogue built from plain records. Build once at start-up, then call
 * `refresh(records)` whenever parts change. `rank(op)` is synchronous and leaves the records
 * alone; it keeps work arrays, per-temperature caches (scaled parameters, the
 * temperature-extrapolation test, the bias-independent forward drops per clamp current),
 * the tolerance factors per coverage and confidence and, with `reuse`, its result buffers
 * in the table, all dropped by `refresh`.
 */
export class CatalogueTable {
	private parts: PartRecord[] = [];
	private models!: ModelTable;
	private start!: Int32Array;
	private count!: Int32Array;
	private staticFlags!: Uint32Array;
	/** 1 for a part with only a given model. */
	private given!: Uint8Array;
	private minMeasured!: Float64Array;
	private tempOffsets!: Int32Array;
	private temps!: Float64Array;
	private ratedReverse!: Float64Array;
	private ratedForward!: Float64Array;
	private hasCjo!: Uint8Array;
	/** Distinct sample counts of measured parts with two or more samples (the factors needed). */
	private boundCounts: number[] = [];
	private maxSamples = 1;
	private scratchHot = new Float64Array(0);
	private scratchSort = new Float64Array(0);
	private scratchGroups = new Int32Array(0);
	private bucket = new Uint8Array(0);
	private counts = new Int32Array(GROUPS + 1);
	private resultColumns = new Float64Array(0);
	private resultFlags = new Uint32Array(0);
	private scratchKeys = new Float64Array(0);
	private bounds!: BoundsOnDemand;
	private caches!: CatalogueCaches;
	private noise!: CatalogueNoise;
	private factorCache = new Map<string, Float64Array>();

	constructor(records: readonly PartRecord[] = []) {
		this.refresh(records);
	}

	/** Number of parts. */
	get size(): number {
		return this.parts.length;
	}

	/** Number of sample models over all parts. */
	get sampleCount(): number {
		return this.models.length;
	}

	/**
	 * Replace the table's content with new records (builds fresh arrays, then swaps).
	 * @throws RangeError when a part has no samples.
	 */
	refresh(records: readonly PartRecord[]): void {
		const n = records.length;
		const start = new Int32Array(n);
		const count = new Int32Array(n);
		const flags = new Uint32Array(n);
		const given = new Uint8Array(n);
		const minMeasured = new Float64Array(n);
		const ratedReverse = new Float64Array(n);
		const ratedForward = new Float64Array(n);
		const hasCjo = new Uint8Array(n);
		const tempOffsets = new Int32Array(n + 1);
		const all: JunctionModel[] = [];
		const temps: number[] = [];
		const boundCounts = new Set<number>();
		let maxSamples = 1;
		records.forEach((p, k) => {
			if (p.samples.length === 0) throw new RangeError(`part '${p.id}' has no sample models`);
			start[k] = all.length;
			count[k] = p.samples.length;
			maxSamples = Math.max(maxSamples, p.samples.length);
			all.push(...p.samples);
			given[k] = p.evidence === 'given' ? 1 : 0;
			if (!given[k] && p.samples.length >= 2) boundCounts.add(p.samples.length);
			flags[k] = staticFlagsOf(p);
			minMeasured[k] = p.measured.minAbsCurrentA;
			ratedReverse[k] = p.ratings.reverseV ?? Infinity;
			ratedForward[k] = p.ratings.forwardCurrentA ?? Infinity;
			hasCjo[k] = p.samples.every((s) => s.CJO !== undefined && s.CJO > 0) ? 1 : 0;
			tempOffsets[k] = temps.length;
			temps.push(...p.measured.temperaturesC);
		});
		tempOffsets[n] = temps.length;
		this.models = new ModelTable(all);
		this.parts = [...records];
		this.start = start;
		this.count = count;
		this.staticFlags = flags;
		this.given = given;
		this.minMeasured = minMeasured;
		this.ratedReverse = ratedReverse;
		this.ratedForward = ratedForward;
		this.hasCjo = hasCjo;
		this.tempOffsets = tempOffsets;
		this.temps = Float64Array.from(temps);
		this.boundCounts = [...boundCounts].sort((a, b) => a - b);
		this.maxSamples = maxSamples;
		this.scratchHot = new Float64Array(all.length);
		this.scratchSort = new Float64Array(maxSamples);
		this.scratchGroups = new Int32Array(n);
		this.bucket = new Uint8Array(n);
		this.scratchKeys = new Float64Array(n);
		this.bounds = new BoundsOnDemand(start, count, maxSamples);
		this.caches = new CatalogueCaches(this.models, start, count, this.temps, tempOffsets, maxSamples);
		this.noise = new CatalogueNoise(this.models, start, count, given, maxSamples);
		this.factorCache = new Map();
		this.resultColumns = new Float64Array(0);
		this.resultFlags = new Uint32Array(0);
	}

	/** The table's columns for other evaluations over the same catalogue (the protected node's ranking). */
	view(): CatalogueView {
		return {
			records: this.parts,
			models: this.models,
			start: this.start,
			count: this.count,
			given: this.given,
			staticFlags: this.staticFlags,
			minMeasuredA: this.minMeasured,
			ratedReverseV: this.ratedReverse,
			ratedForwardA: this.ratedForward,
			farAt: (tC) => this.caches.farAt(tC),
			factorsFor: (coverage, confidence) => this.factorsFor(coverage, confidence)
		};
	}

	/** The record behind a part index. */
	part(index: number): PartRecord {
		return this.parts[index];
	}

	/** Index of the first sample model of a part in `RankResult.sampleA` (its samples follow). */
	sampleStart(index: number): number {
		return this.start[index];
	}

	/**
	 * Evaluate the leakage current of every sample model at the operating point's hot end
	 * (signed, A) into `out`. This is the inner loop of `rank`.
	 * @throws RangeError for an invalid operating point.
	 */
	sampleCurrents(op: OperatingPoint, out: Float64Array, constants: PhysicalConstants = SI_2019): Float64Array {
		const [, hot] = temperatureEnds(op);
		return this.models.currents(op.biasV, hot, out, constants, op.sourceResistanceOhm ?? 0);
	}

	/**
	 * Rank all parts for an operating point (definitions and order in rank.ts).
	 * @throws RangeError for an invalid operating point or options.
	 */
	rank(op: OperatingPoint, constants: PhysicalConstants = SI_2019, options: RankOptions = {}): RankResult {
		const [cold, hot] = temperatureEnds(op);
		if (!Number.isFinite(op.biasV)) throw new RangeError(`bias must be finite, got ${op.biasV}`);
		const { basis, coverage, confidence } = judgementOf(op);
		const n = this.parts.length;
		const include = options.include;
		if (include && include.length !== n) throw new RangeError(`include mask has ${include.length} entries for ${n} parts`);
		const limit = options.limit ?? Infinity;
		if (!(limit >= 0)) throw new RangeError(`limit must be a non-negative number, got ${options.limit}`);
		const factors = this.factorsFor(coverage, confidence);
		const hotI = this.models.currents(op.biasV, hot, this.scratchHot, constants, op.sourceResistanceOhm ?? 0);
		// One allocation for the result's columns, or none when reusing the table's.
		if (options.reuse && this.resultColumns.length !== COLUMNS * n) {
			this.resultColumns = new Float64Array(COLUMNS * n);
			this.resultFlags = new Uint32Array(n);
		}
		const columns = options.reuse ? this.resultColumns : new Float64Array(COLUMNS * n);
		const column = (i: number) => columns.subarray(i * n, (i + 1) * n);
		const [typicalA, worstA, boundA, dropHotV, dropColdV, dropWorstV, capacitanceF, noiseTypical, noiseWorst, noiseBound] = Array.from(
			{ length: COLUMNS },
			(_, i) => column(i)
		);
		// NaN = not computed: forward drops without a clamp current, capacitance and noise without a limit.
		if (op.clampCurrentA === undefined) columns.fill(NaN, 3 * n, 6 * n);
		columns.fill(NaN, 6 * n);
		const flags = options.reuse ? this.resultFlags : new Uint32Array(n);
		// Forward drops do not depend on the bias: kept per clamp current and temperature ends.
		if (op.clampCurrentA !== undefined) columns.set(this.caches.dropsAt(op.clampCurrentA, cold, hot, constants), 3 * n);
		this.partLoop(op, cold, hot, hotI, include, constants, BASIS_INDEX[basis], factors, typicalA, worstA, boundA, dropWorstV, capacitanceF, flags);
		if (op.maxNoiseA_rtHz !== undefined)
			this.noise.limitPass(
				{ limit: op.maxNoiseA_rtHz, biasV: op.biasV, hot, currents: hotI, include, constants, basis, factors },
				[noiseTypical, noiseWorst, noiseBound],
				flags,
				this.bucket,
				this.counts
			);
		const counts = this.counts;
		const excluded = counts[EXCLUDED] > 0 ? overRating(flags, include, counts[EXCLUDED]) : new Int32Array(0);
		// Bounds are computed where the order needs them (bounds-on-demand.ts), then for every listed part.
		const keyOf = (b: number, members: Int32Array, take: number) =>
			b & NO_VALUE || basis === 'typical'
				? typicalA
				: basis === 'worst'
					? worstA
					: this.bounds.keys(members, take, hotI, factors, { boundA, worstA, typicalA }, this.scratchKeys);
		const order = orderGroups(this.bucket, counts.subarray(0, GROUPS), UNLISTED, keyOf, typicalA, limit, this.scratchGroups, this.scratchKeys);
		this.bounds.settleAll(order, hotI, factors, boundA);
		let ranked = 0;
		let meetingLimits = 0;
		for (let b = 0; b < GROUPS; b++) {
			ranked += counts[b];
			if ((b & FAILS_LIMIT) === 0) meetingLimits += counts[b];
		}
		return {
			order,
			ranked,
			meetingLimits,
			excluded,
			basis,
			coverage,
			confidence,
			typicalA,
			worstA,
			boundA,
			factorByCount: factors,
			sampleA: options.reuse ? hotI : hotI.slice(),
			dropHotV,
			dropColdV,
			dropWorstV,
			flags,
			capacitanceF,
			noiseTypical,
			noiseWorst,
			noiseBound,
			hotC: hot,
			coldC: cold
		};
	}

	/**
	 * Tolerance factor k by sample count for a coverage and confidence (NaN below two
	 * samples and for counts no measured part has), kept for the last few pairs asked for.
	 */
	private factorsFor(coverage: number, confidence: number): Float64Array {
		const key = `${coverage}|${confidence}`;
		const hit = this.factorCache.get(key);
		if (hit) return hit;
		const k = new Float64Array(this.maxSamples + 1).fill(NaN);
		for (const c of this.boundCounts) k[c] = toleranceFactor(c, coverage, confidence);
		if (this.factorCache.size >= 8) this.factorCache.delete(this.factorCache.keys().next().value as string);
		this.factorCache.set(key, k);
		return k;
	}

	/**
	 * The per-part pass of `rank` (its own function so the engine optimises it whole):
	 * statistics over samples (typical, worst, bound), flags, and each listed part's rank
	 * group in `bucket` with `counts` per group (and excluded parts in counts[EXCLUDED]).
	 * The bound is left pending (NaN; bounds-on-demand.ts) unless the leakage budget needs
	 * it now: ranked on the bound with a budget at or above the part's least sample. A part
	 * whose samples all leak exactly zero (zero bias) has a zero bound.
	 */
	private partLoop(
		op: OperatingPoint,
		cold: number,
		hot: number,
		hotI: Float64Array,
		include: Uint8Array | undefined,
		constants: PhysicalConstants,
		basis: number,
		factors: Float64Array,
		typicalA: Float64Array,
		worstA: Float64Array,
		boundA: Float64Array,
		dropWorstV: Float64Array,
		capacitanceF: Float64Array,
		flags: Uint32Array
	): void {
		const n = this.parts.length;
		const margin = op.reverseMarginV ?? 0;
		const maxDrop = op.maxForwardDropV ?? Infinity;
		const maxLeak = op.maxLeakageA ?? Infinity;
		const maxCap = op.maxCapacitanceF;
		const clampA = op.clampCurrentA ?? 0;
		const sort = this.scratchSort;
		const least = this.bounds.least;
		const pending = this.bounds.pending;
		const onBound = basis === 0;
		const farCold = this.caches.farAt(cold);
		const farHot = this.caches.farAt(hot);
		const mid = 0.5 * (hot + cold);
		const bucket = this.bucket;
		const counts = this.counts;
		// The table's columns as locals, so the loop reads them without going through `this`.
		const start = this.start;
		const count = this.count;
		const given = this.given;
		const staticFlags = this.staticFlags;
		const minMeasured = this.minMeasured;
		const ratedReverse = this.ratedReverse;
		const ratedForward = this.ratedForward;
		const hasCjo = this.hasCjo;
		const biasV = op.biasV;
		// Reverse bias [V] (−Infinity when forward, so no part is over its rating).
		const reverseV = biasV < 0 ? -biasV : -Infinity;
		const keepOver = op.includeOverRating === true;
		counts.fill(0);
		for (let p = 0; p < n; p++) {
			const s0 = start[p];
			const c = count[p];
			let worst = 0;
			let typical: number;
			let bound = NaN;
			let hasBound = false;
			pending[p] = 0;
			if (c === 1) {
				// One sample: it is the median, and there is no bound; NaN stays out of the worst, as below.
				typical = Math.abs(hotI[s0]);
				if (typical > 0) worst = typical;
			} else {
				for (let k = 0; k < c; k++) {
					const a = Math.abs(hotI[s0 + k]);
					sort[k] = a;
					if (a > worst) worst = a;
				}
				typical = medianOfPrefix(sort, c);
				if (given[p] === 0) {
					hasBound = true;
					// sort[0] is the least sample now (NaN, if any, sorts nowhere in particular: then no cap).
					const low = sort[0];
					if (worst === 0) bound = 0;
					else if (onBound && maxLeak !== Infinity && !(low > maxLeak)) {
						least[p] = low;
						bound = this.bounds.settle(p, hotI, factors, boundA);
					} else {
						least[p] = low === low ? low : 0;
						pending[p] = 1;
					}
				}
			}
			typicalA[p] = typical;
			worstA[p] = worst;
			boundA[p] = bound;
			// A pending bound is above the budget (its least sample is) or there is no budget.
			const value = basis === 0 ? (pending[p] ? least[p] : bound) : basis === 1 ? worst : typical;
			const hasValue = basis === 0 ? hasBound : value === value;
			let f = staticFlags[p];
			if (typical < minMeasured[p] / 10) f |= BIT_CURRENT_EXTRAPOLATED;
			if (farCold[p] | farHot[p]) f |= BIT_TEMPERATURE_EXTRAPOLATED;
			// Without a value on the basis (no bound), the budget is held against the worst sample.
			if ((hasValue ? value : worst) > maxLeak) f |= BIT_OVER_LEAKAGE_TARGET;
			// NaN (no clamp current) never exceeds the limit.
			if (dropWorstV[p] > maxDrop) f |= BIT_FORWARD_DROP_OVER_LIMIT;
			if (clampA > ratedForward[p]) f |= BIT_OVER_FORWARD_RATING;
			if (maxCap !== undefined && hasCjo[p] && (!include || include[p] !== 0)) {
				const cap = this.medianCapacitance(p, biasV, mid, constants);
				capacitanceF[p] = cap;
				if (cap > maxCap) f |= BIT_OVER_CAPACITANCE_LIMIT;
			}
			const over = reverseV > ratedReverse[p] - margin;
			if (over) f |= BIT_OVER_REVERSE_RATING;
			flags[p] = f;
			let b = UNLISTED;
			if (include && include[p] === 0) b = UNLISTED;
			else if (over && !keepOver) counts[EXCLUDED]++;
			else {
				b = ((f & LIMIT_BITS) !== 0 ? FAILS_LIMIT : 0) | (given[p] === 1 ? GIVEN : 0) | (hasValue ? 0 : NO_VALUE);
				counts[b]++;
			}
			bucket[p] = b;
		}
		// Nothing after the loop: code the first (on-stack-replaced) run never reached
		// would make V8 drop the optimised loop at its end on every call.
	}

	/**
	 * Turn a page of a ranking into plain objects (allocates only for the page).
	 * Capacitance is evaluated here, per listed part, at the mid temperature, unless the
	 * ranking already did (capacitance limit). With `withSamples`, each row carries every
	 * sample's |leakage| at the hot end.
	 */
	rows(
		result: RankResult,
		op: OperatingPoint,
		offset = 0,
		limit = 50,
		constants: PhysicalConstants = SI_2019,
		options: { withSamples?: boolean } = {}
	): RankedPart[] {
		const out: RankedPart[] = [];
		const mid = 0.5 * (result.hotC + result.coldC);
		const end = Math.min(result.order.length, offset + limit);
		for (let r = offset; r < end; r++) {
			const p = result.order[r];
			const rec = this.parts[p];
			const c = this.count[p];
			const bound = result.boundA[p];
			const hasBound = !Number.isNaN(bound);
			const row: RankedPart = {
				id: rec.id,
				kind: rec.kind,
				samples: c,
				evidence: this.given[p] === 1 ? 'given' : 'measured',
				leakageA: { typical: result.typicalA[p], worst: result.worstA[p], bound: hasBound ? bound : null },
				bound: hasBound ? { n: c, k: result.factorByCount[c], coverage: result.coverage, confidence: result.confidence } : null,
				noiseA_rtHz: this.noise.row(result, p, op.biasV, constants),
				flags: flagsFromBits(result.flags[p]),
				meetsLimits: (result.flags[p] & LIMIT_BITS) === 0
			};
			if (options.withSamples) {
				const s0 = this.start[p];
				row.sampleLeakageA = Array.from({ length: c }, (_, k) => Math.abs(result.sampleA[s0 + k]));
			}
			if (!Number.isNaN(result.dropWorstV[p]))
				row.forwardDropV = { hot: result.dropHotV[p], cold: result.dropColdV[p], worst: result.dropWorstV[p] };
			if (this.hasCjo[p])
				row.capacitanceF = Number.isNaN(result.capacitanceF[p])
					? this.medianCapacitance(p, op.biasV, mid, constants)
					: result.capacitanceF[p];
			out.push(row);
		}
		return out;
	}

	/** Median over a part's samples of the depletion capacitance at a bias [V] and temperature [°C], in farads. */
	private medianCapacitance(p: number, biasV: number, temperatureC: number, constants: PhysicalConstants): number {
		const c = this.count[p];
		const sort = this.scratchSort;
		for (let k = 0; k < c; k++) sort[k] = this.models.capacitance(this.start[p] + k, biasV, temperatureC, constants);
		return medianOfPrefix(sort, c);
	}
}

/** The `count` parts flagged over their reverse rating (among the included ones), in index order. */
function overRating(flags: Uint32Array, include: Uint8Array | undefined, count: number): Int32Array {
	const out = new Int32Array(count);
	let e = 0;
	for (let p = 0; p < flags.length; p++) if (flags[p] & BIT_OVER_REVERSE_RATING && !(include && include[p] === 0)) out[e++] = p;
	return out;
}
