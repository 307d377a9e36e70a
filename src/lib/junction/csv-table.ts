/**
 * The shared first steps of reading a bench sweep from CSV text, for I–V and C–V files alike:
 * the text checked (empty, too large, binary), split into rows (`,` `;` tab or `|`, a UTF-8 BOM;
 * decimal commas when the separator is not a comma), the header found and its columns given a
 * role and a unit (`V (mV)`, `I [nA]`, `C/pF`, `current_uA`), each cell read as a number in SI
 * units with the problems collected, each naming its 1-based file row (header = row 1) and its
 * column as the header spells it.
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

/** Multipliers to SI of the unit symbols a header or a cell may carry, keyed lower-case. */
export type UnitTable = Record<string, number>;

export const VOLTAGE_UNITS: UnitTable = { v: 1, mv: 1e-3, uv: 1e-6, µv: 1e-6, μv: 1e-6, kv: 1e3 };
export const CURRENT_UNITS: UnitTable = { a: 1, ma: 1e-3, ua: 1e-6, µa: 1e-6, μa: 1e-6, na: 1e-9, pa: 1e-12, fa: 1e-15 };
export const CAPACITANCE_UNITS: UnitTable = { f: 1, uf: 1e-6, µf: 1e-6, μf: 1e-6, nf: 1e-9, pf: 1e-12, ff: 1e-15 };
export const FREQUENCY_UNITS: UnitTable = { hz: 1, khz: 1e3, mhz: 1e6 };

/** Reads a temperature unit: °C or K, or undefined when it is neither. */
function temperatureScale(u: string): 'C' | 'K' | undefined {
	if (/^(°?c|degc|celsius|℃)$/.test(u)) return 'C';
	if (/^(k|kelvin)$/.test(u)) return 'K';
	return undefined;
}

const SUFFIX_UNITS = [VOLTAGE_UNITS, CURRENT_UNITS, CAPACITANCE_UNITS, FREQUENCY_UNITS];

/** A header cell split into its name and its unit: `V (mV)`, `I [nA]`, `C/pF`, `current_uA`. */
export function splitHeader(raw: string): { base: string; unit?: string } {
	const h = raw.trim();
	let m = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/.exec(h);
	if (m) return { base: m[1].trim(), unit: m[2].trim() };
	m = /^(.*?)\s*\/\s*(\S+)$/.exec(h);
	if (m) return { base: m[1].trim(), unit: m[2].trim() };
	m = /^(.*?)[_\s]+([a-zµμ°]{1,4})$/i.exec(h);
	if (m) {
		const u = m[2].toLowerCase();
		if (SUFFIX_UNITS.some((t) => t[u] !== undefined) || /^(°?c|k|degc)$/i.test(m[2])) return { base: m[1].trim(), unit: m[2].trim() };
	}
	return { base: h };
}

/** The rows of a sweep file and where its data begin. */
export interface SweepTable {
	data: string[][];
	delimiter: string;
	/** Decimal commas are read in cells when the separator is not a comma. */
	decimalComma: boolean;
	/** Index of the first non-blank row (the header, when there is one). */
	first: number;
	hasHeader: boolean;
	/** The header's cells, or placeholder names for a file without one. */
	headerCells: string[];
}

function isNumericText(s: string): boolean {
	return /^\s*[+\-\u2212]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?\s*[a-zA-Zµμ°]*\s*$/.test(s);
}

/**
 * Checks the text and splits it into rows; finds the first non-blank row and whether it is a
 * header (any cell that is not a number). `placeholders` names the columns of a file without one.
 * @throws SweepError for an empty or binary file; SweepTooLargeError above MAX_SWEEP_BYTES.
 */
export function readSweepTable(text: string, placeholders: (index: number) => string): SweepTable {
	if (typeof text !== 'string' || text.replace(/^\uFEFF/, '').trim() === '') throw new SweepError([{ message: 'the file is empty' }]);
	// A UTF-8 file has at least as many bytes as the string has UTF-16 units minus surrogates; good enough as a guard.
	if (text.length > MAX_SWEEP_BYTES) checkSweepSize(text.length);
	const body = text.replace(/^\uFEFF/, '');
	// Binary files: NUL bytes, replacement characters or many control characters in the first kilobytes.
	const probe = body.slice(0, 8192);
	const controls = (probe.match(/[\u0000-\u0008\u000E-\u001F\uFFFD]/g) ?? []).length;
	if (probe.includes('\u0000') || controls > Math.max(2, probe.length * 0.01))
		throw new SweepError([{ message: 'the file looks binary, not CSV text; export the sweep as comma- or semicolon-separated text' }]);
	const parsed = Papa.parse<string[]>(body, { header: false, skipEmptyLines: false, delimitersToGuess: [',', ';', '\t', '|'] });
	const delimiter = parsed.meta.delimiter;
	const data = parsed.data;
	let first = 0;
	while (first < data.length && data[first].every((c) => c.trim() === '')) first++;
	if (first >= data.length) throw new SweepError([{ message: 'the file is empty' }]);
	const firstRow = data[first];
	const hasHeader = firstRow.some((c) => c.trim() !== '' && !isNumericText(c));
	const headerCells = hasHeader ? firstRow.map((c) => c.trim()) : firstRow.map((_, i) => placeholders(i));
	return { data, delimiter, decimalComma: delimiter !== ',', first, hasHeader, headerCells };
}

