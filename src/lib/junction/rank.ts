/**
 * Ranking catalogue parts for a designer's operating point.
 *
 * A `CatalogueTable` is built once from plain part records (each with one fitted
 * model per measured sample) and kept in memory; `rank(op)` evaluates every sample
 * with the vectorised `ModelTable` and returns parts ordered by worst-case leakage.
 * Definitions:
 *  - leakage = |I(biasV)| at the hot end of the temperature range; typical = median over
 *    samples, worst = largest sample (the sort key, lowest first);
 *  - forward drop at clampCurrentA at the hot and cold ends (median over samples each);
 *    worst = largest over samples and both ends. The cold end is usually higher (the
 *    junction voltage falls with temperature), but a model with a large N and little
 *    temperature dependence of IS (wide-gap, N ≈ 2) can have the hot end higher;
 *  - capacitance at the bias (median over samples at the mid temperature) when CJO is known.
 * Limits: an operating point may state a forward-drop limit (maxForwardDropV), a leakage
 * budget (maxLeakageA) and a capacitance limit (maxCapacitanceF); a part failing one raises
 * its flag. A part listed beyond its reverse rating (includeOverRating) fails that limit too.
 * A part whose capacitance is unknown (no CJO) is not held against the capacitance limit.
 * Order: parts meeting every limit first, then the parts failing one; within each group
 * worst-case leakage ascending, ties by typical leakage, then by part index (the order of
 * the records given, which the server keeps by part id). This is the one place the rank
 * order is decided; the server's API lists it as is.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import { MATERIAL_DEFAULTS, type JunctionModel } from './model';
import { ModelTable } from './model-table';
import type { JunctionKind } from './names';

export type { JunctionKind };

/** A catalogue part as the server stores it. */
export interface PartRecord {
	id: string;
	kind: JunctionKind;
	/** One fitted model per measured sample. */
	samples: JunctionModel[];
	ratings: { reverseV?: number; forwardCurrentA?: number };
	measured: {
		/** Smallest |current| ever measured on this part [A]. */
		minAbsCurrentA: number;
		/** Temperatures at which sweeps were measured [°C]. */
		temperaturesC: number[];
		/** Whether reverse-bias leakage was ever measured (otherwise only the IS floor is known). */
		reverseMeasured: boolean;
	};
	/** Clear or glass package: ambient light creates photocurrent. */
	transparentPackage?: boolean;
	/** Worst RMS fit residual among the samples [V]. */
	fitRmsResidualV?: number;
}

export interface OperatingPoint {
	/** Bias across the junction [V], positive = forward. */
	biasV: number;
	temperatureC?: number;
	temperatureRangeC?: [number, number];
	/** Forward current at which to report the forward drop [A]. */
	clampCurrentA?: number;
	/** Flag parts whose worst-case forward drop exceeds this [V]. */
	maxForwardDropV?: number;
	/** Leakage budget: flag parts whose worst-case leakage exceeds this [A]. */
	maxLeakageA?: number;
	/** Flag parts whose capacitance at the bias (median sample, mid temperature) exceeds this [F]. */
	maxCapacitanceF?: number;
	/** Margin kept below the rated reverse voltage [V] (default 0). */
	reverseMarginV?: number;
	/** Keep parts biased beyond their reverse rating (flagged) instead of excluding them. */
	includeOverRating?: boolean;
	/** Source resistance in series with the junction [Ω]. */
	sourceResistanceOhm?: number;
}

/** Stable flag codes; see `explainFlag` for plain-words text. */
export const FLAG_CODES = [
	'current-extrapolated',
	'temperature-extrapolated',
	'over-reverse-rating',
	'reverse-not-measured',
	'metal-semiconductor',
	'light-sensitive',
	'poor-fit',
	'few-samples',
	'forward-drop-over-limit',
	'over-leakage-target',
	'over-capacitance-limit',
	'band-gap-assumed'
] as const;
export type FlagCode = (typeof FLAG_CODES)[number];

/**
 * Each flag in plain words: a short label for chips, a sentence for the explanation, and
 * whether it is a caution (shown in amber). The one source of these texts for every screen.
 */
