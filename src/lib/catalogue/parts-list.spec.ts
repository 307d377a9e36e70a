import { describe, expect, it } from 'vitest';
import { readPartsList, splitHeader, type Cell, type Table } from './parts-list';

const HEADER = ['Part number', 'Maker', 'Kind', 'Package', 'Material', 'Reverse voltage (V)', 'Forward current [mA]', 'Tj (°C)', 'Tags', 'Lifecycle'];
const table = (rows: Cell[][], header: Cell[] = HEADER): Table => ({ header, rows: rows.map((cells, k) => ({ row: k + 2, cells })) });
const GOOD: Cell[] = ['QVL-D9', 'Quillon Vale', 'diode', 'SOD-323', 'silicon', '75', '200', '150', 'clamp; low-leak', 'in-use'];

describe('header names and units', () => {
	it.each([
		['Reverse voltage (kV)', 'Reverse voltage', 'kV'],
		['VR [V]', 'VR', 'V'],
		['Tj / °C', 'Tj', '°C'],
		['IF, mA', 'IF', 'mA'],
		['Part number', 'Part number', '']
	])('%s → name %s, unit %s', (text, name, unit) => {
		expect(splitHeader(text)).toEqual({ name, unit });
	});

	it('matches headers without case, spaces or punctuation, and applies the header unit to bare numbers', () => {
		const row: Cell[] = ['QVL-D9', 'Quillon Vale', 'diode', 'SOD-323', 'silicon', '0.075', '200', '423.15', 'clamp; low-leak', 'in-use'];
		const list = readPartsList(table([row], ['PART NO', 'manufacturer', 'type', 'pkg', 'material', 'VRRM (kV)', 'I_F (mA)', 'Tj max (K)', 'tags', 'status']));
		expect(list.problems).toEqual([]);
		const p = list.rows[0].input!;
		// SI prefixes: BIPM SI Brochure, 9th ed., 2019, Table 7; T/°C = T/K − 273.15 (ibid. §2.3.1).
		expect(p.ratings.reverseV).toBeCloseTo(75, 9);
		expect(p.ratings.forwardA).toBeCloseTo(0.2, 12);
		expect(p.ratings.junctionC).toBeCloseTo(150, 9);
		expect(p.tags).toEqual(['clamp', 'low-leak']);
	});

	it('a unit written in the cell wins over the header unit, and spreadsheet numbers are read as numbers', () => {
		const list = readPartsList(table([['QVL-D9', 'Quillon Vale', 'PN diode', '', '', '0.1 kV', 0.5, '398.15 K', '', 'Not for new designs']]));
		expect(list.problems).toEqual([]);
		const p = list.rows[0].input!;
		expect(p.kind).toBe('diode');
		expect(p.lifecycle).toBe('not-for-new');
		expect(p.ratings.reverseV).toBeCloseTo(100, 9);
		expect(p.ratings.forwardA).toBeCloseTo(5e-4, 15);
		expect(p.ratings.junctionC).toBeCloseTo(125, 9);
	});

	it('refuses a list without the required columns, and a header unit of the wrong quantity', () => {
		const list = readPartsList(table([['x']], ['Part number', 'Reverse voltage (mA)']));
		expect(list.problems).toEqual(
			expect.arrayContaining([
				{ row: 1, column: 'Maker', message: expect.stringContaining('no Maker column') },
				{ row: 1, column: 'Kind', message: expect.stringContaining('no Kind column') },
				{ row: 1, column: 'Reverse voltage (mA)', message: expect.stringContaining('not a unit of voltage') }
			])
		);
	});
});

