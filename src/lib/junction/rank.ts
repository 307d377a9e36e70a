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
 * Order: worst-case leakage ascending, ties by typical leakage, then by part index (the
 * order of the records given, which the server keeps by part id).
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
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
	'forward-drop-over-limit'
] as const;
export type FlagCode = (typeof FLAG_CODES)[number];

const FLAG_TEXT: Record<FlagCode, string> = {
	'current-extrapolated':
		'The predicted current is more than ten times below the lowest current ever measured on this part, so it is an extrapolation of the model.',
	'temperature-extrapolated': 'The operating temperature is more than 25 K away from every temperature this part was measured at.',
	'over-reverse-rating': 'The reverse bias exceeds the rated reverse voltage less the requested margin.',
	'reverse-not-measured':
		'Reverse leakage was never measured on this part; the figure is only the ideal diode floor (IS) and real leakage may be far higher.',
	'metal-semiconductor': 'Metal–semiconductor (Schottky) junction: the Shockley model is empirical here and leakage rises steeply with reverse bias.',
	'light-sensitive': 'Clear or glass package, or an LED: ambient light generates photocurrent that can swamp the leakage.',
	'poor-fit': 'The model fits the measured sweep poorly (large residuals), so predictions are less certain.',
	'few-samples': 'Fewer than three samples were measured, so part-to-part spread is unknown.',
	'forward-drop-over-limit': 'The worst-case forward drop at the clamp current exceeds the requested limit.'
};

/**
 * Plain-words explanation of a flag code.
 * @throws RangeError for an unknown code.
 */
export function explainFlag(code: FlagCode): string {
	const t = FLAG_TEXT[code];
	if (!t) throw new RangeError(`unknown flag code '${String(code)}'`);
	return t;
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
}

/** Columnar ranking result; `rows()` turns a page of it into objects. */
export interface RankResult {
	/** Part indices, best (lowest worst-case leakage) first; excluded parts are left out. At most `limit` long. */
	order: Int32Array;
	/** How many parts the full order holds (≥ order.length when a limit cut it). */
	ranked: number;
	/** Parts excluded by the reverse rating (among the included ones). */
	excluded: Int32Array;
	typicalA: Float64Array;
	worstA: Float64Array;
	/** Forward drops (NaN when no clamp current was asked for). */
	dropHotV: Float64Array;
	dropColdV: Float64Array;
	dropWorstV: Float64Array;
	flags: Uint32Array;
	hotC: number;
	coldC: number;
}

function insertionSortPrefix(a: Float64Array, n: number): void {
	for (let i = 1; i < n; i++) {
		const x = a[i];
		let j = i - 1;
		while (j >= 0 && a[j] > x) {
			a[j + 1] = a[j];
			j--;
		}
		a[j + 1] = x;
	}
}

