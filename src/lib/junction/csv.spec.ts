import { describe, expect, it } from 'vitest';
import { parseSweepCsv, checkSweepSize, MAX_SWEEP_BYTES } from './csv';
import { SweepError, SweepTooLargeError } from './errors';
import { expectRelClose } from './test-helpers';

const GOOD = 'V (V),I (A)\n0.3,1e-9\n0.4,5e-8\n0.5,2e-6\n0.6,9e-5\n';

function issuesOf(text: string, opts = { temperatureC: 25 }) {
	try {
		parseSweepCsv(text, opts);
	} catch (e) {
		expect(e).toBeInstanceOf(SweepError);
		return (e as SweepError).issues;
	}
	throw new Error('expected a SweepError');
}

describe('sweep CSV: accepted forms', () => {
	it('reads units from headers and converts to volts and amperes', () => {
		const s = parseSweepCsv('Voltage [mV],Current (nA)\n300,1\n400,50\n500,2000\n', { temperatureC: 25 });
		expect(s.runs).toHaveLength(1);
		expectRelClose(s.runs[0].voltageV[1], 0.4, 1e-15);
		expectRelClose(s.runs[0].currentA[1], 5e-8, 1e-15);
		expect(s.columns.voltage).toBe('Voltage [mV]');
	});

	it.each([
		['I (µA)', 1e-6],
		['I (uA)', 1e-6],
		['I/pA', 1e-12],
		['current_fA', 1e-15],
		['I (mA)', 1e-3],
		['I [A]', 1]
	])('current unit header %s', (h, scale) => {
		const s = parseSweepCsv(`V,${h}\n0.3,1\n0.4,2\n0.5,3\n`, { temperatureC: 25 });
		expectRelClose(s.runs[0].currentA[0], scale, 1e-15);
	});

	it('handles a BOM, semicolons with decimal commas and CRLF line ends', () => {
		const s = parseSweepCsv('\uFEFFV (V);I (A);Temp (°C)\r\n0,3;1,5e-9;25\r\n0,4;5e-8;25\r\n0,5;2e-6;25\r\n');
		expectRelClose(s.runs[0].voltageV[0], 0.3, 1e-15);
		expectRelClose(s.runs[0].currentA[0], 1.5e-9, 1e-15);
		expect(s.runs[0].temperatureC).toBe(25);
	});

	it('merges repeated traces and ranges by averaging, rejecting and counting outliers', () => {
		const rows = ['V,I,Trace,Range'];
		for (let t = 0; t < 5; t++) for (const [v, i] of [[0.3, 1e-9], [0.4, 5e-8], [0.5, 2e-6]]) rows.push(`${v + t * 1e-5},${i * (1 + 0.01 * t)},${t},1`);
		rows.push('0.40002,5e-6,9,1'); // 100× off: rejected
		const s = parseSweepCsv(rows.join('\n'), { temperatureC: 25 });
		expect(s.runs[0].voltageV.length).toBe(3);
		expect(s.rejected).toBe(1);
		expect(s.warnings.some((w) => w.row === 17 && /outlier/.test(w.message))).toBe(true);
		expectRelClose(s.runs[0].currentA[1], 5e-8 * 1.02, 1e-12);
		expect(Array.from(s.runs[0].count)).toEqual([5, 5, 5]);
		expect(s.columns.trace).toBe('Trace');
		expect(s.columns.range).toBe('Range');
	});

	it('splits runs by temperature and reads kelvin columns', () => {
		const s = parseSweepCsv('V,I,T (K)\n0.3,1e-9,298.15\n0.4,5e-8,298.15\n0.5,2e-6,298.15\n0.3,1e-8,358.15\n0.4,4e-7,358.15\n0.5,1e-5,358.15\n');
		expect(s.runs.map((r) => Math.round(r.temperatureC))).toEqual([25, 85]);
	});

	it('ignores empty cells after the last column (a trailing separator)', () => {
		const s = parseSweepCsv('V,I\n0.3,1e-9,\n0.4,5e-8,,\n0.5,2e-6\n', { temperatureC: 25 });
		expect(Array.from(s.runs[0].voltageV)).toEqual([0.3, 0.4, 0.5]);
	});

	it('reads files without a header as volts and amperes, with a warning', () => {
		const s = parseSweepCsv('0.3,1e-9\n0.4,5e-8\n0.5,2e-6\n', { temperatureC: 25 });
		expect(s.runs[0].voltageV.length).toBe(3);
		expect(s.warnings[0].message).toMatch(/no header/);
	});

	it('has a size limit the server can map to 413', () => {
		expect(() => checkSweepSize(MAX_SWEEP_BYTES + 1)).toThrow(SweepTooLargeError);
		expect(() => checkSweepSize(100)).not.toThrow();
		expect(() => checkSweepSize(MAX_SWEEP_BYTES + 1)).toThrow(expect.objectContaining({ status: 413 }));
	});

	it('warns that a unit-less temperature column was read as kelvin only when it was', () => {
		const kelvin = parseSweepCsv('V,I,Temp\n0.3,1e-9,298.15\n0.4,5e-8,298.15\n0.5,2e-6,298.15\n');
		expect(kelvin.runs[0].temperatureC).toBeCloseTo(25, 9);
		expect(kelvin.warnings.some((w) => /read as kelvin/.test(w.message))).toBe(true);
		const celsius = parseSweepCsv('V,I,Temp\n0.3,1e-9,25\n0.4,5e-8,25\n0.5,2e-6,25\n');
		expect(celsius.runs[0].temperatureC).toBe(25);
		expect(celsius.warnings.some((w) => /read as kelvin/.test(w.message))).toBe(false);
	});
});

