/**
 * Reading measured C–V sweeps (junction capacitance against bias, from an LCR meter or a
 * C–V rig) from CSV text, by the same rules as I–V files (csv-table.ts, csv-merge.ts):
 * a header naming a voltage and a capacitance column (`V (V)`, `Cp (pF)`, `C/nF`, `cap_fF`,
 * units F, µF, nF, pF, fF), optional temperature, test-frequency (`Freq (kHz)`) and
 * test-signal level (`Level (mV)`, `Osc (mV)`) columns; `;`- or tab-separated files with
 * decimal commas; repeated readings at one voltage merged. A column named as a reverse
 * voltage (`VR`, `Vrev`, `Reverse bias`) holding only non-negative values is read as the
 * reverse-bias magnitude, so its voltages are negated (and a warning says so). Frequency and
 * level are recorded with the run: each must be one value for the whole file. Every problem
 * names its 1-based row (header = row 1) and its column, all at once, in a `SweepError`.
 */
import { SweepError, type DataIssue } from './errors';
import {
	CAPACITANCE_UNITS,
	cellReader,
	findColumns,
	FREQUENCY_UNITS,
	isBlankRow,
	isTemperatureName,
	readSweepRows,
	readSweepTable,
	readTemperatureCell,
	rowWidthIssue,
	splitHeader,
	VOLTAGE_UNITS,
	type Column,
	type RoleSpec,
	type SweepTable,
	type TemperatureReading
} from './csv-table';
import { mergeBinWidth, mergeByTemperature, type RawPoints } from './csv-merge';
import { isVoltageName, type SweepOptions } from './csv';

type Role = 'level' | 'voltage' | 'capacitance' | 'temperature' | 'frequency';

/** One temperature's merged C–V points. */
export interface CapacitanceRun {
	temperatureC: number;
	voltageV: Float64Array;
	capacitanceF: Float64Array;
	/** How many raw readings were averaged into each point. */
	count: Int32Array;
	/** Raw readings kept (after rejection). */
	points: number;
}

export interface ParsedCapacitanceSweep {
	runs: CapacitanceRun[];
	/** Data rows read. */
	rows: number;
	/** Raw readings rejected as outliers. */
	rejected: number;
	warnings: DataIssue[];
	columns: { voltage: string; capacitance: string; temperature?: string; frequency?: string; level?: string };
	/** Test-signal frequency from the file [Hz], when it has a frequency column. */
	frequencyHz?: number;
	/** Test-signal level from the file [V], when it has a level column. */
	testLevelV?: number;
}

const isCapacitanceName = (b: string, unit?: string) =>
	/^(c|cp|cs|cj|cd|cap|capacitance|c_?j|c_?p|c_?s)$/.test(b) || /capacit/.test(b) || (unit !== undefined && CAPACITANCE_UNITS[unit] !== undefined && !/freq|level|osc/.test(b));
const isLevelName = (b: string) => /level|osc|signal/.test(b) || /^(vac|vosc|vrms|v_?ac)$/.test(b) || /(^|[\s_-])ac($|[\s_-])/.test(b);
const isReverseName = (b: string) => /^(vr|vrev|v_?r|v_?rev|reverse.*)$/.test(b);

const CV_ROLES: RoleSpec<Role>[] = [
	// The level first: "AC voltage" or "Osc level (mV)" names the test signal, not the bias.
	{ role: 'level', noun: 'test-signal level', matches: isLevelName, units: VOLTAGE_UNITS, unitHint: 'use V or mV' },
	{ role: 'voltage', noun: 'voltage', matches: (b) => isVoltageName(b) || isReverseName(b), units: VOLTAGE_UNITS, unitHint: 'use V, mV or µV' },
	{ role: 'capacitance', noun: 'capacitance', matches: isCapacitanceName, units: CAPACITANCE_UNITS, unitHint: 'use F, µF, nF, pF or fF' },
	{ role: 'temperature', noun: 'temperature', matches: isTemperatureName, units: 'temperature' },
	{ role: 'frequency', noun: 'frequency', matches: (b) => /^(f|freq|frequency)$/.test(b) || /freq/.test(b), units: FREQUENCY_UNITS, unitHint: 'use Hz, kHz or MHz' }
];

