/**
 * Merging the raw points of a sweep: repeated traces, overlapping ranges and repeated readings
 * at one voltage become one point each, the mean of a narrow voltage bin, after rejecting (and
 * counting) the readings far from their bin's median. Used for currents (I–V) and capacitances
 * (C–V) alike; `Quantity` names what is merged in the messages.
 */
import type { DataIssue } from './errors';
import { median } from 'simple-statistics';

/** What the merged value is, for messages: "current" in "A". */
export interface Quantity {
	noun: string;
	unit: string;
	/** The column it was read from. */
	column: string;
	/** The voltage column, named in a conflict between repeats. */
	voltageColumn: string;
}

/** The raw points of a file, in file order, each with its row. */
export interface RawPoints {
	V: Float64Array;
	Y: Float64Array;
	T: Float64Array;
	rowOf: Int32Array;
	count: number;
}

/** One merged run: bin means and how many raw points each holds. */
export interface MergedRun {
	temperatureC: number;
	voltageV: Float64Array;
	value: Float64Array;
	count: Int32Array;
	/** Raw points kept (after rejection). */
	points: number;
	/** Smallest non-zero |value| among the kept raw points (0 when none). */
	minAbs: number;
	rejected: number;
}

/** Point indices grouped by temperature at 0.5 K resolution, coldest group first. */
export function groupByTemperature(raw: RawPoints): number[][] {
	const groups = new Map<number, number[]>();
	for (let k = 0; k < raw.count; k++) {
		const key = Math.round(raw.T[k] * 2);
		let g = groups.get(key);
		if (!g) groups.set(key, (g = []));
		g.push(k);
	}
	return [...groups.keys()].sort((a, b) => a - b).map((key) => groups.get(key) as number[]);
}

/** Voltage bin of a point: the nearest multiple of the bin width (exact voltage when the width is 0). */
function binKey(v: number, width: number): number {
	return width > 0 ? Math.round(v / width) : v;
}

/**
 * Order point indices by voltage bin, then by voltage. For speed with large files the
 * (bin, index) pairs are packed into one float64 and sorted natively; a comparator
 * sort is used when the packing would not be exact.
 */
function sortByBin(idx: number[], V: Float64Array, width: number): number[] {
	const n = idx.length;
	if (width > 0 && n < 2 ** 21) {
		let lo = Infinity;
		let hi = -Infinity;
		for (const k of idx) {
			const b = binKey(V[k], width);
			if (b < lo) lo = b;
			if (b > hi) hi = b;
		}
		if (hi - lo < 2 ** 31) {
			const packed = new Float64Array(n);
			for (let j = 0; j < n; j++) packed[j] = (binKey(V[idx[j]], width) - lo) * 2 ** 21 + j;
			packed.sort();
			const out = new Array<number>(n);
			for (let j = 0; j < n; j++) out[j] = idx[packed[j] % 2 ** 21];
			return out;
		}
	}
	return [...idx].sort((a, b) => V[a] - V[b]);
}

/** Sums of one run's kept points, filled bin by bin. */
class RunSums {
	V: number[] = [];
	Y: number[] = [];
	N: number[] = [];
	kept = 0;
	rejected = 0;
	minAbs = Infinity;
	tSum = 0;

	keep(raw: RawPoints, idx: number) {
		this.kept++;
		this.tSum += raw.T[idx];
		if (raw.Y[idx] !== 0) this.minAbs = Math.min(this.minAbs, Math.abs(raw.Y[idx]));
	}
}

/**
 * Two readings at one voltage that differ by more than ×2 (or in sign) cannot be arbitrated:
 * the second is refused, naming both rows.
 */
function pairConflict(raw: RawPoints, order: number[], k: number, q: Quantity, issues: DataIssue[]) {
	const a = raw.Y[order[k]];
	const b = raw.Y[order[k + 1]];
	const conflict = (a !== 0 || b !== 0) && (Math.sign(a) !== Math.sign(b) || Math.max(Math.abs(a), Math.abs(b)) > 2 * Math.min(Math.abs(a), Math.abs(b)));
	if (conflict)
		issues.push({
			row: raw.rowOf[order[k + 1]],
			column: q.column,
			message: `same voltage (${raw.V[order[k]]} V in ${q.voltageColumn}) as row ${raw.rowOf[order[k]]} but a conflicting ${q.noun} (${a} ${q.unit} vs ${b} ${q.unit})`
		});
}