export const FLAG_WORDS: Record<FlagCode, { short: string; long: string; caution: boolean }> = {
	'current-extrapolated': {
		short: 'below measured current',
		long: 'The predicted current is over a decade below the lowest current measured on this part: the model is extrapolated.',
		caution: true
	},
	'temperature-extrapolated': {
		short: 'outside measured temperatures',
		long: 'An end of the temperature range lies more than 25 K from every temperature this part was measured at.',
		caution: true
	},
	'over-reverse-rating': {
		short: 'reverse rating exceeded',
		long: 'The reverse bias (plus the margin you asked for) exceeds the rated reverse voltage.',
		caution: true
	},
	'reverse-not-measured': {
		short: 'leakage never measured',
		long: 'Reverse leakage was never measured; only the Shockley floor is known and real leakage is higher.',
		caution: true
	},
	'metal-semiconductor': {
		short: 'metal–semiconductor',
		long: 'Metal–semiconductor junction: the Shockley model is empirical here.',
		caution: false
	},
	'light-sensitive': {
		short: 'light makes current',
		long: 'Glass or clear package, or an LED: ambient light makes a photocurrent that can exceed the dark leakage. Shield it.',
		caution: true
	},
	'poor-fit': {
		short: 'poor fit',
		long: 'The model fits the measured sweeps poorly (RMS residual over 2 mV), so predictions are less certain.',
		caution: true
	},
	'few-samples': {
		short: 'under 3 samples',
		long: 'Fewer than three samples were measured, so the part-to-part spread is unknown.',
		caution: false
	},
	'forward-drop-over-limit': {
		short: 'drop over limit',
		long: 'The worst-case forward drop at the clamp current (the larger of the hot and cold ends) exceeds your limit.',
		caution: true
	},
	'over-leakage-target': {
		short: 'over leakage budget',
		long: 'The worst-case leakage exceeds the allowed leakage (or error voltage across the source resistance).',
		caution: true
	},
	'over-capacitance-limit': {
		short: 'capacitance over limit',
		long: 'The junction capacitance at the bias exceeds your limit.',
		caution: true
	},
	'band-gap-assumed': {
		short: 'band gap assumed',
		long: `Nobody gave or measured this part's band gap, so a typical ${MATERIAL_DEFAULTS['wide-gap'].EG} eV was assumed. Its leakage at temperatures away from the measured ones is uncertain: blue, green and white LEDs and SiC parts have larger band gaps.`,
		caution: true
	}
};

/**
 * Plain-words explanation of a flag code.
 * @throws RangeError for an unknown code.
 */
export function explainFlag(code: FlagCode): string {
	const t = FLAG_WORDS[code];
	if (!t) throw new RangeError(`unknown flag code '${String(code)}'`);
	return t.long;
}

/** RMS fit residual above which a fit counts as poor [V] (2 mV, common practice for small-signal fits). */
export const POOR_FIT_RMS_V = 2e-3;
/** Temperature distance beyond which a prediction counts as extrapolated [K]. */
export const TEMPERATURE_EXTRAPOLATION_K = 25;

export interface RankedPart {
	id: string;
	kind: JunctionKind;
	samples: number;
	leakageA: { typical: number; worst: number };
	forwardDropV?: { hot: number; cold: number; worst: number };
	capacitanceF?: number;
	flags: FlagCode[];
	/** The part meets every limit the operating point states (see the file header). */
	meetsLimits: boolean;
}

/** Options of `CatalogueTable.rank`. */
export interface RankOptions {
	/**
	 * Only the best `limit` parts are put in `order` (a partial selection, cheaper than
	 * ordering every part); the others are still evaluated and counted in `ranked`.
	 */
	limit?: number;
	/**
	 * Mask by part index: only parts with a non-zero entry are ordered, counted or listed
	 * as excluded (e.g. the catalogue's kind and text filters). Length must be the table size.
	 */
	include?: Uint8Array;
	/**
	 * Write the result's per-part columns into buffers the table keeps instead of fresh
	 * arrays: no allocation proportional to the catalogue, but the result is only valid
	 * until the next `rank` call with `reuse` on this table (use it when the result is read
	 * at once, as the server does).
	 */
	reuse?: boolean;
}

