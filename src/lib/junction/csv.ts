/**
 * Reading measured I–V sweeps from CSV text.
 *
 * Accepts a header row naming voltage and current columns (with units such as
 * `V (mV)`, `I [nA]`, `current_uA`) and optional trace, range and temperature
 * columns; `;`- or tab-separated files with decimal commas; a UTF-8 BOM.
 * Points from repeated traces and overlapping current ranges are merged by
 * averaging within narrow voltage bins; points far from their bin's median are
 * rejected and counted. A row with more (non-empty) cells than the header is refused,
 * since its values cannot be assigned to columns. Every problem is reported with its 1-based file row
 * (header = row 1) and column name, all at once, in a `SweepError`.
 */
import Papa from 'papaparse';
import { SweepError, SweepTooLargeError, type DataIssue } from './errors';
import { ZERO_CELSIUS_K } from './constants';

/** Largest sweep file accepted, in bytes (the server answers 413 above this). */
export const MAX_SWEEP_BYTES = 16 * 1024 * 1024;

/**
 * Throw `SweepTooLargeError` when a file of this many bytes exceeds `limit` (default MAX_SWEEP_BYTES).
 * @throws RangeError for a negative or non-finite size.
 */
export function checkSweepSize(byteLength: number, limit = MAX_SWEEP_BYTES): void {
	if (!Number.isFinite(byteLength) || byteLength < 0) throw new RangeError(`invalid byte length ${byteLength}`);
	if (byteLength > limit) throw new SweepTooLargeError(byteLength, limit);
}

type Role = 'voltage' | 'current' | 'temperature' | 'trace' | 'range';

interface ColumnInfo {
	index: number;
	name: string;
	role: Role;
	/** Multiplier to SI (V or A); for temperature, the scale. */
	scale: number;
	tempScale?: 'C' | 'K';
	unitGiven: boolean;
}

/** One merged point of a run: mean voltage and current of a voltage bin. */
export interface SweepRun {
	/** Measurement temperature in °C. */
	temperatureC: number;
	voltageV: Float64Array;
	currentA: Float64Array;
	/** How many raw points were averaged into each merged point. */
	count: Int32Array;
	/** Raw points kept (after rejection) in this run. */
	points: number;
	/** Smallest non-zero |current| among the kept raw points [A]. */
	minAbsCurrentA: number;
}

export interface ParsedSweep {
	runs: SweepRun[];
	/** Total data rows read. */
	rows: number;
	/** Raw points rejected as outliers. */
	rejected: number;
	/** Non-fatal remarks (rejected outliers, assumed units), each with row/column. */
	warnings: DataIssue[];
	columns: { voltage: string; current: string; temperature?: string; trace?: string; range?: string };
}

export interface SweepOptions {
	/** Temperature of the measurement when the file has no temperature column [°C]. */
	temperatureC?: number;
	/** Points whose voltages lie within this width are merged [V] (default 0.5 mV). */
	binWidthV?: number;
	/** Largest number of issues collected before giving up (default 50). */
	maxIssues?: number;
}

const VOLTAGE_UNITS: Record<string, number> = { v: 1, mv: 1e-3, uv: 1e-6, µv: 1e-6, μv: 1e-6, kv: 1e3 };
const CURRENT_UNITS: Record<string, number> = {
	a: 1,
	ma: 1e-3,
	ua: 1e-6,
	µa: 1e-6,
	μa: 1e-6,
	na: 1e-9,
	pa: 1e-12,
	fa: 1e-15
};

function splitHeader(raw: string): { base: string; unit?: string } {
	const h = raw.trim();
	let m = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/.exec(h);
	if (m) return { base: m[1].trim(), unit: m[2].trim() };
	m = /^(.*?)\s*\/\s*(\S+)$/.exec(h);
	if (m) return { base: m[1].trim(), unit: m[2].trim() };
	m = /^(.*?)[_\s]+([a-zµμ°]{1,4})$/i.exec(h);
	if (m && (VOLTAGE_UNITS[m[2].toLowerCase()] || CURRENT_UNITS[m[2].toLowerCase()] || /^(°?c|k|degc)$/i.test(m[2])))
		return { base: m[1].trim(), unit: m[2].trim() };
	return { base: h };
}