const placeholder = (i: number) => (i === 0 ? 'V' : i === 1 ? 'C' : `column ${i + 1}`);
const positional = (i: number): Role | undefined => (i === 0 ? 'voltage' : i === 1 ? 'capacitance' : undefined);

type CvColumns = { v: Column<Role>; c: Column<Role>; t?: Column<Role>; f?: Column<Role>; level?: Column<Role> };

/**
 * Whether a file's header names a C–V sweep ('cv': a capacitance column and no current
 * column), an I–V sweep ('iv': a current column), or cannot tell (null: no header, or neither).
 */
export function sweepKindOf(text: string): 'iv' | 'cv' | null {
	let table: SweepTable;
	try {
		table = readSweepTable(text, placeholder);
	} catch {
		return null;
	}
	if (!table.hasHeader) return null;
	let capacitance = false;
	let current = false;
	for (const raw of table.headerCells) {
		const { base, unit } = splitHeader(raw);
		const b = base.toLowerCase();
		const u = unit?.toLowerCase().replace(/\s+/g, '');
		if (isLevelName(b)) continue;
		if (isCapacitanceName(b, u)) capacitance = true;
		else if (/^(i|if|ir|id|ia|ic|amps?|current|leakage|ileak)$/.test(b) || /current/.test(b) || (u !== undefined && /^[mµμunpf]?a$/.test(u))) current = true;
	}
	return current ? 'iv' : capacitance ? 'cv' : null;
}

function cvColumns(table: SweepTable, options: SweepOptions, warnings: DataIssue[]): CvColumns {
	const issues: DataIssue[] = [];
	const cols = findColumns(table, CV_ROLES, positional, issues);
	const list = table.headerCells.join(', ');
	if (!cols.has('voltage')) issues.push({ row: table.first + 1, message: `no voltage column found in the header (${list}); name one V or Voltage` });
	if (!cols.has('capacitance')) issues.push({ row: table.first + 1, message: `no capacitance column found in the header (${list}); name one C or Capacitance, with its unit, e.g. C (pF)` });
	if (issues.length) throw new SweepError(issues);
	if (!table.hasHeader) warnings.push({ row: 1, message: 'no header row: column 1 read as volts, column 2 as farads' });
	if (!cols.has('temperature') && options.temperatureC === undefined)
		throw new SweepError([{ message: 'no temperature column and no measurement temperature given; add a Temp (°C) column or state the temperature' }]);
	return { v: cols.get('voltage')!, c: cols.get('capacitance')!, t: cols.get('temperature'), f: cols.get('frequency'), level: cols.get('level') };
}

/** A test-signal setting (frequency, level) that must hold one value for the whole file. */
class Setting {
	value: number | undefined;
	row = 0;
	constructor(
		readonly col: Column<Role> | undefined,
		readonly unit: string
	) {}

	check(v: number, row: number, issues: DataIssue[]) {
		const col = this.col as Column<Role>;
		if (!(v > 0)) return void issues.push({ row, column: col.name, message: `the ${col.role === 'frequency' ? 'test frequency' : 'test-signal level'} must be above zero, got ${v} ${this.unit}` });
		if (this.value === undefined) return void ((this.value = v), (this.row = row));
		if (Math.abs(v - this.value) > 1e-6 * this.value)
			issues.push({
				row,
				column: col.name,
				message: `${v} ${this.unit} here but ${this.value} ${this.unit} at row ${this.row}; one ${col.role === 'frequency' ? 'test frequency' : 'test-signal level'} per file`
			});
	}
}