/**
 * In-memory catalogue built from plain records. Build once at start-up, then call
 * `refresh(records)` whenever parts change; `rank(op)` is read-only and may run concurrently.
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
		const margin = op.reverseMarginV ?? 0;
		const n = this.parts.length;
		const include = options.include;
		if (include && include.length !== n) throw new RangeError(`include mask has ${include.length} entries for ${n} parts`);
		const limit = options.limit ?? Infinity;
		if (!(limit >= 0)) throw new RangeError(`limit must be a non-negative number, got ${options.limit}`);
		const hotI = this.models.currents(op.biasV, hot, this.scratchHot, constants, op.sourceResistanceOhm ?? 0);
		const typicalA = new Float64Array(n);
		const worstA = new Float64Array(n);
		const dropHotV = new Float64Array(n).fill(NaN);
		const dropColdV = new Float64Array(n).fill(NaN);
		const dropWorstV = new Float64Array(n).fill(NaN);
		const flags = new Uint32Array(n);
		const sort = this.scratchSort;
		let hotV: Float64Array | undefined;
		let coldV: Float64Array | undefined;
		if (op.clampCurrentA !== undefined) {
			hotV = this.models.forwardVoltages(op.clampCurrentA, hot, new Float64Array(this.models.length), constants);
			coldV =
				cold === hot ? hotV : this.models.forwardVoltages(op.clampCurrentA, cold, this.scratchCold, constants);
		}
		let kept = 0;
		const keep = new Int32Array(n);
		const excluded: number[] = [];
		for (let p = 0; p < n; p++) {
			const s0 = this.start[p];
			const c = this.count[p];
			let worst = 0;
			for (let k = 0; k < c; k++) {
				const a = Math.abs(hotI[s0 + k]);
				sort[k] = a;
				if (a > worst) worst = a;
			}
			insertionSortPrefix(sort, c);
			const typical = c % 2 ? sort[c >> 1] : 0.5 * (sort[(c >> 1) - 1] + sort[c >> 1]);
			typicalA[p] = typical;
			worstA[p] = worst;
			let f = this.staticFlags[p];
			if (typical < this.minMeasured[p] / 10) f |= BIT_CURRENT_EXTRAPOLATED;
			if (this.farFromMeasured(p, cold) || this.farFromMeasured(p, hot)) f |= BIT_TEMPERATURE_EXTRAPOLATED;
			if (hotV && coldV) {
				let h = 0;
				let cw = 0;
				for (let k = 0; k < c; k++) {
					sort[k] = hotV[s0 + k];
					if (hotV[s0 + k] > cw) cw = hotV[s0 + k];
					if (coldV[s0 + k] > cw) cw = coldV[s0 + k];
				}
				insertionSortPrefix(sort, c);
				h = c % 2 ? sort[c >> 1] : 0.5 * (sort[(c >> 1) - 1] + sort[c >> 1]);
				for (let k = 0; k < c; k++) sort[k] = coldV[s0 + k];
				insertionSortPrefix(sort, c);
				dropHotV[p] = h;
				dropColdV[p] = c % 2 ? sort[c >> 1] : 0.5 * (sort[(c >> 1) - 1] + sort[c >> 1]);
				dropWorstV[p] = cw;
				if (op.maxForwardDropV !== undefined && cw > op.maxForwardDropV) f |= BIT_FORWARD_DROP_OVER_LIMIT;
			}
			flags[p] = f;
			const over = op.biasV < 0 && -op.biasV > this.ratedReverse[p] - margin;
			if (over) flags[p] |= BIT_OVER_REVERSE_RATING;
			if (include && include[p] === 0) continue;
			if (over && !op.includeOverRating) {
				excluded.push(p);
				continue;
			}
			keep[kept++] = p;
		}
		const order = orderByLeakage(keep.subarray(0, kept), worstA, typicalA, limit);
		return {
			order,
			ranked: kept,
			excluded: Int32Array.from(excluded),
			typicalA,
			worstA,
			dropHotV,
			dropColdV,
			dropWorstV,
			flags,
			hotC: hot,
			coldC: cold
		};
	}

	/**
	 * Turn a page of a ranking into plain objects (allocates only for the page).
	 * Capacitance is evaluated here, per listed part, at the mid temperature.
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
				flags: flagsFromBits(result.flags[p])
			};
			if (!Number.isNaN(result.dropWorstV[p]))
				row.forwardDropV = { hot: result.dropHotV[p], cold: result.dropColdV[p], worst: result.dropWorstV[p] };
			if (this.hasCjo[p]) {
				const caps: number[] = [];
				for (let k = 0; k < this.count[p]; k++) caps.push(this.models.capacitance(this.start[p] + k, op.biasV, mid, constants));
				caps.sort((a, b) => a - b);
				const c = caps.length;
				row.capacitanceF = c % 2 ? caps[c >> 1] : 0.5 * (caps[(c >> 1) - 1] + caps[c >> 1]);
			}
			out.push(row);
		}
		return out;
	}

	private farFromMeasured(p: number, tC: number): boolean {
		const a = this.tempOffsets[p];
		const b = this.tempOffsets[p + 1];
		if (a === b) return true;
		let best = Infinity;
		for (let k = a; k < b; k++) best = Math.min(best, Math.abs(this.temps[k] - tC));
		return best > TEMPERATURE_EXTRAPOLATION_K;
	}
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
 * packed doubles sort natively (or, with a limit, are selected by Hoare's FIND, C. A. R.
 * Hoare, Comm. ACM 4 (1961) 321, then sorted). Truncating the low bits keeps the order
 * between different truncated values, so only runs of equal truncated value can be out
 * of the exact order; each such run is re-sorted with the exact comparison. With a limit,
 * the run straddling the cut is taken whole before cutting.
 * @param parts part indices in ascending order
 */