/** How a file's columns are recognised: a role, the names it goes by, and the units it may carry. */
export interface RoleSpec<R extends string> {
	role: R;
	/** Whether a header name (without its unit) and its unit (lower-case, if any) mean this role. */
	matches: (base: string, unit?: string) => boolean;
	/** Units allowed in its header and cells; 'temperature' reads °C or K. */
	units?: UnitTable | 'temperature';
	/** How the refusal of an unknown header unit ends, e.g. "use V, mV or µV". */
	unitHint?: string;
	/** Words for a second column of this role ("voltage"). */
	noun: string;
}

export interface Column<R extends string = string> {
	index: number;
	name: string;
	role: R;
	/** Multiplier to SI for the header's unit (1 without one). */
	scale: number;
	/** Units a cell may carry (none for columns read as plain numbers). */
	units?: UnitTable;
	tempScale?: 'C' | 'K';
	unitGiven: boolean;
}

/**
 * Gives each header cell the first role that claims it (a file without a header: the
 * placeholder roles by position), refusing a second column of one role and an unknown unit.
 * Problems go to `issues`, each on the header row with the column's name.
 */
export function findColumns<R extends string>(table: SweepTable, specs: RoleSpec<R>[], positional: (index: number) => R | undefined, issues: DataIssue[]): Map<R, Column<R>> {
	const columns = new Map<R, Column<R>>();
	const row = table.first + 1;
	table.headerCells.forEach((raw, index) => {
		const { base, unit } = splitHeader(raw);
		const spec = table.hasHeader ? specs.find((s) => s.matches(base.toLowerCase(), unit?.toLowerCase().replace(/\s+/g, ''))) : specs.find((s) => s.role === positional(index));
		if (!spec) return;
		if (columns.has(spec.role)) {
			issues.push({ row, column: raw, message: `a second ${spec.noun} column; keep only one` });
			return;
		}
		const col: Column<R> = { index, name: raw, role: spec.role, scale: 1, unitGiven: unit !== undefined };
		if (spec.units && spec.units !== 'temperature') col.units = spec.units;
		if (unit !== undefined) {
			const u = unit.toLowerCase().replace(/\s+/g, '');
			if (spec.units === 'temperature') {
				col.tempScale = temperatureScale(u);
				if (!col.tempScale) issues.push({ row, column: raw, message: `unknown temperature unit '${unit}'; use °C or K` });
			} else if (spec.units) {
				if (spec.units[u] === undefined) issues.push({ row, column: raw, message: `unknown ${spec.noun} unit '${unit}'; ${spec.unitHint}` });
				else col.scale = spec.units[u];
			}
		}
		columns.set(spec.role, col);
	});
	return columns;
}

const CELL_RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([a-zA-Zµμ°]*)$/;

/** Reads one cell of a column in SI units; NaN (with an issue) when it cannot. */
export type CellReader = (cell: string | undefined, col: Column, row: number) => number;

/**
 * A cell reader for one file: plain numbers, decimal commas where the separator allows them,
 * a unit in the cell (it must agree with the header's and with the column's other cells).
 */
export function cellReader(table: SweepTable, issues: DataIssue[]): CellReader {
	const cellUnits = new Map<string, { unit: string; row: number }>();
	return (cell, col, row) => {
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
		if (table.decimalComma) s = s.replace(',', '.');
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
		const units = col.units;
		if (!units || units[u] === undefined) {
			issues.push({ row, column: col.name, message: `unknown unit '${unit}' in '${cell}'` });
			return NaN;
		}
		if (col.unitGiven && units[u] !== col.scale) {
			issues.push({ row, column: col.name, message: `cell unit '${unit}' conflicts with the header unit` });
			return NaN;
		}
		const seen = cellUnits.get(col.role);
		if (seen && seen.unit !== u) {
			issues.push({ row, column: col.name, message: `mixed units in one column ('${seen.unit}' at row ${seen.row}, '${unit}' here)` });
			return NaN;
		}
		if (!seen) cellUnits.set(col.role, { unit: u, row });
		return v * units[u];
	};
}