/** Columnar ranking result; `rows()` turns a page of it into objects. */
export interface RankResult {
	/** Part indices in rank order (file header); excluded parts are left out. At most `limit` long. */
	order: Int32Array;
	/** How many parts the full order holds (≥ order.length when a limit cut it). */
	ranked: number;
	/** Of those, how many meet every limit (they come first in the order). */
	meetingLimits: number;
	/** Parts excluded by the reverse rating (among the included ones). */
	excluded: Int32Array;
	typicalA: Float64Array;
	worstA: Float64Array;
	/** Forward drops (NaN when no clamp current was asked for). */
	dropHotV: Float64Array;
	dropColdV: Float64Array;
	dropWorstV: Float64Array;
	flags: Uint32Array;
	/** Median capacitance at the bias [F], computed for every part only when a capacitance limit is given (else NaN). */
	capacitanceF: Float64Array;
	hotC: number;
	coldC: number;
}

/** Median of a[0…n−1] (mean of the middle two for even n); sorts that prefix in place. */
function median(a: Float64Array, n: number): number {
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

/**
 * In-memory catalogue built from plain records. Build once at start-up, then call
 * `refresh(records)` whenever parts change. `rank(op)` is synchronous and leaves the records
 * alone; it keeps work arrays, per-temperature caches (scaled parameters, the
 * temperature-extrapolation test, the bias-independent forward drops per clamp current)
 * and, with `reuse`, its result buffers in the table, all dropped by `refresh`.
 */
export class CatalogueTable {
	private parts: PartRecord[] = [];
	private models!: ModelTable;
	private start!: Int32Array;
	private count!: Int32Array;
	private staticFlags!: Uint32Array;
	private minMeasured!: Float64Array;
	private tempOffsets!: Int32Array;
	private temps!: Float64Array;
	private ratedReverse!: Float64Array;
	private hasCjo!: Uint8Array;
	private scratchHot = new Float64Array(0);
	private scratchCold = new Float64Array(0);
	private scratchSort = new Float64Array(0);
	private scratchDrop = new Float64Array(0);
	private scratchPass = new Int32Array(0);
	private scratchFail = new Int32Array(0);
	private counts = new Int32Array(3);
	private resultColumns = new Float64Array(0);
	private resultFlags = new Uint32Array(0);
	private scratchKeys = new Float64Array(0);
	private farCache = new Map<number, Uint8Array>();
	private dropCache: DropColumns[] = [];

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
		const minMeasured = new Float64Array(n);
		const ratedReverse = new Float64Array(n);
		const hasCjo = new Uint8Array(n);
		const tempOffsets = new Int32Array(n + 1);
		const all: JunctionModel[] = [];
		const temps: number[] = [];
		let maxSamples = 1;
		records.forEach((p, k) => {
			if (p.samples.length === 0) throw new RangeError(`part '${p.id}' has no sample models`);
			start[k] = all.length;
			count[k] = p.samples.length;
			maxSamples = Math.max(maxSamples, p.samples.length);
			all.push(...p.samples);
			let f = 0;
			if (!p.measured.reverseMeasured) f |= bit('reverse-not-measured');
			if (p.kind === 'schottky' || p.samples.some((s) => s.material === 'metal-semiconductor')) f |= bit('metal-semiconductor');
			if (p.transparentPackage || p.kind === 'led') f |= bit('light-sensitive');
			if ((p.fitRmsResidualV ?? 0) > POOR_FIT_RMS_V) f |= bit('poor-fit');
			if (p.samples.length < 3) f |= bit('few-samples');
			if (p.samples.some((s) => s.egAssumed)) f |= bit('band-gap-assumed');
			flags[k] = f;
			minMeasured[k] = p.measured.minAbsCurrentA;
			ratedReverse[k] = p.ratings.reverseV ?? Infinity;
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
		this.minMeasured = minMeasured;
		this.ratedReverse = ratedReverse;
		this.hasCjo = hasCjo;
		this.tempOffsets = tempOffsets;
		this.temps = Float64Array.from(temps);
		this.scratchHot = new Float64Array(all.length);
		this.scratchCold = new Float64Array(all.length);
		this.scratchSort = new Float64Array(maxSamples);
		this.scratchDrop = new Float64Array(all.length);
		this.scratchPass = new Int32Array(n);
		this.scratchKeys = new Float64Array(n);
		this.farCache = new Map();
		this.dropCache = [];
		this.resultColumns = new Float64Array(0);
		this.resultFlags = new Uint32Array(0);
		this.scratchFail = new Int32Array(n);
	}

	/** The record behind a part index. */
	part(index: number): PartRecord {
		return this.parts[index];
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
	 * Rank all parts for an operating point (definitions and order in the file header).
	 * @throws RangeError for an invalid operating point or options.
	 */
	rank(op: OperatingPoint, constants: PhysicalConstants = SI_2019, options: RankOptions = {}): RankResult {
		const [cold, hot] = temperatureEnds(op);
		if (!Number.isFinite(op.biasV)) throw new RangeError(`bias must be finite, got ${op.biasV}`);
		const n = this.parts.length;
		const include = options.include;
		if (include && include.length !== n) throw new RangeError(`include mask has ${include.length} entries for ${n} parts`);
		const limit = options.limit ?? Infinity;
		if (!(limit >= 0)) throw new RangeError(`limit must be a non-negative number, got ${options.limit}`);
		const hotI = this.models.currents(op.biasV, hot, this.scratchHot, constants, op.sourceResistanceOhm ?? 0);
		// One allocation for the result's columns, or none when reusing the table's.
		if (options.reuse && this.resultColumns.length !== 6 * n) {
			this.resultColumns = new Float64Array(6 * n);
			this.resultFlags = new Uint32Array(n);
		}
		const columns = options.reuse ? this.resultColumns : new Float64Array(6 * n);
		const typicalA = columns.subarray(0, n);
		const worstA = columns.subarray(n, 2 * n);
		const dropHotV = columns.subarray(2 * n, 3 * n);
		const dropColdV = columns.subarray(3 * n, 4 * n);
		const dropWorstV = columns.subarray(4 * n, 5 * n);
		const capacitanceF = columns.subarray(5 * n, 6 * n);
		// NaN = not computed: forward drops without a clamp current, capacitance without a limit.
		if (op.clampCurrentA === undefined) columns.fill(NaN, 2 * n, 5 * n);
		columns.fill(NaN, 5 * n);
		const flags = options.reuse ? this.resultFlags : new Uint32Array(n);
		// Forward drops do not depend on the bias: kept per clamp current and temperature ends.
		const drops = op.clampCurrentA !== undefined ? this.dropsAt(op.clampCurrentA, cold, hot, constants) : undefined;
		if (drops) columns.set(drops, 2 * n);
		this.partLoop(op, cold, hot, hotI, include, constants, typicalA, worstA, dropWorstV, capacitanceF, flags);
		const passing = this.counts[0];
		const failing = this.counts[1];
		const excluded = this.counts[2] > 0 ? overRating(flags, include, this.counts[2]) : new Int32Array(0);
		const pass = this.scratchPass;
		const fail = this.scratchFail;
		let order = orderByLeakage(pass.subarray(0, passing), worstA, typicalA, limit, this.scratchKeys);
		if (order.length < limit && failing > 0) {
			const rest = orderByLeakage(fail.subarray(0, failing), worstA, typicalA, limit - order.length, this.scratchKeys);
			const both = new Int32Array(order.length + rest.length);
			both.set(order);
			both.set(rest, order.length);
			order = both;
		}
		return {
			order,
			ranked: passing + failing,
			meetingLimits: passing,
			excluded,
			typicalA,
			worstA,
			dropHotV,
			dropColdV,
			dropWorstV,
			flags,
			capacitanceF,
			hotC: hot,
			coldC: cold
		};
	}

	/**
	 * Per part, the forward drop at a current [A] at the hot and cold ends (median over
	 * samples) and the worst (largest over samples and both ends), as columns [hot | cold |
	 * worst] of the part count each; kept for the last DROP_CACHE_SIZE current and
	 * temperature pairs asked for (least recently used dropped), like the scaled parameters.
	 */
	private dropsAt(currentA: number, cold: number, hot: number, constants: PhysicalConstants): Float64Array {
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
		const n = this.parts.length;
		const hotV = this.models.forwardVoltages(currentA, hot, this.scratchDrop, constants);
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
			columns[p] = median(sort, c);
			for (let k = 0; k < c; k++) sort[k] = coldV[s0 + k];
			columns[n + p] = median(sort, c);
			columns[2 * n + p] = cw;
		}
		cache.unshift({ currentA, cold, hot, constants, columns });
		if (cache.length > DROP_CACHE_SIZE) cache.pop();
		return columns;
	}

	/**
	 * The per-part pass of `rank` (its own function so the engine optimises it whole):
	 * statistics over samples, flags, and the split into parts meeting every limit (`pass`)
	 * and the rest (`fail`), both in index order; `counts` gets [passing, failing, excluded].
	 */
	private partLoop(
		op: OperatingPoint,
		cold: number,
		hot: number,
		hotI: Float64Array,
		include: Uint8Array | undefined,
		constants: PhysicalConstants,
		typicalA: Float64Array,
		worstA: Float64Array,
		dropWorstV: Float64Array,
		capacitanceF: Float64Array,
		flags: Uint32Array
	): void {
		const n = this.parts.length;
		const margin = op.reverseMarginV ?? 0;
		const maxDrop = op.maxForwardDropV ?? Infinity;
		const maxLeak = op.maxLeakageA ?? Infinity;
		const maxCap = op.maxCapacitanceF;
		const sort = this.scratchSort;
		const farCold = this.farAt(cold);
		const farHot = this.farAt(hot);
		const mid = 0.5 * (hot + cold);
		const pass = this.scratchPass;
		const fail = this.scratchFail;
		const counts = this.counts;
		// The table's columns as locals, so the loop reads them without going through `this`.
		const start = this.start;
		const count = this.count;
		const staticFlags = this.staticFlags;
		const minMeasured = this.minMeasured;
		const ratedReverse = this.ratedReverse;
		const hasCjo = this.hasCjo;
		const biasV = op.biasV;
		// Reverse bias [V] (−Infinity when forward, so no part is over its rating).
		const reverseV = biasV < 0 ? -biasV : -Infinity;
		const keepOver = op.includeOverRating === true;
		counts[0] = counts[1] = counts[2] = 0;
		for (let p = 0; p < n; p++) {
			const s0 = start[p];
			const c = count[p];
			let worst = 0;
			let typical: number;
			if (c === 1) {
				// One sample: it is the median; NaN stays out of the worst, as below.
				typical = Math.abs(hotI[s0]);
				if (typical > 0) worst = typical;
			} else {
				for (let k = 0; k < c; k++) {
					const a = Math.abs(hotI[s0 + k]);
					sort[k] = a;
					if (a > worst) worst = a;
				}
				typical = median(sort, c);
			}
			typicalA[p] = typical;
			worstA[p] = worst;
			let f = staticFlags[p];
			if (typical < minMeasured[p] / 10) f |= BIT_CURRENT_EXTRAPOLATED;
			if (farCold[p] | farHot[p]) f |= BIT_TEMPERATURE_EXTRAPOLATED;
			if (worst > maxLeak) f |= BIT_OVER_LEAKAGE_TARGET;
			// NaN (no clamp current) never exceeds the limit.
			if (dropWorstV[p] > maxDrop) f |= BIT_FORWARD_DROP_OVER_LIMIT;
			if (maxCap !== undefined && hasCjo[p] && (!include || include[p] !== 0)) {
				const cap = this.medianCapacitance(p, biasV, mid, constants);
				capacitanceF[p] = cap;
				if (cap > maxCap) f |= BIT_OVER_CAPACITANCE_LIMIT;
			}
			const over = reverseV > ratedReverse[p] - margin;
			if (over) f |= BIT_OVER_REVERSE_RATING;
			flags[p] = f;
			if (include && include[p] === 0) continue;
			if (over && !keepOver) counts[2]++;
			else if ((f & LIMIT_BITS) === 0) pass[counts[0]++] = p;
			else fail[counts[1]++] = p;
		}
		// Nothing after the loop: code the first (on-stack-replaced) run never reached
		// would make V8 drop the optimised loop at its end on every call.
	}

	/**
	 * Turn a page of a ranking into plain objects (allocates only for the page).
	 * Capacitance is evaluated here, per listed part, at the mid temperature, unless the
	 * ranking already did (capacitance limit).
	 */
	rows(result: RankResult, op: OperatingPoint, offset = 0, limit = 50, constants: PhysicalConstants = SI_2019): RankedPart[] {
		const out: RankedPart[] = [];
		const mid = 0.5 * (result.hotC + result.coldC);
		const end = Math.min(result.order.length, offset + limit);
		for (let r = offset; r < end; r++) {
			const p = result.order[r];
			const rec = this.parts[p];
			const row: RankedPart = {
				id: rec.id,
				kind: rec.kind,
				samples: this.count[p],
				leakageA: { typical: result.typicalA[p], worst: result.worstA[p] },
				flags: flagsFromBits(result.flags[p]),
				meetsLimits: (result.flags[p] & LIMIT_BITS) === 0
			};
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
		return median(sort, c);
	}

	/**
	 * Per part, 1 when a temperature [°C] lies more than TEMPERATURE_EXTRAPOLATION_K from every
	 * temperature the part was measured at (kept for the last few temperatures asked for).
	 */
	private farAt(tC: number): Uint8Array {
		const hit = this.farCache.get(tC);
		if (hit) return hit;
		const n = this.parts.length;
		const far = new Uint8Array(n);
		for (let p = 0; p < n; p++) {
			let best = Infinity;
			for (let k = this.tempOffsets[p]; k < this.tempOffsets[p + 1]; k++) best = Math.min(best, Math.abs(this.temps[k] - tC));
			far[p] = best > TEMPERATURE_EXTRAPOLATION_K ? 1 : 0;
		}
		if (this.farCache.size >= 8) this.farCache.delete(this.farCache.keys().next().value as number);
		this.farCache.set(tC, far);
		return far;
	}
}

/** How many clamp current and temperature pairs' forward-drop columns a table keeps. */
const DROP_CACHE_SIZE = 4;

/** Forward-drop columns of `CatalogueTable.dropsAt` for one current and pair of temperatures. */
interface DropColumns {
	currentA: number;
	cold: number;
	hot: number;
	constants: PhysicalConstants;
	columns: Float64Array;
}

const LOW_WORD = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 0 : 1;

/** Numeric order with NaN after every number (the sort key order of `orderByLeakage`). */
function compareNumbers(x: number, y: number): number {
	if (x < y) return -1;
	if (x > y) return 1;
	if (x === y) return 0;
	return Number.isNaN(x) ? (Number.isNaN(y) ? 0 : 1) : -1;
}

/**
 * Order parts by worst leakage ascending, then typical leakage ascending, then part index
 * (NaN after every number), returning at most `limit` of them.
 *
 * Method: each part's worst leakage (≥ 0, so its IEEE-754 bit pattern orders like its
 * value) has the low ⌈log₂ m⌉ mantissa bits replaced by its position in `parts`; these
 * packed doubles sort natively (or, with a limit, the smallest `limit` are selected by
 * Hoare's FIND, C. A. R. Hoare, Comm. ACM 4 (1961) 321, then sorted). Truncating the low
 * bits keeps the order between different truncated values, so only runs of equal truncated
 * value can be out of the exact order; each such run is re-sorted with the exact comparison.
 * With a limit, the run at the cut may continue among the parts not selected: its members
 * are gathered and only the best of them that fit are selected exactly (a bounded heap),
 * so a long run of ties costs one comparison per member rather than a sort. A limit of at
 * most a sixteenth of the parts is first tried in one pass with a bounded heap under the
 * exact comparison (`smallestByScan`), which needs no packing and no selection.
 * @param parts part indices in ascending order
 * @param scratch optional work array of at least parts.length entries (else one is allocated)
 */
export function orderByLeakage(
	parts: Int32Array,
	worst: Float64Array,
	typical: Float64Array,
	limit = Infinity,
	scratch?: Float64Array
): Int32Array {
	const m = parts.length;
	const take = Math.min(m, Math.max(0, Math.floor(limit)));
	if (take === 0) return new Int32Array(0);
	const cmp = (a: number, b: number) => compareNumbers(worst[a], worst[b]) || compareNumbers(typical[a], typical[b]) || a - b;
	if (take * 16 <= m) {
		const best = smallestByScan(parts, worst, take, cmp);
		if (best) return best;
	}
	const bits = Math.max(1, Math.ceil(Math.log2(m)));
	if (bits > 31) throw new RangeError(`too many parts to order (${m})`);
	const keys = scratch && scratch.length >= m ? scratch.subarray(0, m) : new Float64Array(m);
	const words = new Uint32Array(keys.buffer, keys.byteOffset, 2 * m);
	for (let j = 0; j < m; j++) {
		const w = worst[parts[j]];
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
	// Re-sort runs of equal truncated worst leakage exactly.
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
 * entries: a part whose worst leakage is above the heap's largest is passed over after one
 * comparison of numbers. For parts in no particular order of leakage few enter the heap;
 * when many do (parts listed from leaky to tight), this gives up (null) after m/4 entries
 * so the caller's selection takes over.
 */
function smallestByScan(parts: Int32Array, worst: Float64Array, k: number, cmp: (a: number, b: number) => number): Int32Array | null {
	const m = parts.length;
	const heap = parts.slice(0, k);
	for (let i = (k >> 1) - 1; i >= 0; i--) siftDown(heap, i, cmp);
	let top = worst[heap[0]];
	let entered = 0;
	const budget = m >> 2;
	for (let j = k; j < m; j++) {
		const p = parts[j];
		// Larger worst leakage never enters (NaN, ordered last, goes to the exact comparison).
		if (worst[p] > top) continue;
		if (cmp(p, heap[0]) < 0) {
			if (++entered > budget) return null;
			heap[0] = p;
			siftDown(heap, 0, cmp);
			top = worst[heap[0]];
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

/** The `count` parts flagged over their reverse rating (among the included ones), in index order. */
function overRating(flags: Uint32Array, include: Uint8Array | undefined, count: number): Int32Array {
	const out = new Int32Array(count);
	let e = 0;
	for (let p = 0; p < flags.length; p++) if (flags[p] & BIT_OVER_REVERSE_RATING && !(include && include[p] === 0)) out[e++] = p;
	return out;
}

function bit(code: FlagCode): number {
	return 1 << FLAG_CODES.indexOf(code);
}

// Bits set inside the per-part loop of `rank`, looked up once.
const BIT_CURRENT_EXTRAPOLATED = bit('current-extrapolated');
const BIT_TEMPERATURE_EXTRAPOLATED = bit('temperature-extrapolated');
const BIT_FORWARD_DROP_OVER_LIMIT = bit('forward-drop-over-limit');
const BIT_OVER_REVERSE_RATING = bit('over-reverse-rating');
const BIT_OVER_LEAKAGE_TARGET = bit('over-leakage-target');
const BIT_OVER_CAPACITANCE_LIMIT = bit('over-capacitance-limit');
/** Flags that mean a stated limit is not met (the part ranks after those meeting every limit). */
const LIMIT_BITS = BIT_FORWARD_DROP_OVER_LIMIT | BIT_OVER_LEAKAGE_TARGET | BIT_OVER_CAPACITANCE_LIMIT | BIT_OVER_REVERSE_RATING;

/** Decode a flag bit set into codes, in FLAG_CODES order. */
export function flagsFromBits(bits: number): FlagCode[] {
	return FLAG_CODES.filter((_, i) => (bits & (1 << i)) !== 0);
}

/**
 * Cold and hot ends (°C) of an operating point.
 * @throws RangeError when neither a temperature nor a valid range is given.
 */
export function temperatureEnds(op: OperatingPoint): [number, number] {
	if (op.temperatureRangeC) {
		const [a, b] = op.temperatureRangeC;
		if (!Number.isFinite(a) || !Number.isFinite(b) || a > b) throw new RangeError(`invalid temperature range [${a}, ${b}]`);
		return [a, b];
	}
	if (op.temperatureC === undefined || !Number.isFinite(op.temperatureC))
		throw new RangeError('an operating point needs temperatureC or temperatureRangeC');
	return [op.temperatureC, op.temperatureC];
}
