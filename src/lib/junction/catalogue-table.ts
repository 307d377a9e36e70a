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
import { flagsFromBits, LIMIT_BITS, staticFlagsOf } from './rank-flags';
import { flagPass, multiSampleStatistics, overRating, partLayout, type FlagInputs, type PartColumns, type PartLayout } from './rank-pass';
import { CatalogueCaches, medianOfPrefix } from './catalogue-caches';
import { BoundsOnDemand } from './bounds-on-demand';
import { ShortList } from './rank-select';
import { GROUP_FAILS_LIMIT as FAILS_LIMIT, GROUP_NO_VALUE as NO_VALUE, GROUP_UNLISTED as UNLISTED, orderGroups, RANK_GROUPS as GROUPS } from './rank-order';
import type { CatalogueView, PartRecord, RankedPart, RankOptions, RankResult } from './rank-types';
import { toleranceFactor } from './tolerance';
import { CatalogueNoise } from './catalogue-noise';

/** Where `counts` keeps the number of parts excluded by their reverse rating. */
const EXCLUDED = GROUPS;
const BASIS_INDEX: Record<RankBasis, number> = { bound: 0, worst: 1, typical: 2 };


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
	/** NaN in three columns of the part count: what a result shows for figures not computed. */
	private nanColumns = new Float64Array(0);
	private resultFlags = new Uint32Array(0);
	private scratchKeys = new Float64Array(0);
	private bounds!: BoundsOnDemand;
	private shortList = new ShortList();
	private scratchExcluded = new Int32Array(0);
	private scratchBucket = new Uint8Array(0);
	private scratchCounts = new Int32Array(GROUPS + 1);
	private caches!: CatalogueCaches;
	private noise!: CatalogueNoise;
	private factorCache = new Map<string, Float64Array>();
	private layout!: PartLayout;

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
		this.temps = Float64Array.from(temps);
		this.boundCounts = [...boundCounts].sort((a, b) => a - b);
		this.maxSamples = maxSamples;
		this.scratchHot = new Float64Array(all.length);
		this.scratchSort = new Float64Array(maxSamples);
		this.scratchGroups = new Int32Array(n);
		this.bucket = new Uint8Array(n);
		this.scratchKeys = new Float64Array(n);
		this.scratchExcluded = new Int32Array(n);
		this.scratchBucket = new Uint8Array(n);
		this.layout = partLayout(start, count, given, minMeasured, ratedReverse);
		this.bounds = new BoundsOnDemand(start, count, maxSamples);
		this.caches = new CatalogueCaches(this.models, start, count, this.temps, tempOffsets, maxSamples);
		this.noise = new CatalogueNoise(this.models, start, count, given, maxSamples);
		this.factorCache = new Map();
		this.resultColumns = new Float64Array(0);
		this.resultFlags = new Uint32Array(0);
		this.nanColumns = new Float64Array(3 * n).fill(NaN);
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
		const columns = this.resultColumnsFor(op, n, options.reuse === true);
		const { typicalA, worstA, boundA, capacitanceF, flags } = columns;
		// Forward drops do not depend on the bias: kept per clamp current and temperature ends,
		// shown as they are in a reused (read-only) result, copied into one the caller owns.
		const reuse = options.reuse === true;
		let drops = op.clampCurrentA !== undefined ? this.caches.dropsAt(op.clampCurrentA, cold, hot, constants) : this.nanColumns;
		if (!reuse) drops = drops.slice();
		const [dropHotV, dropColdV, dropWorstV] = [0, 1, 2].map((i) => drops.subarray(i * n, (i + 1) * n));
		const [noiseTypical, noiseWorst, noiseBound] = columns.noise;
		const out: PartColumns = { typicalA, worstA, boundA, dropWorstV, capacitanceF, flags };
		const inputs = this.partStatistics(op, cold, hot, hotI, include, constants, BASIS_INDEX[basis], factors, out);
		// A short list without a noise limit (which needs every part's noise) is selected in one
		// pass and only its parts are flagged (rank-select.ts); a long one is ordered in full.
		const { order, excluded, ranked, meetingLimits } =
			limit * 16 <= n && op.maxNoiseA_rtHz === undefined
				? this.shortListed(inputs, hotI, factors, out, limit)
				: this.orderedInFull(op, inputs, hot, hotI, constants, basis, factors, out, columns.noise, limit);
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
	 * The result's columns: typical, worst and bound per part (a bound is NaN until computed:
	 * always for a part with one sample), flags, and capacitance and noise where a limit needs
	 * them, else NaN (not computed). With `reuse` they are the table's own buffers, allocated
	 * once per content, and columns of figures not computed are one shared column of NaN, so
	 * such a result is read-only; otherwise every column is a fresh array the caller owns.
	 */
	private resultColumnsFor(op: OperatingPoint, n: number, reuse: boolean) {
		let buffer: Float64Array;
		let flags: Uint32Array;
		if (reuse) {
			if (this.resultColumns.length !== 6 * n) {
				this.resultColumns = new Float64Array(6 * n).fill(NaN, 2 * n);
				this.resultFlags = new Uint32Array(n);
			}
			buffer = this.resultColumns;
			flags = this.resultFlags;
		} else {
			buffer = new Float64Array(6 * n).fill(NaN, 2 * n);
			flags = new Uint32Array(n);
		}
		const column = (i: number) => buffer.subarray(i * n, (i + 1) * n);
		const nan = () => (reuse ? this.nanColumns.subarray(0, n) : new Float64Array(n).fill(NaN));
		let capacitanceF: Float64Array = nan();
		if (op.maxCapacitanceF !== undefined) (capacitanceF = column(3)).fill(NaN);
		let noise: Float64Array[] = [nan(), nan(), nan()];
		if (op.maxNoiseA_rtHz !== undefined) {
			buffer.fill(NaN, 3 * n);
			noise = [column(3), column(4), column(5)];
			// Capacitance and noise limits together: the capacitance gets a column of its own.
			if (op.maxCapacitanceF !== undefined) capacitanceF = new Float64Array(n).fill(NaN);
		}
		return { typicalA: column(0), worstA: column(1), boundA: column(2), capacitanceF, noise, flags };
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

	/** The best `limit` parts in one pass (rank-select.ts), then the flags of those alone. */
	private shortListed(inputs: FlagInputs, hotI: Float64Array, factors: Float64Array, out: PartColumns, limit: number) {
		const b = this.bounds;
		const columns = { start: this.start, count: this.count, given: this.given, ratedReverse: this.ratedReverse, ratedForward: this.ratedForward };
		const picked = this.shortList.select(inputs, this.layout, columns, b, hotI, factors, out, limit, this.scratchExcluded);
		// The parts are counted already: the flag pass counts into scratch.
		flagPass(inputs, this.layout, this.start, this.count, this.given, this.staticFlags, this.ratedReverse, this.ratedForward, b.least, b.pending, hotI, out, this.scratchBucket, this.scratchCounts, EXCLUDED, picked.order);
		const { order, ranked, failing } = picked;
		// Listed parts show their bound whatever the basis.
		b.settleAll(order, hotI, factors, out.boundA);
		return { order, ranked, meetingLimits: ranked - failing, excluded: this.scratchExcluded.slice(0, picked.excludedCount) };
	}

	/** Every part flagged and grouped, the noise limit applied, then the groups ordered (rank-order.ts). */
	private orderedInFull(
		op: OperatingPoint,
		inputs: FlagInputs,
		hot: number,
		hotI: Float64Array,
		constants: PhysicalConstants,
		basis: RankBasis,
		factors: Float64Array,
		out: PartColumns,
		noise: Float64Array[],
		limit: number
	) {
		const { typicalA, worstA, boundA, flags } = out;
		const b = this.bounds;
		const counts = this.counts;
		flagPass(inputs, this.layout, this.start, this.count, this.given, this.staticFlags, this.ratedReverse, this.ratedForward, b.least, b.pending, hotI, out, this.bucket, counts, EXCLUDED);
		if (op.maxNoiseA_rtHz !== undefined)
			this.noise.limitPass(
				{ limit: op.maxNoiseA_rtHz, biasV: op.biasV, hot, currents: hotI, include: inputs.include, constants, basis, factors },
				noise,
				flags,
				this.bucket,
				counts
			);
		const excluded = counts[EXCLUDED] > 0 ? overRating(flags, inputs.include, counts[EXCLUDED]) : new Int32Array(0);
		// Bounds are computed where the order needs them (bounds-on-demand.ts), then for every listed part.
		const keyOf = (g: number, members: Int32Array, take: number) =>
			g & NO_VALUE || basis === 'typical'
				? typicalA
				: basis === 'worst'
					? worstA
					: b.keys(members, take, hotI, factors, { boundA, worstA, typicalA }, this.scratchKeys);
		const order = orderGroups(this.bucket, counts.subarray(0, GROUPS), UNLISTED, keyOf, typicalA, limit, this.scratchGroups, this.scratchKeys, this.layout.all);
		b.settleAll(order, hotI, factors, boundA);
		let ranked = 0;
		let meetingLimits = 0;
		for (let g = 0; g < GROUPS; g++) {
			ranked += counts[g];
			if ((g & FAILS_LIMIT) === 0) meetingLimits += counts[g];
		}
		return { order, excluded, ranked, meetingLimits };
	}

	/**
	 * The per-part statistics of `rank` (rank-pass.ts) and the capacitance where a limit
	 * needs it; returns what the flag and group passes read.
	 */
	private partStatistics(
		op: OperatingPoint,
		cold: number,
		hot: number,
		hotI: Float64Array,
		include: Uint8Array | undefined,
		constants: PhysicalConstants,
		basis: number,
		factors: Float64Array,
		out: PartColumns
	): FlagInputs {
		const maxLeak = op.maxLeakageA ?? Infinity;
		const { typicalA, worstA, boundA, capacitanceF } = out;
		multiSampleStatistics(this.layout.multiples, this.start, this.count, this.given, hotI, this.scratchSort, basis === 0, maxLeak, this.bounds, typicalA, worstA, boundA);
		this.bounds.settleDue(hotI, factors, boundA);
		const maxCap = op.maxCapacitanceF;
		if (maxCap !== undefined) {
			const mid = 0.5 * (hot + cold);
			for (let p = 0; p < this.parts.length; p++)
				if (this.hasCjo[p] && (!include || include[p] !== 0)) capacitanceF[p] = this.medianCapacitance(p, op.biasV, mid, constants);
		}
		return {
			basis,
			maxLeak,
			maxDrop: op.clampCurrentA !== undefined ? (op.maxForwardDropV ?? Infinity) : Infinity,
			clampA: op.clampCurrentA ?? 0,
			maxCap: maxCap ?? Infinity,
			// Reverse bias [V] (−Infinity when forward, so no part is over its rating).
			reverseV: op.biasV < 0 ? -op.biasV : -Infinity,
			marginV: op.reverseMarginV ?? 0,
			keepOverRating: op.includeOverRating === true,
			include,
			farCold: this.caches.farAt(cold),
			farHot: this.caches.farAt(hot)
		};
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