/** True for a row with nothing in it (blank lines between blocks are skipped). */
export function isBlankRow(cells: string[], firstColumn: number): boolean {
	if (cells.length === 1 && cells[0].trim() === '') return true;
	const raw = cells[firstColumn];
	return (raw === undefined || raw.trim() === '') && cells.every((c) => c.trim() === '');
}

/**
 * The problem with a row holding more (non-empty) cells than the header, or null. Such a row
 * cannot be assigned to columns: most often a decimal comma in a comma-separated file
 * ("0,45,1e-9" is not V = 0, I = 45). Trailing empty cells are harmless.
 */
export function rowWidthIssue(table: SweepTable, cells: string[], row: number): DataIssue | null {
	const width = table.headerCells.length;
	if (cells.length <= width) return null;
	let used = cells.length;
	while (used > width && cells[used - 1].trim() === '') used--;
	if (used <= width) return null;
	const hint = table.delimiter === ',' ? '; a decimal comma in a comma-separated file? Use decimal points, or separate columns with semicolons' : '';
	return {
		row,
		message: `${used} cells where ${width} were expected (${table.hasHeader ? 'header' : 'first row'}: ${table.headerCells.join(', ')})${hint}`
	};
}

/** What the temperature cells of a file showed: whether a unit-less value was taken for kelvin. */
export type TemperatureReading = { guessedKelvin: boolean };

/**
 * A temperature cell in °C: a column in kelvin converted (0 °C = 273.15 K, BIPM SI Brochure,
 * 9th ed., §2.3.1); without a unit, values of 200 or more are read as kelvin (noted in
 * `seen`). Implausible values for the stated unit are refused. NaN (with an issue) when it
 * cannot be read.
 */
export function readTemperatureCell(read: CellReader, cell: string | undefined, col: Column, row: number, issues: DataIssue[], seen: TemperatureReading): number {
	const raw = read(cell, col, row);
	if (!Number.isFinite(raw)) return NaN;
	const scale = col.tempScale ?? (raw >= 200 ? 'K' : 'C');
	if (!col.tempScale && scale === 'K') seen.guessedKelvin = true;
	if (col.tempScale === 'C' && raw >= 200) issues.push({ row, column: col.name, message: `${raw} °C is implausible; is this column in kelvin?` });
	else if (col.tempScale === 'K' && raw < 150) issues.push({ row, column: col.name, message: `${raw} K is implausible; is this column in °C?` });
	const t = scale === 'K' ? raw - ZERO_CELSIUS_K : raw;
	if (!(t > -273.15)) issues.push({ row, column: col.name, message: `temperature ${raw} is below absolute zero` });
	return t;
}

/** The warning for a unit-less temperature column whose values were read as kelvin, or null. */
export function kelvinGuessWarning(col: Column | undefined, seen: TemperatureReading): DataIssue | null {
	if (!col || !seen.guessedKelvin) return null;
	return { column: col.name, message: 'temperature column has no unit; values of 200 or more were read as kelvin' };
}

/** Role names shared by I–V and C–V files. */
export const isTemperatureName = (b: string) => /^(t|tj|ta|temp|temperature)$/.test(b) || /temp/.test(b);

/**
 * The front both sweep readers share: the table, its columns by role, every data row read,
 * and a warning when temperatures looked like kelvin. Every problem found by then is thrown
 * together, so a file is refused once with all of its faults.
 * @throws SweepError listing every problem.
 */
export function readSweepRows<C extends { t?: Column }, R>(
	text: string,
	placeholders: (index: number) => string,
	columnsOf: (table: SweepTable, warnings: DataIssue[]) => C,
	rowsOf: (table: SweepTable, cols: C, issues: DataIssue[], seen: TemperatureReading) => R
): { table: SweepTable; cols: C; rows: R; warnings: DataIssue[] } {
	const table = readSweepTable(text, placeholders);
	const warnings: DataIssue[] = [];
	const cols = columnsOf(table, warnings);
	const issues: DataIssue[] = [];
	const seen: TemperatureReading = { guessedKelvin: false };
	const rows = rowsOf(table, cols, issues, seen);
	const guess = kelvinGuessWarning(cols.t, seen);
	if (guess) warnings.push(guess);
	if (issues.length) throw new SweepError(issues);
	return { table, cols, rows, warnings };
}