export function orderByLeakage(parts: Int32Array, worst: Float64Array, typical: Float64Array, limit = Infinity): Int32Array {
	const m = parts.length;
	const take = Math.min(m, Math.max(0, Math.floor(limit)));
	if (take === 0) return new Int32Array(0);
	const bits = Math.max(1, Math.ceil(Math.log2(m)));
	if (bits > 31) throw new RangeError(`too many parts to order (${m})`);
	const keys = new Float64Array(m);
	const words = new Uint32Array(keys.buffer);
	for (let j = 0; j < m; j++) {
		const w = worst[parts[j]];
		// NaN and ±Infinity would not survive packing; they join the largest finite value's run.
		keys[j] = w <= Number.MAX_VALUE ? w : Number.MAX_VALUE;
		const at = 2 * j + LOW_WORD;
		words[at] = (((words[at] >>> bits) << bits) | j) >>> 0;
	}
	let sorted: Float64Array;
	if (take < m) {
		selectSmallest(keys, take - 1);
		const top = keys[take - 1];
		const topWords = new Uint32Array(Float64Array.of(top).buffer);
		const hi = topWords[1 - LOW_WORD];
		const lo = topWords[LOW_WORD] >>> bits;
		let extra = 0;
		for (let j = take; j < m; j++) if (words[2 * j + 1 - LOW_WORD] === hi && words[2 * j + LOW_WORD] >>> bits === lo) extra++;
		sorted = new Float64Array(take + extra);
		sorted.set(keys.subarray(0, take));
		let e = take;
		for (let j = take; j < m; j++)
			if (words[2 * j + 1 - LOW_WORD] === hi && words[2 * j + LOW_WORD] >>> bits === lo) sorted[e++] = keys[j];
	} else sorted = keys;
	sorted.sort();
	const sw = new Uint32Array(sorted.buffer, sorted.byteOffset, 2 * sorted.length);
	const mask = 2 ** bits - 1;
	const out = new Int32Array(sorted.length);
	for (let i = 0; i < sorted.length; i++) out[i] = parts[sw[2 * i + LOW_WORD] & mask];
	// Re-sort runs of equal truncated worst leakage exactly.
	const cmp = (a: number, b: number) => compareNumbers(worst[a], worst[b]) || compareNumbers(typical[a], typical[b]) || a - b;
	for (let i = 0; i < sorted.length; ) {
		const hi = sw[2 * i + 1 - LOW_WORD];
		const lo = sw[2 * i + LOW_WORD] >>> bits;
		let e = i + 1;
		while (e < sorted.length && sw[2 * e + 1 - LOW_WORD] === hi && sw[2 * e + LOW_WORD] >>> bits === lo) e++;
		if (e - i > 1) out.subarray(i, e).sort(cmp);
		i = e;
	}
	return out.length > take ? out.slice(0, take) : out;
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

function bit(code: FlagCode): number {
	return 1 << FLAG_CODES.indexOf(code);
}

// Bits set inside the per-part loop of `rank`, looked up once.
const BIT_CURRENT_EXTRAPOLATED = bit('current-extrapolated');
const BIT_TEMPERATURE_EXTRAPOLATED = bit('temperature-extrapolated');
const BIT_FORWARD_DROP_OVER_LIMIT = bit('forward-drop-over-limit');
const BIT_OVER_REVERSE_RATING = bit('over-reverse-rating');

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
