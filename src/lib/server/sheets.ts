// Tables in and out of files a spreadsheet opens: CSV (papaparse) and .xlsx (exceljs).
// Numbers stay numbers, in SI base units; the row under the header names each column's unit.
// An export may state its context first (the ranking's operating point): those lines, one
// cell each, and a blank row come before the header.
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { Cell, Table } from '$lib/catalogue/parts-list';
import { DomainError } from './errors';

/** An export: lines stated above the table, columns with their unit ('' for none) and rows of plain values. */
export type Sheet = { name: string; preamble?: string[]; columns: { label: string; unit: string }[]; rows: (string | number | null)[][] };

/** The preamble's rows: each line in the first cell, then a blank row (none without a preamble). */
const preambleRows = (sheet: Sheet): string[][] => (sheet.preamble?.length ? [...sheet.preamble.map((l) => [l]), []] : []);

const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
export type SheetFormat = 'csv' | 'xlsx';

const isZip = (b: Uint8Array) => b.length > 3 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;

/** One .xlsx cell as text or number: formulas give their cached result, rich text its plain text. */
function cellValue(v: ExcelJS.CellValue): Cell {
	if (v === null || v === undefined) return null;
	if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
	if (v instanceof Date) return v.toISOString().slice(0, 10);
	if (typeof v === 'object') {
		if ('richText' in v) return v.richText.map((r) => r.text).join('');
		if ('result' in v) return cellValue(v.result as ExcelJS.CellValue);
		if ('text' in v) return String(v.text);
		if ('error' in v) return String(v.error);
	}
	return String(v);
}

async function readXlsx(bytes: Uint8Array): Promise<Table> {
	const wb = new ExcelJS.Workbook();
	try {
		await wb.xlsx.load(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as unknown as ExcelJS.Buffer);
	} catch {
		throw new DomainError(422, 'The file looks like a zip but is not a spreadsheet (.xlsx) that can be read.', [{ path: 'file', message: 'unreadable .xlsx' }]);
	}
	const ws = wb.worksheets[0];
	if (!ws) throw new DomainError(422, 'The spreadsheet has no sheet.', [{ path: 'file', message: 'no worksheet' }]);
	const width = ws.columnCount;
	const rowCells = (r: ExcelJS.Row) => Array.from({ length: width }, (_, k) => cellValue(r.getCell(k + 1).value));
	const rows: Table['rows'] = [];
	let header: Cell[] | null = null;
	ws.eachRow({ includeEmpty: false }, (r, n) => {
		if (!header) header = rowCells(r);
		else rows.push({ row: n, cells: rowCells(r) });
	});
	return { header: header ?? [], rows };
}

function readCsv(bytes: Uint8Array): Table {
	let text: string;
	try {
		text = new TextDecoder('utf-8', { fatal: true }).decode(bytes).replace(/^\uFEFF/, '');
	} catch {
		throw new DomainError(422, 'The file is neither UTF-8 text (CSV) nor a spreadsheet (.xlsx).', [{ path: 'file', message: 'not UTF-8 text' }]);
	}
	// The delimiter is guessed (comma, semicolon, tab) as spreadsheets in different locales write it.
	const parsed = Papa.parse<string[]>(text, { skipEmptyLines: false });
	const all = parsed.data.map((cells, k) => ({ row: k + 1, cells: cells as Cell[] }));
	const first = all.findIndex((r) => r.cells.some((c) => String(c ?? '').trim() !== ''));
	if (first < 0) return { header: [], rows: [] };
	return { header: all[first].cells, rows: all.slice(first + 1) };
}

/** Reads a parts list or any table: .xlsx when the bytes are a zip, CSV otherwise. */
export async function readTable(bytes: Uint8Array): Promise<Table> {
	return isZip(bytes) ? readXlsx(bytes) : readCsv(bytes);
}

/** CSV with the preamble, a header row and a unit row; numbers written in full (shortest round-trip form). */
export function writeCsv(sheet: Sheet): string {
	const data = [...preambleRows(sheet), sheet.columns.map((c) => c.label), sheet.columns.map((c) => c.unit), ...sheet.rows.map((r) => r.map((v) => (v === null ? '' : v)))];
	return '\uFEFF' + Papa.unparse(data, { newline: '\r\n', escapeFormulae: true }) + '\r\n';
}

/** .xlsx with the preamble, a bold header row, an italic unit row, frozen above the data; number cells are numbers. */
export async function writeXlsx(sheet: Sheet): Promise<Uint8Array> {
	const wb = new ExcelJS.Workbook();
	wb.creator = 'Junctionary';
	const above = preambleRows(sheet);
	const ws = wb.addWorksheet(sheet.name.slice(0, 31), { views: [{ state: 'frozen', ySplit: above.length + 2 }] });
	for (const line of above) ws.addRow(line);
	ws.addRow(sheet.columns.map((c) => c.label)).font = { bold: true };
	ws.addRow(sheet.columns.map((c) => c.unit || null)).font = { italic: true };
	for (const r of sheet.rows) ws.addRow(r);
	sheet.columns.forEach((c, k) => (ws.getColumn(k + 1).width = Math.max(10, Math.min(40, c.label.length + 2))));
	return new Uint8Array(await wb.xlsx.writeBuffer());
}

/** The format asked for in ?format=, CSV unless xlsx. */
export function sheetFormat(url: URL): SheetFormat {
	const f = (url.searchParams.get('format') ?? 'csv').toLowerCase();
	if (f !== 'csv' && f !== 'xlsx') throw new DomainError(400, `format is csv or xlsx, not ${f}.`, [{ path: 'format', message: 'csv or xlsx' }]);
	return f;
}

/** A download response for a sheet in the chosen format. */
export async function sheetResponse(sheet: Sheet, format: SheetFormat, baseName: string): Promise<Response> {
	const body = format === 'xlsx' ? await writeXlsx(sheet) : writeCsv(sheet);
	return new Response(body as BodyInit, {
		headers: {
			'content-type': format === 'xlsx' ? XLSX_TYPE : 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${baseName}.${format}"`,
			'cache-control': 'no-store'
		}
	});
}
