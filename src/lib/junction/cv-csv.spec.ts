import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseCapacitanceCsv, sweepKindOf } from './cv-csv';
import { SweepError } from './errors';
import { expectRelClose } from './test-helpers';

const GOOD = 'V (V),C (pF)\n-5,2.1\n-3,2.5\n-1,3.3\n0,4.0\n0.3,4.6\n';

function issuesOf(text: string, opts: { temperatureC?: number } = { temperatureC: 25 }) {
	let caught: unknown;
	try {
		parseCapacitanceCsv(text, opts);
	} catch (e) {
		caught = e;
	}
	expect(caught).toBeInstanceOf(SweepError);
	return (caught as SweepError).issues;
}

describe('C–V CSV: accepted forms', () => {
	it.each([
		['C (F)', 1],
		['C (uF)', 1e-6],
		['Cp [nF]', 1e-9],
		['C/pF', 1e-12],
		['cap_fF', 1e-15],
		['Capacitance (µF)', 1e-6]
	])('capacitance unit header %s', (h, scale) => {
		const s = parseCapacitanceCsv(`V,${h}\n-2,1\n-1,2\n0,3\n`, { temperatureC: 25 });
		expectRelClose(s.runs[0].capacitanceF[0], scale, 1e-15);
		expect(s.columns.capacitance).toBe(h);
	});

	it('reads semicolons with decimal commas, a temperature column and a BOM', () => {
		const s = parseCapacitanceCsv('\uFEFFBias (mV);Cs (pF);Temp (°C)\r\n-5000;2,15;25\r\n-1000;3,3;25\r\n0;4,05;25\r\n');
		expect(Array.from(s.runs[0].voltageV)).toEqual([-5, -1, 0]);
		expectRelClose(s.runs[0].capacitanceF[0], 2.15e-12, 1e-14);
		expect(s.runs[0].temperatureC).toBe(25);
	});

	it('records one test frequency and level from their columns', () => {
		const s = parseCapacitanceCsv('V,C (pF),Freq (kHz),Level (mV)\n-2,1,100,30\n-1,2,100,30\n0,3,100,30\n', { temperatureC: 25 });
		expect(s.frequencyHz).toBe(1e5);
		expectRelClose(s.testLevelV as number, 0.03, 1e-15);
		expect(s.columns).toMatchObject({ frequency: 'Freq (kHz)', level: 'Level (mV)' });
	});

	it('takes an "AC voltage" column for the test level, not a second bias column', () => {
		const s = parseCapacitanceCsv('Voltage (V),AC voltage (mV),C (pF)\n-2,50,1\n-1,50,2\n0,50,3\n', { temperatureC: 25 });
		expect(s.columns.voltage).toBe('Voltage (V)');
		expect(s.columns.level).toBe('AC voltage (mV)');
	});

	it('negates a reverse-voltage column of magnitudes, and says so', () => {
		const s = parseCapacitanceCsv('VR (V),C (pF)\n0,4\n1,3.3\n5,2.1\n', { temperatureC: 25 });
		expect(Array.from(s.runs[0].voltageV)).toEqual([-5, -1, 0]);
		expect(s.warnings.some((w) => w.column === 'VR (V)' && /negated/.test(w.message))).toBe(true);
	});

	it('merges repeated readings at one voltage by averaging', () => {
		const s = parseCapacitanceCsv('V,C (pF)\n-2,2.00\n-2,2.02\n-1,3\n0,4\n0,4.04\n', { temperatureC: 25 });
		expect(Array.from(s.runs[0].count)).toEqual([2, 1, 2]);
		expectRelClose(s.runs[0].capacitanceF[0], 2.01e-12, 1e-12);
	});

	it('reads a file without a header as volts and farads, with a warning', () => {
		const s = parseCapacitanceCsv('-2,1e-12\n-1,2e-12\n0,3e-12\n', { temperatureC: 25 });
		expect(s.runs[0].voltageV.length).toBe(3);
		expect(s.warnings[0].message).toMatch(/farads/);
	});
});

describe('telling C–V from I–V files by their header', () => {
	it.each([
		['V (V),C (pF)\n-1,2\n', 'cv'],
		['Bias;Cp [nF];Freq (kHz)\n-1;2;1\n', 'cv'],
		['V (V),Value (pF)\n-1,2\n', 'cv'],
		['V (V),I (A)\n0.5,1e-6\n', 'iv'],
		['voltage_V,current_uA\n0.5,1\n', 'iv'],
		['V (V),Y (nA)\n0.5,1\n', 'iv'],
		['0.5,1e-6\n0.6,1e-5\n', null],
		['Alpha,Beta\n1,2\n', null],
		['', null]
	])('%j → %s', (text, kind) => expect(sweepKindOf(text)).toBe(kind));
});

