import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { readTable, writeCsv, writeXlsx, type Sheet } from './sheets';

// Values chosen to catch lossy writing: a femtoamp leakage, a gigaohm shunt, a negative bias,
// an ideality factor with 16 significant digits, text that looks like a number or a formula.
const SHEET: Sheet = {
	name: 'Round trip',
	columns: [
		{ label: 'Part number', unit: '' },
		{ label: 'Leakage', unit: 'A' },
		{ label: 'Shunt', unit: 'Ω' },
		{ label: 'Bias', unit: 'V' },
		{ label: 'N', unit: '1' },
		{ label: 'Flags', unit: '' }
	],
	rows: [
		['QVL-D9', 3.2e-15, 1.5e9, -5, 1.0123456789012345, 'current extrapolated more than a decade below the measured range'],
		['0042', 1e-300, null, 0.7, 2, '=SUM(A1)'],
		['Ünïcode µ', 6.02214076e23, 0, -0.000612, 1, '']
	]
};

describe('.xlsx round trip', () => {
	it('reads back every cell with the same package: numbers as numbers, exactly; the unit row second', async () => {
		const bytes = await writeXlsx(SHEET);
		const t = await readTable(bytes);
		expect(t.header).toEqual(SHEET.columns.map((c) => c.label));
		expect(t.rows[0].cells).toEqual(SHEET.columns.map((c) => c.unit || null));
		SHEET.rows.forEach((r, k) => {
			expect(t.rows[k + 1].cells.map((c) => (c === '' ? null : c))).toEqual(r.map((v) => (v === '' ? null : v)));
		});
	});

	it("reads back every cell with a second, independent reader (Debian's python3-openpyxl)", async () => {
		const dir = mkdtempSync(join(tmpdir(), 'sheet-'));
		const file = join(dir, 'round-trip.xlsx');
		writeFileSync(file, await writeXlsx(SHEET));
		// openpyxl gives each cell's stored type: floats stay floats, text stays text.
		const script = `import json, sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1]).worksheets[0]
print(json.dumps([[{"t": type(c.value).__name__, "v": c.value} for c in row] for row in ws.iter_rows()]))`;
		const out = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script, file], { encoding: 'utf8' })) as { t: string; v: unknown }[][];
		expect(out[0].map((c) => c.v)).toEqual(SHEET.columns.map((c) => c.label));
		expect(out[1].map((c) => c.v ?? '')).toEqual(SHEET.columns.map((c) => c.unit));
		SHEET.rows.forEach((r, k) => {
			r.forEach((v, j) => {
				const cell = out[k + 2][j];
				if (typeof v === 'number') {
					expect(['float', 'int']).toContain(cell.t);
					expect(cell.v).toBe(v);
				} else expect(cell.v ?? '').toBe(v ?? '');
			});
		});
	});
});

// An export that states its context first (the ranking's operating point), as a person reads it.
const WITH_PREAMBLE: Sheet = { ...SHEET, preamble: ['Operating point: −5 V, 25 °C to 85 °C', 'Ranked by statistical bound (95 % of parts, 90 % confidence)'] };

describe('a preamble above the table', () => {
	it('CSV: each line in the first cell, a blank line, then the header and unit rows', () => {
		const rows = Papa.parse<string[]>(writeCsv(WITH_PREAMBLE).slice(1), { skipEmptyLines: false }).data;
		expect(rows[0]).toEqual([WITH_PREAMBLE.preamble![0]]);
		expect(rows[1]).toEqual([WITH_PREAMBLE.preamble![1]]);
		expect(rows[2]).toEqual(['']);
		expect(rows[3]).toEqual(SHEET.columns.map((c) => c.label));
		expect(rows[4]).toEqual(SHEET.columns.map((c) => c.unit));
		expect(Number(rows[5][1])).toBe(3.2e-15);
	});

	it(".xlsx: the same rows read by python3-openpyxl, the panes frozen under the unit row", async () => {
		const dir = mkdtempSync(join(tmpdir(), 'sheet-'));
		const file = join(dir, 'preamble.xlsx');
		writeFileSync(file, await writeXlsx(WITH_PREAMBLE));
		const script = `import json, sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1]).worksheets[0]
print(json.dumps({"freeze": ws.freeze_panes, "rows": [[c.value for c in row] for row in ws.iter_rows()]}))`;
		const out = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script, file], { encoding: 'utf8' })) as { freeze: string; rows: unknown[][] };
		expect(out.rows[0][0]).toBe(WITH_PREAMBLE.preamble![0]);
		expect(out.rows[1][0]).toBe(WITH_PREAMBLE.preamble![1]);
		expect(out.rows[2].every((v) => v === null)).toBe(true);
		expect(out.rows[3]).toEqual(SHEET.columns.map((c) => c.label));
		expect(out.rows[5][1]).toBe(3.2e-15);
		// Two preamble lines, the blank row, header and units: the data start on row 6.
		expect(out.freeze).toBe('A6');
	});
});

describe('CSV', () => {
	it('writes a header row, a unit row and numbers that parse back to the same double', () => {
		const text = writeCsv(SHEET);
		expect(text.startsWith('\uFEFF')).toBe(true);
		const rows = Papa.parse<string[]>(text.slice(1), { skipEmptyLines: true }).data;
		expect(rows[0]).toEqual(SHEET.columns.map((c) => c.label));
		expect(rows[1]).toEqual(SHEET.columns.map((c) => c.unit));
		expect(Number(rows[2][1])).toBe(3.2e-15);
		expect(Number(rows[2][4])).toBe(1.0123456789012345);
		expect(Number(rows[4][3])).toBe(-0.000612);
		// A cell that a spreadsheet would run as a formula is written as text.
		expect(rows[3][5]).toBe("'=SUM(A1)");
		expect(rows[3][0]).toBe('0042');
	});

	it('reads semicolon lists and a byte-order mark as spreadsheets in other locales write them', async () => {
		const t = await readTable(new TextEncoder().encode('\uFEFFPart number;Maker;Kind\r\nQVL-D9;Quillon Vale;diode\r\n'));
		expect(t.header).toEqual(['Part number', 'Maker', 'Kind']);
		expect(t.rows[0]).toEqual({ row: 2, cells: ['QVL-D9', 'Quillon Vale', 'diode'] });
	});
});