function roleOf(base: string): Role | undefined {
	const b = base.toLowerCase();
	if (/^(v|u|vf|vr|vd|vak|vbe|bias|volts?|voltage|vbias|v_?bias)$/.test(b) || /voltage/.test(b)) return 'voltage';
	if (/^(i|if|ir|id|ia|ic|amps?|current|leakage|ileak)$/.test(b) || /current/.test(b)) return 'current';
	if (/^(t|tj|ta|temp|temperature)$/.test(b) || /temp/.test(b)) return 'temperature';
	if (/trace|sweep|run|repeat|rep|pass|cycle/.test(b)) return 'trace';
	if (/range|rng|scale|gain/.test(b)) return 'range';
	return undefined;
}

function isNumericText(s: string): boolean {
	return /^\s*[+\-\u2212]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?\s*[a-zA-Zµμ°]*\s*$/.test(s);
}

const CELL_RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([a-zA-Zµμ°]*)$/;

/**
 * Read an I–V sweep from CSV text. See the file header for the accepted forms.
 * @throws SweepError listing every problem (row numbers 1-based, header = row 1).
 */
export function parseSweepCsv(text: string, options: SweepOptions = {}): ParsedSweep {
	const issues: DataIssue[] = [];
	const maxIssues = options.maxIssues ?? 50;
	const binWidth = options.binWidthV ?? 0.5e-3;
	if (!(binWidth >= 0)) throw new RangeError('binWidthV must be non-negative');
	const fail = (list: DataIssue[]): never => {
		throw new SweepError(list);
	};
	if (typeof text !== 'string' || text.replace(/^\uFEFF/, '').trim() === '') fail([{ message: 'the file is empty' }]);
	// A UTF-8 file has at least as many bytes as the string has UTF-16 units minus surrogates; good enough as a guard.
	if (text.length > MAX_SWEEP_BYTES) checkSweepSize(text.length);
	const body = text.replace(/^\uFEFF/, '');
	// Binary files: NUL bytes, replacement characters or many control characters in the first kilobytes.
	const probe = body.slice(0, 8192);
	const controls = (probe.match(/[\u0000-\u0008\u000E-\u001F\uFFFD]/g) ?? []).length;
	if (probe.includes('\u0000') || controls > Math.max(2, probe.length * 0.01))
		fail([{ message: 'the file looks binary, not CSV text; export the sweep as comma- or semicolon-separated text' }]);

	const parsed = Papa.parse<string[]>(body, { header: false, skipEmptyLines: false, delimitersToGuess: [',', ';', '\t', '|'] });
	const delimiter = parsed.meta.delimiter;
	const data = parsed.data;
	const decimalComma = delimiter !== ',';

	// First non-blank row: header or data?
	let first = 0;
	while (first < data.length && data[first].every((c) => c.trim() === '')) first++;
	if (first >= data.length) fail([{ message: 'the file is empty' }]);
	const firstRow = data[first];
	const hasHeader = firstRow.some((c) => c.trim() !== '' && !isNumericText(c));
	const headerCells = hasHeader ? firstRow.map((c) => c.trim()) : firstRow.map((_, i) => (i === 0 ? 'V' : i === 1 ? 'I' : `column ${i + 1}`));
	const warnings: DataIssue[] = [];

	const columns: ColumnInfo[] = [];
	headerCells.forEach((raw, index) => {
		const { base, unit } = splitHeader(raw);
		let role = roleOf(base);
		if (!hasHeader) role = index === 0 ? 'voltage' : index === 1 ? 'current' : undefined;
		if (!role) return;
		if (columns.some((c) => c.role === role)) {
			issues.push({ row: first + 1, column: raw, message: `a second ${role} column; keep only one` });
			return;
		}
		const info: ColumnInfo = { index, name: raw, role, scale: 1, unitGiven: unit !== undefined };
		if (unit !== undefined) {
			const u = unit.toLowerCase().replace(/\s+/g, '');
			if (role === 'voltage') {
				if (VOLTAGE_UNITS[u] === undefined) issues.push({ row: first + 1, column: raw, message: `unknown voltage unit '${unit}'; use V, mV or µV` });
				else info.scale = VOLTAGE_UNITS[u];
			} else if (role === 'current') {
				if (CURRENT_UNITS[u] === undefined)
					issues.push({ row: first + 1, column: raw, message: `unknown current unit '${unit}'; use A, mA, µA/uA, nA, pA or fA` });
				else info.scale = CURRENT_UNITS[u];
			} else if (role === 'temperature') {
				if (/^(°?c|degc|celsius|℃)$/.test(u)) info.tempScale = 'C';
				else if (/^(k|kelvin)$/.test(u)) info.tempScale = 'K';
				else issues.push({ row: first + 1, column: raw, message: `unknown temperature unit '${unit}'; use °C or K` });
			}
		}
		columns.push(info);
	});
	const vCol = columns.find((c) => c.role === 'voltage');
	const iCol = columns.find((c) => c.role === 'current');
	const tCol = columns.find((c) => c.role === 'temperature');
	const trCol = columns.find((c) => c.role === 'trace');
	const rgCol = columns.find((c) => c.role === 'range');
	if (!vCol) issues.push({ row: first + 1, message: `no voltage column found in the header (${headerCells.join(', ')}); name one V or Voltage` });
	if (!iCol) issues.push({ row: first + 1, message: `no current column found in the header (${headerCells.join(', ')}); name one I or Current` });
	if (issues.length) fail(issues);
	const vc = vCol as ColumnInfo;
	const ic = iCol as ColumnInfo;
	if (!hasHeader) warnings.push({ row: 1, message: 'no header row: column 1 read as volts, column 2 as amperes' });
	if (!tCol && options.temperatureC === undefined)
		fail([{ message: 'no temperature column and no measurement temperature given; add a Temp (°C) column or state the temperature' }]);

	const n = data.length;
	const V = new Float64Array(n);
	const I = new Float64Array(n);
	const T = new Float64Array(n);
	const rowOf = new Int32Array(n);
	let count = 0;
	const cellUnits = new Map<Role, { unit: string; row: number }>();

	const readCell = (cell: string | undefined, col: ColumnInfo, row: number): number => {
		if (cell === undefined) {
			issues.push({ row, column: col.name, message: 'missing value' });
			return NaN;
		}
		// Fast path for plain numbers (most cells of large files); Number('') is 0, so 0 is re-checked.
		let v = Number(cell);
		if (v !== 0 && Number.isFinite(v)) return v * col.scale;
		if (cell.trim() === '') {
			issues.push({ row, column: col.name, message: 'missing value' });
			return NaN;
		}
		if (v === 0) return 0;
		let s = cell.trim().replace(/\u2212/g, '-');
		if (decimalComma) s = s.replace(',', '.');
		if (/^[+-]?(nan|inf(inity)?)$/i.test(s)) {
			issues.push({ row, column: col.name, message: `'${cell}' is not a finite number` });
			return NaN;
		}
		const m = CELL_RE.exec(s);
		if (!m) {
			issues.push({ row, column: col.name, message: `expected a number, got '${cell.slice(0, 40)}'` });
			return NaN;
		}
		v = Number(m[1]);
		const unit = m[2];
		if (unit === '') return v * col.scale;
		const u = unit.toLowerCase();
		const table = col.role === 'voltage' ? VOLTAGE_UNITS : col.role === 'current' ? CURRENT_UNITS : undefined;
		if (!table || table[u] === undefined) {
			issues.push({ row, column: col.name, message: `unknown unit '${unit}' in '${cell}'` });
			return NaN;
		}
		if (col.unitGiven && table[u] !== col.scale) {
			issues.push({ row, column: col.name, message: `cell unit '${unit}' conflicts with the header unit` });
			return NaN;
		}
		const seen = cellUnits.get(col.role);
		if (seen && seen.unit !== u) {
			issues.push({ row, column: col.name, message: `mixed units in one column ('${seen.unit}' at row ${seen.row}, '${unit}' here)` });
			return NaN;
		}
		if (!seen) cellUnits.set(col.role, { unit: u, row });
		return v * table[u];
	};

	for (let r = hasHeader ? first + 1 : first; r < n; r++) {
		const cells = data[r];
		if (cells.length === 1 && cells[0].trim() === '') continue;
		const vRaw = cells[vc.index];
		if ((vRaw === undefined || vRaw.trim() === '') && cells.every((c) => c.trim() === '')) continue;
		const row = r + 1;
		// More cells than the header means the columns are misaligned, most often a decimal comma
		// in a comma-separated file ("0,45,1e-9" is not V = 0, I = 45). Trailing empty cells are harmless.
		if (cells.length > headerCells.length) {
			let used = cells.length;
			while (used > headerCells.length && cells[used - 1].trim() === '') used--;
			if (used > headerCells.length) {
				const hint = delimiter === ',' ? '; a decimal comma in a comma-separated file? Use decimal points, or separate columns with semicolons' : '';
				issues.push({
					row,
					message: `${used} cells where ${headerCells.length} were expected (${hasHeader ? 'header' : 'first row'}: ${headerCells.join(', ')})${hint}`
				});
				if (issues.length >= maxIssues) break;
				continue;
			}
		}
		const v = readCell(cells[vc.index], vc, row);
		const i = readCell(cells[ic.index], ic, row);
		let t = options.temperatureC ?? NaN;
		if (tCol) {
			const raw = readCell(cells[tCol.index], tCol, row);
			if (Number.isFinite(raw)) {
				let scale = tCol.tempScale;
				if (!scale) scale = raw >= 200 ? 'K' : 'C';
				if (tCol.tempScale === 'C' && raw >= 200)
					issues.push({ row, column: tCol.name, message: `${raw} °C is implausible; is this column in kelvin?` });
				else if (tCol.tempScale === 'K' && raw < 150)
					issues.push({ row, column: tCol.name, message: `${raw} K is implausible; is this column in °C?` });
				t = scale === 'K' ? raw - ZERO_CELSIUS_K : raw;
				if (!(t > -273.15)) issues.push({ row, column: tCol.name, message: `temperature ${raw} is below absolute zero` });
			}
		}
		if (issues.length >= maxIssues) break;
		if (!Number.isFinite(v) || !Number.isFinite(i) || !Number.isFinite(t)) continue;
		V[count] = v;
		I[count] = i;
		T[count] = t;
		rowOf[count] = row;
		count++;
	}
	if (tCol && !tCol.tempScale && count > 0 && T[0] + ZERO_CELSIUS_K >= 200 && T.subarray(0, count).some((x) => x + ZERO_CELSIUS_K >= 200))
		warnings.push({ column: tCol.name, message: 'temperature column has no unit; values of 200 or more were read as kelvin' });
	if (issues.length) fail(issues);
	if (count === 0) fail([{ row: first + 1, message: 'the file has a header but no data rows' }]);
	if (count < 3) fail([{ message: `only ${count} data point${count === 1 ? '' : 's'}; a sweep needs at least 3` }]);
	let anyCurrent = false;
	for (let k = 0; k < count; k++) if (I[k] !== 0) anyCurrent = true;
	if (!anyCurrent) fail([{ column: ic.name, message: 'every current is zero; check the current column and its unit' }]);

	// Group by temperature (0.5 K resolution), then merge voltage bins.
	const groups = new Map<number, number[]>();
	for (let k = 0; k < count; k++) {
		const key = Math.round(T[k] * 2);
		let g = groups.get(key);
		if (!g) groups.set(key, (g = []));
		g.push(k);
	}
	const runs: SweepRun[] = [];
	let rejected = 0;
	for (const key of [...groups.keys()].sort((a, b) => a - b)) {
		const idx = groups.get(key) as number[];
		const order = sortByBin(idx, V, binWidth);
		const res = mergeRun(order, 0, order.length, V, I, T, rowOf, binWidth, vc.name, ic.name, issues, warnings);
		rejected += res.rejected;
		runs.push(res.run);
	}
	if (issues.length) fail(issues);
	return {
		runs,
		rows: count,
		rejected,
		warnings,
		columns: { voltage: vc.name, current: ic.name, temperature: tCol?.name, trace: trCol?.name, range: rgCol?.name }
	};
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

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/**
 * Merge one temperature run: cluster points in the same voltage bin (nearest multiple of binWidth), reject currents far from the cluster median, and average the rest.
 * Rejection rule: |I − median| > max(5 robust σ, 30 % of |median|) where σ = 1.4826·MAD
 * (MAD scale for normal data: Rousseeuw & Croux, JASA 88 (1993) 1273).
 * Two points at one voltage that differ by more than ×2 (or in sign) cannot be arbitrated: error;
 * likewise three or more whose kept currents still span more than ×3.
 */
function mergeRun(
	order: number[],
	start: number,
	end: number,
	V: Float64Array,
	I: Float64Array,
	T: Float64Array,
	rowOf: Int32Array,
	binWidth: number,
	vName: string,
	iName: string,
	issues: DataIssue[],
	warnings: DataIssue[]
): { run: SweepRun; rejected: number } {
	const outV: number[] = [];
	const outI: number[] = [];
	const outN: number[] = [];
	let rejected = 0;
	let kept = 0;
	let minAbs = Infinity;
	let tSum = 0;
	let k = start;
	while (k < end) {
		const v0 = V[order[k]];
		const b0 = binKey(v0, binWidth);
		let e = k + 1;
		while (e < end && binKey(V[order[e]], binWidth) === b0) e++;
		const size = e - k;
		if (size === 1) {
			const idx = order[k];
			outV.push(V[idx]);
			outI.push(I[idx]);
			outN.push(1);
			kept++;
			tSum += T[idx];
			if (I[idx] !== 0) minAbs = Math.min(minAbs, Math.abs(I[idx]));
		} else {
			const cur: number[] = [];
			for (let j = k; j < e; j++) cur.push(I[order[j]]);
			const med = median(cur);
			const mad = median(cur.map((x) => Math.abs(x - med)));
			const limit = Math.max(5 * 1.4826 * mad, 0.3 * Math.abs(med));
			if (size === 2) {
				const a = cur[0];
				const b = cur[1];
				const conflict = (a !== 0 || b !== 0) && (Math.sign(a) !== Math.sign(b) || Math.max(Math.abs(a), Math.abs(b)) > 2 * Math.min(Math.abs(a), Math.abs(b)));
				if (conflict) {
					issues.push({
						row: rowOf[order[k + 1]],
						column: iName,
						message: `same voltage (${V[order[k]]} V in ${vName}) as row ${rowOf[order[k]]} but a conflicting current (${a} A vs ${b} A)`
					});
				}
			}
			let sv = 0;
			let si = 0;
			let m = 0;
			for (let j = k; j < e; j++) {
				const idx = order[j];
				if (size > 2 && Math.abs(I[idx] - med) > limit) {
					rejected++;
					warnings.push({ row: rowOf[idx], column: iName, message: `outlier rejected: ${I[idx]} A where repeats give ${med} A` });
					continue;
				}
				sv += V[idx];
				si += I[idx];
				m++;
				tSum += T[idx];
				if (I[idx] !== 0) minAbs = Math.min(minAbs, Math.abs(I[idx]));
			}
			// Even after rejection, kept repeats should agree within a small factor (ranges overlap, noise is %-level).
			let kmin = Infinity;
			let kmax = 0;
			let signs = 0;
			for (let j = k; j < e; j++) {
				const x = I[order[j]];
				if (size > 2 && Math.abs(x - med) > limit) continue;
				kmin = Math.min(kmin, Math.abs(x));
				kmax = Math.max(kmax, Math.abs(x));
				signs |= x > 0 ? 1 : x < 0 ? 2 : 0;
			}
			const spread = size > 2 && signs !== 3 && kmax > 3 * kmin;
			if (size > 2 && (m * 2 < size || spread)) {
				issues.push({ row: rowOf[order[k]], column: iName, message: `repeated points near ${v0} V disagree too much to average (${size - m} of ${size} far from the median)` });
			}
			if (m > 0) {
				outV.push(sv / m);
				outI.push(si / m);
				outN.push(m);
				kept += m;
			}
		}
		k = e;
	}
	return {
		run: {
			temperatureC: kept > 0 ? tSum / kept : T[order[start]],
			voltageV: Float64Array.from(outV),
			currentA: Float64Array.from(outI),
			count: Int32Array.from(outN),
			points: kept,
			minAbsCurrentA: Number.isFinite(minAbs) ? minAbs : 0
		},
		rejected
	};
}