// Each malformed C–V file with the issue it must produce: [name, text, row, column, message pattern].
const MALFORMED: [string, string, number | undefined, string | undefined, RegExp][] = [
	['empty file', '', undefined, undefined, /empty/],
	['header only', 'V (V),C (pF)\n', 1, undefined, /no data rows/],
	['two points', 'V,C (pF)\n-1,2\n0,3\n', undefined, undefined, /only 2 data points/],
	['binary junk', '\u0000\u0001\u0002PNG\u0003\u0004\u0005', undefined, undefined, /binary/],
	['no capacitance column', 'V,Time\n-1,2\n0,3\n1,4\n', 1, undefined, /no capacitance column/],
	['no voltage column', 'Time,C (pF)\n1,2\n2,3\n3,4\n', 1, undefined, /no voltage column/],
	['two capacitance columns', 'V,C (pF),Cp (pF)\n-1,2,2\n0,3,3\n1,4,4\n', 1, 'Cp (pF)', /second capacitance column/],
	['unknown capacitance unit', 'V,C (pH)\n-1,2\n0,3\n1,4\n', 1, 'C (pH)', /unknown capacitance unit 'pH'/],
	['unknown voltage unit', 'V (kA),C (pF)\n-1,2\n0,3\n1,4\n', 1, 'V (kA)', /unknown voltage unit/],
	['unknown frequency unit', 'V,C (pF),Freq (rpm)\n-1,2,1\n0,3,1\n1,4,1\n', 1, 'Freq (rpm)', /unknown frequency unit/],
	['unknown level unit', 'V,C (pF),Level (dB)\n-1,2,1\n0,3,1\n1,4,1\n', 1, 'Level (dB)', /unknown test-signal level unit/],
	['text in a capacitance', GOOD + '0.4,lots\n', 7, 'C (pF)', /expected a number, got 'lots'/],
	['text in a voltage', GOOD + 'zero,4.9\n', 7, 'V (V)', /expected a number/],
	['NaN capacitance', GOOD + '0.4,NaN\n', 7, 'C (pF)', /not a finite number/],
	['missing capacitance', GOOD + '0.4,\n', 7, 'C (pF)', /missing value/],
	['negative capacitance', 'V,C (pF)\n-5,2.1\n-3,-0.4\n0,4\n', 3, 'C (pF)', /not above zero/],
	['zero capacitance', 'V,C (pF)\n-5,2.1\n-3,0\n0,4\n', 3, 'C (pF)', /not above zero/],
	['cell unit against the header unit', 'V,C (pF)\n-5,2.1\n-3,2.5 nF\n0,4\n', 3, 'C (pF)', /conflicts with the header unit/],
	['mixed units in a column', 'V,C\n-5,2.1 pF\n-3,0.0025 nF\n0,4 pF\n', 3, 'C', /mixed units/],
	['a current unit in a capacitance cell', 'V,C\n-5,2.1 pA\n-3,2.5\n0,4\n', 2, 'C', /unknown unit 'pA'/],
	['decimal comma in a comma-separated file', GOOD + '0,45,4.9\n', 7, undefined, /^3 cells where 2 were expected \(header: V \(V\), C \(pF\)\); a decimal comma/],
	['two test frequencies', 'V,C (pF),Freq (kHz)\n-5,2.1,1\n-3,2.5,1\n0,4,100\n', 4, 'Freq (kHz)', /one test frequency per file/],
	['negative frequency', 'V,C (pF),f (Hz)\n-5,2.1,-1000\n-3,2.5,-1000\n0,4,-1000\n', 2, 'f (Hz)', /must be above zero/],
	['test level changes', 'V,C (pF),Osc (mV)\n-5,2.1,30\n-3,2.5,30\n0,4,50\n', 4, 'Osc (mV)', /one test-signal level per file/],
	['conflicting repeats', 'V,C (pF)\n-5,2.1\n-3,2.5\n-3,7.5\n0,4\n', 4, 'C (pF)', /same voltage .* conflicting capacitance/],
	['Celsius column holding kelvin', 'V,C (pF),Temp (°C)\n-5,2.1,298\n-3,2.5,298\n0,4,298\n', 2, 'Temp (°C)', /kelvin/]
];

describe('C–V CSV: malformed files', () => {
	it.each(MALFORMED)('%s', (_name, text, row, column, pattern) => {
		const issues = issuesOf(text);
		const hit = issues.find((i) => pattern.test(i.message));
		expect(hit, JSON.stringify(issues)).toBeDefined();
		expect(hit?.row).toBe(row);
		expect(hit?.column).toBe(column);
	});

	it('reports every bad cell at once', () => {
		expect(issuesOf('V,C (pF)\n-5,x\n-3,-1\n0,y\n1,5\n').map((i) => i.row)).toEqual([2, 3, 4]);
	});

	it('needs a temperature when the file has none', () => {
		expect(issuesOf(GOOD, {})[0].message).toMatch(/no temperature column/);
	});
});

describe('C–V CSV: any text', () => {
	it('gives a sweep or a SweepError naming what is wrong, never another exception', () => {
		const line = fc.oneof(fc.string(), fc.tuple(fc.double(), fc.double()).map(([v, c]) => `${v},${c}`), fc.constantFrom('V (V),C (pF)', 'VR;Cp [nF];Freq (kHz)', '-1,2', '0;3,5;1', ',,'));
		fc.assert(
			fc.property(fc.array(line, { maxLength: 25 }), (lines) => {
				try {
					const s = parseCapacitanceCsv(lines.join('\n'), { temperatureC: 25 });
					for (const r of s.runs) for (const c of r.capacitanceF) expect(c).toBeGreaterThan(0);
				} catch (e) {
					expect(e).toBeInstanceOf(SweepError);
					expect((e as SweepError).issues.length).toBeGreaterThan(0);
				}
			}),
			{ numRuns: 300, seed: 15 }
		);
	});
});
