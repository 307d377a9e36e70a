/**
 * Ranking catalogue parts for a designer's operating point.
 *
 * A `CatalogueTable` is built once from plain part records (each with one fitted
 * model per measured sample) and kept in memory; `rank(op)` evaluates every sample
 * with the vectorised `ModelTable` and returns parts ordered by worst-case leakage.
 * Definitions:
 *  - leakage = |I(biasV)| at the hot end of the temperature range; typical = median over
 *    samples, worst = largest sample (the sort key, lowest first);
 *  - forward drop at clampCurrentA at the hot and cold ends; worst = largest over samples
 *    at the cold end (junction voltage rises as temperature falls);
 *  - capacitance at the bias (median over samples at the mid temperature) when CJO is known.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { ModelTable } from './model-table';

export type JunctionKind = 'diode' | 'bjt-be' | 'diode-connected-bjt' | 'jfet-gate' | 'led' | 'schottky';

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

/** Columnar ranking result; `rows()` turns a page of it into objects. */
export interface RankResult {
	/** Part indices, best (lowest worst-case leakage) first; excluded parts are left out. */
	order: Int32Array;
	/** Parts excluded by the reverse rating. */
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
			if (p.kind === 'schottky' || p.samples.some((s) => s.material === 'schottky')) f |= bit('metal-semiconductor');
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
	 * Rank all parts for an operating point (definitions in the file header).
	 * @throws RangeError for an invalid operating point.
	 */
	rank(op: OperatingPoint, constants: PhysicalConstants = SI_2019): RankResult {
		const [cold, hot] = temperatureEnds(op);
		if (!Number.isFinite(op.biasV)) throw new RangeError(`bias must be finite, got ${op.biasV}`);
		const margin = op.reverseMarginV ?? 0;
		const n = this.parts.length;
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
			if (typical < this.minMeasured[p] / 10) f |= bit('current-extrapolated');
			if (this.farFromMeasured(p, cold) || this.farFromMeasured(p, hot)) f |= bit('temperature-extrapolated');
			if (hotV && coldV) {
				let h = 0;
				let cw = 0;
				for (let k = 0; k < c; k++) {
					sort[k] = hotV[s0 + k];
					if (coldV[s0 + k] > cw) cw = coldV[s0 + k];
				}
				insertionSortPrefix(sort, c);
				h = c % 2 ? sort[c >> 1] : 0.5 * (sort[(c >> 1) - 1] + sort[c >> 1]);
				for (let k = 0; k < c; k++) sort[k] = coldV[s0 + k];
				insertionSortPrefix(sort, c);
				dropHotV[p] = h;
				dropColdV[p] = c % 2 ? sort[c >> 1] : 0.5 * (sort[(c >> 1) - 1] + sort[c >> 1]);
				dropWorstV[p] = cw;
				if (op.maxForwardDropV !== undefined && cw > op.maxForwardDropV) f |= bit('forward-drop-over-limit');
			}
			flags[p] = f;
			const over = op.biasV < 0 && -op.biasV > this.ratedReverse[p] - margin;
			if (over) {
				flags[p] |= bit('over-reverse-rating');
				if (!op.includeOverRating) {
					excluded.push(p);
					continue;
				}
			}
			keep[kept++] = p;
		}
		const order = keep.slice(0, kept);
		order.sort((a, b) => worstA[a] - worstA[b] || typicalA[a] - typicalA[b] || a - b);
		return { order, excluded: Int32Array.from(excluded), typicalA, worstA, dropHotV, dropColdV, dropWorstV, flags, hotC: hot, coldC: cold };
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

function bit(code: FlagCode): number {
	return 1 << FLAG_CODES.indexOf(code);
}

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
