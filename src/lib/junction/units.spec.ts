import { describe, expect, it } from 'vitest';
import {
	formatBias,
	formatSI,
	formatTemperature,
	parseCapacitance,
	parseCurrent,
	parseQuantity,
	parseResistance,
	parseTemperature,
	parseVoltage
} from './units';
import { expectRelClose } from './test-helpers';

describe('parsing quantities as typed', () => {
	// SI prefixes: BIPM SI Brochure, 9th ed., 2019, Table 7.
	it.each([
		['10p', 'current', 1e-11],
		['10 pA', 'current', 1e-11],
		['1e-12', 'current', 1e-12],
		['3 µA', 'current', 3e-6],
		['3 μA', 'current', 3e-6],
		['3uA', 'current', 3e-6],
		['2 fA', 'current', 2e-15],
		['-5 V', 'voltage', -5],
		['\u22125V', 'voltage', -5],
		['612m', 'voltage', 0.612],
		['612 mV', 'voltage', 0.612],
		['0,612 V', 'voltage', 0.612],
		['+0.7', 'voltage', 0.7],
		['1G', 'resistance', 1e9],
		['1 GΩ', 'resistance', 1e9],
		['10 meg', 'resistance', 1e7],
		['10Meg', 'resistance', 1e7],
		['4.7k ohm', 'resistance', 4700],
		['2 MΩ', 'resistance', 2e6],
		['10 pF', 'capacitance', 1e-11],
		['3.3n', 'capacitance', 3.3e-9],
		['0.5 pF', 'capacitance', 5e-13],
		['1 kHz', 'frequency', 1e3],
		['1 MHz', 'frequency', 1e6],
		['100k', 'frequency', 1e5],
		['50 Hz', 'frequency', 50]
	] as const)('%s as %s = %s', (text, kind, expected) => {
		expectRelClose(parseQuantity(text, kind), expected, 1e-15, text);
	});

	// The value of a typed decimal is the double nearest to it (IEEE 754-2019 §5.12.2,
	// correctly rounded conversion): the same as JavaScript's own reading of "10e-15".
	it.each([
		['10f', 'current', '10e-15'],
		['200 mA', 'current', '200e-3'],
		['0.7m', 'voltage', '0.7e-3'],
		['3.3n', 'capacitance', '3.3e-9'],
		['1.5e-3 k', 'resistance', '1.5e0'],
		['4.7 meg', 'resistance', '4.7e6']
	] as const)('%s as %s is exactly the double nearest %s, with no rounding noise', (text, kind, decimal) => {
		expect(parseQuantity(text, kind)).toBe(Number(decimal));
	});

	it('has kind-specific helpers', () => {
		expect(parseVoltage('1.2 V')).toBe(1.2);
		expectRelClose(parseCurrent('5nA'), 5e-9, 1e-15);
		expect(parseResistance('50')).toBe(50);
		expectRelClose(parseCapacitance('1p'), 1e-12, 1e-15);
	});

	it.each([
		['abc', 'voltage', "expected a voltage such as -5 V or 612m, got 'abc'"],
		['', 'current', 'expected a current'],
		['5 V', 'current', 'expected a current'],
		['10 pA', 'voltage', 'expected a voltage'],
		['1..2', 'number', 'expected a number'],
		['5 xV', 'voltage', 'expected a voltage'],
		['1 kV', 'frequency', 'expected a frequency such as 1 kHz or 1 MHz']
	] as const)('rejects %j as %s', (text, kind, msg) => {
		expect(() => parseQuantity(text, kind)).toThrow(msg);
	});

	it.each([
		['85 °C', 85, 'C'],
		['85C', 85, 'C'],
		['85 degC', 85, 'C'],
		['358.15 K', 85, 'K'],
		['\u221240 °C', -40, 'C'],
		['25', 25, 'C?']
	] as const)('temperature %s', (text, celsius, scale) => {
		const t = parseTemperature(text);
		expect(t.celsius).toBeCloseTo(celsius, 10);
		expect(t.kelvin).toBeCloseTo(celsius + 273.15, 10);
		expect(t.scale).toBe(scale);
	});

	it('returns the typed scale exactly, converting only the other one', () => {
		// 25 + 273.15 − 273.15 is 25.000000000000025 in binary floating point; the °C value must not take that path.
		expect(parseTemperature('25').celsius).toBe(25);
		expect(parseTemperature('25 °C').celsius).toBe(25);
		expect(parseTemperature('-40 °C').celsius).toBe(-40);
		expect(parseTemperature('0.1 °C').celsius).toBe(0.1);
		expect(parseTemperature('300 K').kelvin).toBe(300);
		// T = t + 273.15 by definition of the Celsius scale (BIPM SI Brochure, 9th ed., 2019, §2.3.1).
		expect(parseTemperature('25').kelvin).toBe(25 + 273.15);
		expect(parseTemperature('300 K').celsius).toBe(300 - 273.15);
	});

	it('rejects impossible temperatures with an explanation', () => {
		expect(() => parseTemperature('hot')).toThrow('expected a temperature such as 85 °C or 358.15 K');
		expect(() => parseTemperature('-300 C')).toThrow('absolute zero');
		expect(() => parseTemperature('85 F')).toThrow('expected a temperature');
	});
});