// Each malformed file with the issue it must produce: [name, text, row, column, message pattern].
const MALFORMED: [string, string, number | undefined, string | undefined, RegExp][] = [
	['empty file', '', undefined, undefined, /empty/],
	['whitespace only', '  \n \n', undefined, undefined, /empty/],
	['BOM only', '\uFEFF', undefined, undefined, /empty/],
	['header only', 'V,I\n', 1, undefined, /no data rows/],
	['one point', 'V,I\n0.5,1e-6\n', undefined, undefined, /only 1 data point/],
	['two points', 'V,I\n0.5,1e-6\n0.6,1e-5\n', undefined, undefined, /only 2 data points/],
	['text in a number', GOOD + '0.7,abc\n', 6, 'I (A)', /expected a number, got 'abc'/],
	['NaN', GOOD + '0.7,NaN\n', 6, 'I (A)', /not a finite number/],
	['Infinity', GOOD + 'inf,1e-3\n', 6, 'V (V)', /not a finite number/],
	['missing value', GOOD + '0.7,\n', 6, 'I (A)', /missing value/],
	['missing column in a row', GOOD + '0.7\n', 6, 'I (A)', /missing value/],
	['binary junk', '\u0000\u0001\u0002PNG\u0003\u0004\u0005\u0006', undefined, undefined, /binary/],
	['no voltage column', 'Time,I\n1,2\n2,3\n3,4\n', 1, undefined, /no voltage column/],
	['no current column', 'V,Time\n1,2\n2,3\n3,4\n', 1, undefined, /no current column/],
	['two voltage columns', 'V,Voltage,I\n1,1,2\n2,2,3\n3,3,4\n', 1, 'Voltage', /second voltage column/],
	['unknown current unit', 'V,I (furlong)\n0.3,1\n0.4,2\n0.5,3\n', 1, 'I (furlong)', /unknown current unit/],
	['unknown voltage unit', 'V (kA),I\n0.3,1\n0.4,2\n0.5,3\n', 1, 'V (kA)', /unknown voltage unit/],
	['mixed units in a column', 'V,I\n0.3,1 nA\n0.4,2 uA\n0.5,3 uA\n', 3, 'I', /mixed units/],
	['cell unit conflicts with header', 'V,I (nA)\n0.3,1 uA\n0.4,2\n0.5,3\n', 2, 'I (nA)', /conflicts with the header/],
	['all-zero current', 'V,I\n0.3,0\n0.4,0\n0.5,0\n', undefined, 'I', /every current is zero/],
	['conflicting duplicates', 'V,I\n0.3,1e-9\n0.4,5e-8\n0.4,5e-6\n0.5,2e-6\n', 4, 'I', /conflicting current/],
	['duplicates of opposite sign', 'V,I\n0.3,1e-9\n0.4,5e-8\n0.4,-5e-8\n0.5,2e-6\n', 4, 'I', /conflicting current/],
	['Celsius column holding kelvin', 'V,I,Temp (°C)\n0.3,1e-9,298\n0.4,5e-8,298\n0.5,2e-6,298\n', 2, 'Temp (°C)', /kelvin/],
	['kelvin column holding Celsius', 'V,I,T (K)\n0.3,1e-9,25\n0.4,5e-8,25\n0.5,2e-6,25\n', 2, 'T (K)', /°C/],
	['unknown temperature unit', 'V,I,Temp (F)\n0.3,1e-9,77\n0.4,5e-8,77\n0.5,2e-6,77\n', 1, 'Temp (F)', /unknown temperature unit/],
	['text in temperature', 'V,I,Temp\n0.3,1e-9,warm\n0.4,5e-8,25\n0.5,2e-6,25\n', 2, 'Temp', /expected a number/],
	['repeats that disagree', 'V,I\n0.4,1e-9\n0.4,1e-6\n0.4,1e-3\n0.4,1\n0.5,2e-6\n0.6,1e-5\n', 2, 'I', /disagree/],
	['unknown cell unit', 'V,I\n0.3,1 nF\n0.4,2\n0.5,3\n', 2, 'I', /unknown unit/],
	// "0,45,1e-9" must not be read as V = 0, I = 45.
	['decimal comma in a comma-separated file', GOOD + '0,45,1e-9\n', 6, undefined, /^3 cells where 2 were expected \(header: V \(V\), I \(A\)\); a decimal comma/],
	['extra cell in a semicolon-separated file', 'V;I\n0,3;1e-9\n0,4;5e-8;7\n0,5;2e-6\n', 3, undefined, /^3 cells where 2 were expected \(header: V, I\)$/],
	['extra cell in a file without a header', '0.3,1e-9\n0.4,5e-8\n0.5,2e-6,1\n', 3, undefined, /^3 cells where 2 were expected \(first row: V, I\)/],
	['extra cells after an empty one', 'V,I\n0.3,1e-9\n0.4,5e-8,,x\n0.5,2e-6\n', 3, undefined, /^4 cells where 2 were expected/]
];

describe('sweep CSV: malformed files', () => {
	it.each(MALFORMED)('%s', (_name, text, row, column, pattern) => {
		const issues = issuesOf(text);
		const hit = issues.find((i) => pattern.test(i.message));
		expect(hit, JSON.stringify(issues)).toBeDefined();
		expect(hit?.row).toBe(row);
		expect(hit?.column).toBe(column);
	});

	it('reports every bad cell at once, not only the first', () => {
		const issues = issuesOf('V,I\n0.3,x\n0.4,y\nz,1e-6\n0.6,1e-5\n');
		expect(issues.map((i) => i.row)).toEqual([2, 3, 4]);
	});

	it('needs a temperature when the file has none', () => {
		expect(() => parseSweepCsv(GOOD)).toThrow(/no temperature column/);
	});

	it('error carries status 422 and a readable message', () => {
		expect(() => parseSweepCsv('V,I\n0.3,abc\n0.4,1\n0.5,2\n', { temperatureC: 25 })).toThrow(
			expect.objectContaining({ status: 422, message: expect.stringMatching(/row 2 \[I\]/) })
		);
	});
});
