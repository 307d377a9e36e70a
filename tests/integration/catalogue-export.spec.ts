// The catalogue listing as CSV and .xlsx: the page's filters and sort, every matching part,
// numbers in SI base units with a unit row, checked against what PostgreSQL holds.
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { eq } from 'drizzle-orm';
import { describe, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { partModels, parts } from '$lib/server/db/schema';
import { APP_URL, cookieFor } from './helpers';

async function download(query: string) {
	const res = await fetch(`${APP_URL}/catalogue/export?${query}`, { headers: { cookie: await cookieFor('designer') }, redirect: 'manual' });
	return { status: res.status, type: res.headers.get('content-type') ?? '', disposition: res.headers.get('content-disposition') ?? '', bytes: new Uint8Array(await res.arrayBuffer()) };
}

async function schottkies() {
	return db.select({ id: parts.id, pn: parts.partNumber, typical: partModels.typical, vr: parts.ratedReverseV }).from(parts).leftJoin(partModels, eq(partModels.partId, parts.id)).where(eq(parts.kind, 'schottky'));
}

describe('catalogue export', () => {
	test('CSV: the filtered parts, sorted as asked, with numbers as stored', async () => {
		const r = await download('format=csv&kind=schottky&sort=-vr');
		expect(r.status).toBe(200);
		expect(r.type).toMatch(/^text\/csv/);
		expect(r.disposition).toMatch(/attachment; filename="junctionary-catalogue-.*\.csv"/);
		const rows = Papa.parse<string[]>(new TextDecoder().decode(r.bytes).replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data;
		const head = rows[0];
		expect(rows[1][head.indexOf('IS typical')]).toBe('A');
		expect(rows[1][head.indexOf('Rated reverse voltage')]).toBe('V');
		const expected = await schottkies();
		expect(expected.length).toBeGreaterThan(1);
		const data = rows.slice(2);
		expect(data.length).toBe(expected.length);
		expect(data.every((d) => d[head.indexOf('Kind')] === 'Schottky diode')).toBe(true);
		const vr = data.map((d) => d[head.indexOf('Rated reverse voltage')]).filter(Boolean).map(Number);
		expect(vr).toEqual([...vr].sort((a, b) => b - a));
		for (const d of data) {
			const p = expected.find((e) => e.id === Number(d[head.indexOf('Catalogue id')]))!;
			expect(d[head.indexOf('Part number')]).toBe(p.pn);
			// The shortest decimal that reads back as the same double (ECMAScript Number::toString).
			expect(d[head.indexOf('IS typical')]).toBe(p.typical ? String(p.typical.IS) : '');
		}
	});

	test('.xlsx: the same rows, number cells are numbers', async () => {
		const r = await download('format=xlsx&kind=schottky');
		expect(r.status).toBe(200);
		expect(r.type).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
		const wb = new ExcelJS.Workbook();
		await wb.xlsx.load(Buffer.from(r.bytes) as unknown as ExcelJS.Buffer);
		const ws = wb.worksheets[0];
		const head = (ws.getRow(1).values as unknown[]).slice(1);
		const col = (name: string) => head.indexOf(name) + 1;
		expect(ws.getRow(2).getCell(col('IS typical')).value).toBe('A');
		const expected = await schottkies();
		expect(ws.rowCount - 2).toBe(expected.length);
		for (let k = 3; k <= ws.rowCount; k++) {
			const row = ws.getRow(k);
			const p = expected.find((e) => e.id === row.getCell(col('Catalogue id')).value)!;
			if (p.typical) expect(row.getCell(col('IS typical')).value).toBe(p.typical.IS);
			if (p.vr !== null) expect(row.getCell(col('Rated reverse voltage')).value).toBe(p.vr);
		}
	});

	test('an unknown format is a 400 naming the choices', async () => {
		const r = await download('format=pdf');
		expect(r.status).toBe(400);
		expect(new TextDecoder().decode(r.bytes)).toMatch(/csv or xlsx/);
	});
});