/**
 * One bin of several readings: reject those far from the median, average the rest.
 * Rejection rule: |y − median| > max(5 robust σ, 30 % of |median|) where σ = 1.4826·MAD
 * (MAD scale for normal data: Rousseeuw & Croux, JASA 88 (1993) 1273). Three or more whose
 * kept values still span more than ×3, or with half or more rejected, are refused.
 */
function mergeBin(raw: RawPoints, order: number[], k: number, e: number, q: Quantity, sums: RunSums, issues: DataIssue[], warnings: DataIssue[]) {
	const size = e - k;
	const vals: number[] = [];
	for (let j = k; j < e; j++) vals.push(raw.Y[order[j]]);
	const med = median(vals);
	const mad = median(vals.map((x) => Math.abs(x - med)));
	const limit = Math.max(5 * 1.4826 * mad, 0.3 * Math.abs(med));
	const far = (x: number) => size > 2 && Math.abs(x - med) > limit;
	if (size === 2) pairConflict(raw, order, k, q, issues);
	let sv = 0;
	let sy = 0;
	let m = 0;
	let kmin = Infinity;
	let kmax = 0;
	let signs = 0;
	for (let j = k; j < e; j++) {
		const idx = order[j];
		const y = raw.Y[idx];
		if (far(y)) {
			sums.rejected++;
			warnings.push({ row: raw.rowOf[idx], column: q.column, message: `outlier rejected: ${y} ${q.unit} where repeats give ${med} ${q.unit}` });
			continue;
		}
		sv += raw.V[idx];
		sy += y;
		m++;
		sums.keep(raw, idx);
		kmin = Math.min(kmin, Math.abs(y));
		kmax = Math.max(kmax, Math.abs(y));
		signs |= y > 0 ? 1 : y < 0 ? 2 : 0;
	}
	// Even after rejection, kept repeats should agree within a small factor (ranges overlap, noise is %-level).
	const spread = size > 2 && signs !== 3 && kmax > 3 * kmin;
	if (size > 2 && (m * 2 < size || spread))
		issues.push({ row: raw.rowOf[order[k]], column: q.column, message: `repeated points near ${raw.V[order[k]]} V disagree too much to average (${size - m} of ${size} far from the median)` });
	if (m > 0) {
		sums.V.push(sv / m);
		sums.Y.push(sy / m);
		sums.N.push(m);
	}
}

/**
 * Merge one temperature group: cluster its points in voltage bins (nearest multiple of
 * `binWidth`), then keep single readings as they are and merge repeated ones (see mergeBin).
 */
export function mergeRun(raw: RawPoints, idx: number[], binWidth: number, q: Quantity, issues: DataIssue[], warnings: DataIssue[]): MergedRun {
	const order = sortByBin(idx, raw.V, binWidth);
	const sums = new RunSums();
	let k = 0;
	while (k < order.length) {
		const b0 = binKey(raw.V[order[k]], binWidth);
		let e = k + 1;
		while (e < order.length && binKey(raw.V[order[e]], binWidth) === b0) e++;
		if (e - k === 1) {
			const i = order[k];
			sums.V.push(raw.V[i]);
			sums.Y.push(raw.Y[i]);
			sums.N.push(1);
			sums.keep(raw, i);
		} else mergeBin(raw, order, k, e, q, sums, issues, warnings);
		k = e;
	}
	return {
		temperatureC: sums.kept > 0 ? sums.tSum / sums.kept : raw.T[order[0]],
		voltageV: Float64Array.from(sums.V),
		value: Float64Array.from(sums.Y),
		count: Int32Array.from(sums.N),
		points: sums.kept,
		minAbs: Number.isFinite(sums.minAbs) ? sums.minAbs : 0,
		rejected: sums.rejected
	};
}

/** The merge bin from a parser's options (0.5 mV unless given). @throws RangeError when negative. */
export function mergeBinWidth(options: { binWidthV?: number }): number {
	const w = options.binWidthV ?? 0.5e-3;
	if (!(w >= 0)) throw new RangeError('binWidthV must be non-negative');
	return w;
}

/** Each temperature's points merged into one run (in the order the temperatures first appear), and the raw points rejected. */
export function mergeByTemperature(raw: RawPoints, binWidth: number, q: Quantity, issues: DataIssue[], warnings: DataIssue[]): { merged: MergedRun[]; rejected: number } {
	const merged = groupByTemperature(raw).map((idx) => mergeRun(raw, idx, binWidth, q, issues, warnings));
	return { merged, rejected: merged.reduce((a, m) => a + m.rejected, 0) };
}
