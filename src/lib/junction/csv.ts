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
 * The steps shared with C–V files live in csv-table.ts (reading) and csv-merge.ts (merging).
 */
import { SweepError, type DataIssue } from './errors';
import {
	cellReader,
	CURRENT_UNITS,
	findColumns,
	isBlankRow,
	isTemperatureName,
	readSweepRows,
	readTemperatureCell,
	rowWidthIssue,
	VOLTAGE_UNITS,
	type Column,
	type RoleSpec,
	type SweepTable,
	type TemperatureReading
} from './csv-table';
import { mergeBinWidth, mergeByTemperature, type RawPoints } from './csv-merge';

export { MAX_SWEEP_BYTES, checkSweepSize } from './csv-table';

type Role = 'voltage' | 'current' | 'temperature' | 'trace' | 'range';

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

/** Names that mean a voltage column, for I–V and C–V files alike. */
export const isVoltageName = (b: string) => /^(v|u|vf|vr|vd|vak|vbe|bias|volts?|voltage|vbias|v_?bias)$/.test(b) || /voltage/.test(b);

const IV_ROLES: RoleSpec<Role>[] = [
	{ role: 'voltage', noun: 'voltage', matches: isVoltageName, units: VOLTAGE_UNITS, unitHint: 'use V, mV or µV' },
	{
		role: 'current',
		noun: 'current',
		matches: (b) => /^(i|if|ir|id|ia|ic|amps?|current|leakage|ileak)$/.test(b) || /current/.test(b),
		units: CURRENT_UNITS,
		unitHint: 'use A, mA, µA/uA, nA, pA or fA'
	},
	{ role: 'temperature', noun: 'temperature', matches: isTemperatureName, units: 'temperature' },
	{ role: 'trace', noun: 'trace', matches: (b) => /trace|sweep|run|repeat|rep|pass|cycle/.test(b) },
	{ role: 'range', noun: 'range', matches: (b) => /range|rng|scale|gain/.test(b) }
];

const placeholder = (i: number) => (i === 0 ? 'V' : i === 1 ? 'I' : `column ${i + 1}`);
const positional = (i: number): Role | undefined => (i === 0 ? 'voltage' : i === 1 ? 'current' : undefined);

/** The voltage and current columns (and the optional ones), or every header problem at once. */
function ivColumns(table: SweepTable, options: SweepOptions, warnings: DataIssue[]) {
	const issues: DataIssue[] = [];
	const cols = findColumns(table, IV_ROLES, positional, issues);
	const list = table.headerCells.join(', ');
	if (!cols.has('voltage')) issues.push({ row: table.first + 1, message: `no voltage column found in the header (${list}); name one V or Voltage` });
	if (!cols.has('current')) issues.push({ row: table.first + 1, message: `no current column found in the header (${list}); name one I or Current` });
	if (issues.length) throw new SweepError(issues);
	if (!table.hasHeader) warnings.push({ row: 1, message: 'no header row: column 1 read as volts, column 2 as amperes' });
	if (!cols.has('temperature') && options.temperatureC === undefined)
		throw new SweepError([{ message: 'no temperature column and no measurement temperature given; add a Temp (°C) column or state the temperature' }]);
	return { v: cols.get('voltage') as Column<Role>, i: cols.get('current') as Column<Role>, t: cols.get('temperature'), trace: cols.get('trace'), range: cols.get('range') };
}

/** Every data row read into raw points; rows with a problem are left out and reported. */
function readRows(table: SweepTable, cols: ReturnType<typeof ivColumns>, options: SweepOptions, issues: DataIssue[], seen: TemperatureReading): RawPoints {
	const maxIssues = options.maxIssues ?? 50;
	const n = table.data.length;
	const raw: RawPoints = { V: new Float64Array(n), Y: new Float64Array(n), T: new Float64Array(n), rowOf: new Int32Array(n), count: 0 };
	const read = cellReader(table, issues);
	for (let r = table.hasHeader ? table.first + 1 : table.first; r < n; r++) {
		const cells = table.data[r];
		if (isBlankRow(cells, cols.v.index)) continue;
		const row = r + 1;
		const wide = rowWidthIssue(table, cells, row);
		if (wide) {
			issues.push(wide);
			if (issues.length >= maxIssues) break;
			continue;
		}
		const v = read(cells[cols.v.index], cols.v, row);
		const i = read(cells[cols.i.index], cols.i, row);
		const t = cols.t ? readTemperatureCell(read, cells[cols.t.index], cols.t, row, issues, seen) : (options.temperatureC ?? NaN);
		if (issues.length >= maxIssues) break;
		if (!Number.isFinite(v) || !Number.isFinite(i) || !Number.isFinite(t)) continue;
		raw.V[raw.count] = v;
		raw.Y[raw.count] = i;
		raw.T[raw.count] = t;
		raw.rowOf[raw.count] = row;
		raw.count++;
	}
	return raw;
}

/** A sweep needs three points and a current somewhere. */
function checkEnough(raw: RawPoints, table: SweepTable, currentColumn: string) {
	if (raw.count === 0) throw new SweepError([{ row: table.first + 1, message: 'the file has a header but no data rows' }]);
	if (raw.count < 3) throw new SweepError([{ message: `only ${raw.count} data point${raw.count === 1 ? '' : 's'}; a sweep needs at least 3` }]);
	let anyCurrent = false;
	for (let k = 0; k < raw.count; k++) if (raw.Y[k] !== 0) anyCurrent = true;
	if (!anyCurrent) throw new SweepError([{ column: currentColumn, message: 'every current is zero; check the current column and its unit' }]);
}

/**
 * Read an I–V sweep from CSV text. See the file header for the accepted forms.
 * @throws SweepError listing every problem (row numbers 1-based, header = row 1).
 */
export function parseSweepCsv(text: string, options: SweepOptions = {}): ParsedSweep {
	const binWidth = mergeBinWidth(options);
	const { table, cols, rows: raw, warnings } = readSweepRows(
		text,
		placeholder,
		(t, w) => ivColumns(t, options, w),
		(t, c, issues, seen) => readRows(t, c, options, issues, seen)
	);
	checkEnough(raw, table, cols.i.name);
	const issues: DataIssue[] = [];
	const q = { noun: 'current', unit: 'A', column: cols.i.name, voltageColumn: cols.v.name };
	const { merged, rejected } = mergeByTemperature(raw, binWidth, q, issues, warnings);
	if (issues.length) throw new SweepError(issues);
	const runs: SweepRun[] = merged.map((m) => ({ temperatureC: m.temperatureC, voltageV: m.voltageV, currentA: m.value, count: m.count, points: m.points, minAbsCurrentA: m.minAbs }));
	return {
		runs,
		rows: raw.count,
		rejected,
		warnings,
		columns: { voltage: cols.v.name, current: cols.i.name, temperature: cols.t?.name, trace: cols.trace?.name, range: cols.range?.name }
	};
}