describe('formatting', () => {
	it.each([
		[3.2e-15, 'A', '3.2 fA'],
		[0.612, 'V', '612 mV'],
		[-0.612, 'V', '\u2212612 mV'],
		[1.5e-12, 'A', '1.5 pA'],
		[0.99996, 'V', '1 V'],
		[2.2e6, 'Ω', '2.2 MΩ'],
		[0, 'A', '0 A'],
		[1.234567e-9, 'A', '1.23 nA'],
		// Below the smallest prefix (yocto, 1e-24): exponent form, not '0 yA'.
		[1e-24, 'A', '1 yA'],
		[3.2e-27, 'A', '3.2e\u221227 A'],
		[-4.56e-30, 'A', '\u22124.56e\u221230 A'],
		[5e-325 + 5e-324, 'A', '4.94e\u2212324 A'],
		[9.9949e-25, 'A', '9.99e\u221225 A'],
		[9.9999e-25, 'A', '1 yA']
	] as const)('formatSI(%s, %s) = %s', (v, u, s) => {
		expect(formatSI(v, u)).toBe(s);
	});

	it('keeps zeros when asked and fixes bias decimals', () => {
		expect(formatSI(3.2e-15, 'A', { trimZeros: false })).toBe('3.20 fA');
		expect(formatSI(3e-27, 'A', { trimZeros: false })).toBe('3.00e\u221227 A');
		expect(formatSI(3e-27, '')).toBe('3e\u221227');
		expect(formatBias(-5)).toBe('\u22125.000 V');
		expect(formatBias(0.6123)).toBe('0.612 V');
		expect(formatBias(-0.0001)).toBe('0.000 V');
		expect(formatTemperature(85)).toBe('85 °C');
		expect(() => formatSI(NaN, 'A')).toThrow(RangeError);
	});

	it('round-trips formatted values through the parser within the shown precision', () => {
		for (const v of [3.21e-15, 4.56e-9, 0.612, 12.3, 4.7e3, 3.21e-27, -4.56e-30]) {
			expectRelClose(parseQuantity(formatSI(v, 'A'), 'current'), v, 5e-3);
		}
	});
});

describe('parseNoiseDensity', () => {
	it('reads a current per root hertz, with or without the suffix', async () => {
		const { parseNoiseDensity } = await import('./units');
		expect(parseNoiseDensity('10 fA/√Hz')).toBeCloseTo(1e-14, 28);
		expect(parseNoiseDensity('10f')).toBeCloseTo(1e-14, 28);
		expect(parseNoiseDensity('3e-15 A/rtHz')).toBe(3e-15);
		expect(parseNoiseDensity('2 pA / sqrt(Hz)')).toBeCloseTo(2e-12, 26);
		expect(() => parseNoiseDensity('loud')).toThrow(/noise density/);
	});
});