// Each crafted row breaks one thing; the expected problem names the row, the column as the
// file heads it, and a word of what was expected.
const BAD: [string, Cell[], string, RegExp][] = [
	['empty part number', ['', 'Quillon Vale', 'diode'], 'Part number', /part number/i],
	['part number with a comma', ['QVL,9', 'Quillon Vale', 'diode'], 'Part number', /letters, digits/i],
	['part number too long', ['Q'.repeat(61), 'Quillon Vale', 'diode'], 'Part number', /at most 60/],
	['part number with a tab inside', ['QVL\tD9', 'Quillon Vale', 'diode'], 'Part number', /letters, digits/i],
	['no maker', ['QVL-A1', '', 'diode'], 'Maker', /maker/i],
	['maker too long', ['QVL-A2', 'M'.repeat(81), 'diode'], 'Maker', /81|80|too/i],
	['no kind', ['QVL-A3', 'Quillon Vale', ''], 'Kind', /kind/i],
	['unknown kind', ['QVL-A4', 'Quillon Vale', 'thyristor'], 'Kind', /expected one of diode/],
	['kind misspelt', ['QVL-A5', 'Quillon Vale', 'shottky'], 'Kind', /expected one of/],
	['package too long', ['QVL-A6', 'Quillon Vale', 'diode', 'P'.repeat(41)], 'Package', /40|too/i],
	['unknown material', ['QVL-A7', 'Quillon Vale', 'diode', '', 'unobtainium'], 'Material', /expected one of silicon/],
	['reverse voltage not a number', ['QVL-A8', 'Quillon Vale', 'diode', '', '', 'lots'], 'Reverse voltage (V)', /expected a voltage/],
	['reverse voltage in amperes', ['QVL-A9', 'Quillon Vale', 'diode', '', '', '5 A'], 'Reverse voltage (V)', /expected a voltage/],
	['reverse voltage negative', ['QVL-B1', 'Quillon Vale', 'diode', '', '', '-75'], 'Reverse voltage (V)', /above zero/],
	['reverse voltage zero', ['QVL-B2', 'Quillon Vale', 'diode', '', '', '0'], 'Reverse voltage (V)', /above zero/],
	['reverse voltage absurd', ['QVL-B3', 'Quillon Vale', 'diode', '', '', '20 kV'], 'Reverse voltage (V)', /at most 10 kV/],
	['forward current not a number', ['QVL-B4', 'Quillon Vale', 'diode', '', '', '', 'a bit'], 'Forward current [mA]', /expected a current/],
	['forward current in volts', ['QVL-B5', 'Quillon Vale', 'diode', '', '', '', '3 V'], 'Forward current [mA]', /expected a current/],
	['forward current negative', ['QVL-B6', 'Quillon Vale', 'diode', '', '', '', '-200'], 'Forward current [mA]', /above zero/],
	['forward current absurd', ['QVL-B7', 'Quillon Vale', 'diode', '', '', '', '5 kA'], 'Forward current [mA]', /at most 1 kA/],
	['junction temperature not a temperature', ['QVL-B8', 'Quillon Vale', 'diode', '', '', '', '', 'hot'], 'Tj (°C)', /expected a temperature/],
	['junction temperature below absolute zero', ['QVL-B9', 'Quillon Vale', 'diode', '', '', '', '', '-300'], 'Tj (°C)', /absolute zero/],
	['junction temperature far too hot', ['QVL-C1', 'Quillon Vale', 'diode', '', '', '', '', '450'], 'Tj (°C)', /300 °C or less/],
	['junction temperature in fahrenheit', ['QVL-C2', 'Quillon Vale', 'diode', '', '', '', '', '300 F'], 'Tj (°C)', /expected a temperature/],
	['tag too long', ['QVL-C3', 'Quillon Vale', 'diode', '', '', '', '', '', 'T'.repeat(41)], 'Tags', /40 characters/],
	['too many tags', ['QVL-C4', 'Quillon Vale', 'diode', '', '', '', '', '', Array.from({ length: 21 }, (_, k) => `t${k}`).join(',')], 'Tags', /20|too/i],
	['unknown lifecycle', ['QVL-C5', 'Quillon Vale', 'diode', '', '', '', '', '', '', 'obsolete'], 'Lifecycle', /expected one of in-use/],
	['lifecycle misspelt', ['QVL-C6', 'Quillon Vale', 'diode', '', '', '', '', '', '', 'retird'], 'Lifecycle', /expected one of/],
	['reverse voltage with a unit but no number', ['QVL-C7', 'Quillon Vale', 'diode', '', '', 'kV'], 'Reverse voltage (V)', /expected a voltage/],
	['forward current with two decimal points', ['QVL-C8', 'Quillon Vale', 'diode', '', '', '', '1.2.3'], 'Forward current [mA]', /expected a current/],
	['reverse voltage as a formula text', ['QVL-C9', 'Quillon Vale', 'diode', '', '', '=A1*2'], 'Reverse voltage (V)', /expected a voltage/],
	['junction temperature as a date', ['QVL-D1', 'Quillon Vale', 'diode', '', '', '', '', '2024-01-01'], 'Tj (°C)', /expected a temperature/],
	['material given as a kind', ['QVL-D2', 'Quillon Vale', 'diode', '', 'schottky'], 'Material', /expected one of/]
];

describe('crafted bad rows', () => {
	const rows = [GOOD, ...BAD.map(([, cells]) => cells), GOOD];
	const list = readPartsList(table(rows));

	it(`reads ${BAD.length} bad rows and reports each at its row and column`, () => {
		expect(BAD.length).toBeGreaterThanOrEqual(30);
		BAD.forEach(([what, , column, message], k) => {
			const row = k + 3;
			const problems = list.problems.filter((p) => p.row === row);
			expect(problems, `${what} (row ${row})`).toHaveLength(1);
			expect(problems[0].column, what).toBe(column);
			expect(problems[0].message, what).toMatch(message);
		});
	});

	it('keeps the good rows, and flags the same part listed twice at its second row', () => {
		expect(list.rows[0].input?.partNumber).toBe('QVL-D9');
		const last = list.rows[list.rows.length - 1];
		expect(last.input).toBeNull();
		expect(last.problems).toEqual([{ row: BAD.length + 3, column: 'Part number', message: 'the same part as row 2; list each part once' }]);
	});

	it('skips blank rows and records only the fields a row gives', () => {
		const l = readPartsList(table([['QVL-D9', 'Quillon Vale', 'diode'], [null, '', ''], ['QVL-D10', 'Quillon Vale', 'schottky', 'SOD-523']]));
		expect(l.problems).toEqual([]);
		expect(l.rows.map((r) => r.row)).toEqual([2, 4]);
		expect(l.rows[0].given).toEqual(['partNumber', 'maker', 'kind']);
		expect(l.rows[1].given).toEqual(['partNumber', 'maker', 'kind', 'package']);
	});
});