/** Every data row read into raw points (capacitance in Y); rows with a problem are reported. */
function readRows(table: SweepTable, cols: CvColumns, options: SweepOptions, issues: DataIssue[], seen: TemperatureReading) {
	const maxIssues = options.maxIssues ?? 50;
	const n = table.data.length;
	const raw: RawPoints = { V: new Float64Array(n), Y: new Float64Array(n), T: new Float64Array(n), rowOf: new Int32Array(n), count: 0 };
	const read = cellReader(table, issues);
	const freq = new Setting(cols.f, 'Hz');
	const level = new Setting(cols.level, 'V');
	for (let r = table.hasHeader ? table.first + 1 : table.first; r < n && issues.length < maxIssues; r++) {
		const cells = table.data[r];
		if (isBlankRow(cells, cols.v.index)) continue;
		const row = r + 1;
		const wide = rowWidthIssue(table, cells, row);
		if (wide) {
			issues.push(wide);
			continue;
		}
		const v = read(cells[cols.v.index], cols.v, row);
		const c = read(cells[cols.c.index], cols.c, row);
		const t = cols.t ? readTemperatureCell(read, cells[cols.t.index], cols.t, row, issues, seen) : (options.temperatureC ?? NaN);
		for (const s of [freq, level]) {
			if (!s.col) continue;
			const x = read(cells[s.col.index], s.col, row);
			if (Number.isFinite(x)) s.check(x, row, issues);
		}
		if (Number.isFinite(c) && !(c > 0))
			issues.push({ row, column: cols.c.name, message: `capacitance ${c} F is not above zero; check the open-circuit correction and the lead order` });
		if (!Number.isFinite(v) || !(c > 0) || !Number.isFinite(t)) continue;
		raw.V[raw.count] = v;
		raw.Y[raw.count] = c;
		raw.T[raw.count] = t;
		raw.rowOf[raw.count] = row;
		raw.count++;
	}
	return { raw, frequencyHz: freq.value, testLevelV: level.value };
}

/** Reverse-voltage columns holding magnitudes: negate them so reverse bias is negative. */
function signReverseColumn(raw: RawPoints, v: Column<Role>, warnings: DataIssue[]) {
	if (!isReverseName(splitHeader(v.name).base.toLowerCase())) return;
	for (let k = 0; k < raw.count; k++) if (raw.V[k] < 0) return;
	for (let k = 0; k < raw.count; k++) raw.V[k] = raw.V[k] === 0 ? 0 : -raw.V[k];
	warnings.push({ column: v.name, message: 'read as reverse-bias magnitudes: the voltages were negated (reverse bias is negative here)' });
}

/**
 * Read a C–V sweep from CSV text. See the file header for the accepted forms.
 * @throws SweepError listing every problem (row numbers 1-based, header = row 1).
 */
export function parseCapacitanceCsv(text: string, options: SweepOptions = {}): ParsedCapacitanceSweep {
	const binWidth = mergeBinWidth(options);
	const { table, cols, rows, warnings } = readSweepRows(
		text,
		placeholder,
		(t, w) => cvColumns(t, options, w),
		(t, c, issues, seen) => readRows(t, c, options, issues, seen)
	);
	const { raw, frequencyHz, testLevelV } = rows;
	const issues: DataIssue[] = [];
	if (raw.count === 0) throw new SweepError([{ row: table.first + 1, message: 'the file has a header but no data rows' }]);
	if (raw.count < 3) throw new SweepError([{ message: `only ${raw.count} data point${raw.count === 1 ? '' : 's'}; a sweep needs at least 3` }]);
	signReverseColumn(raw, cols.v, warnings);
	const q = { noun: 'capacitance', unit: 'F', column: cols.c.name, voltageColumn: cols.v.name };
	const { merged, rejected } = mergeByTemperature(raw, binWidth, q, issues, warnings);
	if (issues.length) throw new SweepError(issues);
	const runs: CapacitanceRun[] = merged.map((m) => ({ temperatureC: m.temperatureC, voltageV: m.voltageV, capacitanceF: m.value, count: m.count, points: m.points }));
	return {
		runs,
		rows: raw.count,
		rejected,
		warnings,
		columns: { voltage: cols.v.name, capacitance: cols.c.name, temperature: cols.t?.name, frequency: cols.f?.name, level: cols.level?.name },
		...(frequencyHz !== undefined ? { frequencyHz } : {}),
		...(testLevelV !== undefined ? { testLevelV } : {})
	};
}
