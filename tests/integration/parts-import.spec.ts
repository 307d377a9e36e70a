// Importing a parts list through POST /api/v1/junctions/import and the import page's form
// actions: the preview writes nothing, problems carry row and column, updates are diffs,
// and a confirmed list is one transaction with one audit row.
import ExcelJS from 'exceljs';
import { desc, eq, inArray } from 'drizzle-orm';
import { beforeAll, describe, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { auditLog, parts } from '$lib/server/db/schema';
import { api, browse, tokenFor, unique } from './helpers';
import { counts } from './catalogue-fixtures';

beforeAll(async () => {
	await tokenFor('librarian');
	await tokenFor('designer');
});

const HEADER = 'Part number,Maker,Kind,Package,Reverse voltage (V),Forward current (mA),Tj (°C),Tags,Lifecycle';
const csv = (lines: string[]) => [HEADER, ...lines].join('\r\n') + '\r\n';
const post = (body: BodyInit, query = '', type = 'text/csv') => api('POST', `/api/v1/junctions/import${query}`, { as: 'librarian', body, headers: { 'content-type': type } });

/** 32 rows each broken in one cell, with the column the problem must be reported in. */
function badRows(maker: string): { line: string; column: string }[] {
	const out: { line: string; column: string }[] = [];
	for (let k = 0; k < 8; k++) out.push({ line: `${unique('BR')},${maker},thyristor,SOD-323,75,200,150,,in-use`, column: 'Kind' });
	for (let k = 0; k < 8; k++) out.push({ line: `${unique('BR')},${maker},diode,SOD-323,${['-5', 'lots', '5 A', '0'][k % 4]},200,150,,in-use`, column: 'Reverse voltage (V)' });
	for (let k = 0; k < 8; k++) out.push({ line: `${unique('BR')},${maker},diode,SOD-323,75,${['3 V', '-1', 'x', '2 kA'][k % 4]},150,,in-use`, column: 'Forward current (mA)' });
	for (let k = 0; k < 4; k++) out.push({ line: `${unique('BR')},${maker},diode,SOD-323,75,200,${['hot', '-300', '450', '9 F'][k]},,in-use`, column: 'Tj (°C)' });
	for (let k = 0; k < 4; k++) out.push({ line: `${unique('BR')},${maker},diode,SOD-323,75,200,150,,${['obsolete', 'gone', 'new', '?'][k]}`, column: 'Lifecycle' });
	return out;
}

async function partsOf(maker: string) {
	return db.select().from(parts).where(eq(parts.maker, maker));
}

describe('the preview', () => {
	test('32 bad rows: each problem has its row and column, and nothing is written by the preview or a refused import', async () => {
		const maker = unique('Fab');
		const bad = badRows(maker);
		const body = csv([`${unique('OK')},${maker},diode,SOD-323,75,200,150,clamp,in-use`, ...bad.map((b) => b.line)]);
		const before = await counts();
		const r = await post(body, '?dryRun=1');
		expect(r.status, JSON.stringify(r.body).slice(0, 400)).toBe(200);
		expect(r.body.counts).toMatchObject({ rows: 33, create: 1, invalid: 32 });
		bad.forEach((b, k) => {
			const row = k + 3; // header is row 1, the good row is row 2
			const p = r.body.problems.filter((x: { row: number }) => x.row === row);
			expect(p, `row ${row}`).toHaveLength(1);
			expect(p[0].column).toBe(b.column);
			expect(p[0].message.length).toBeGreaterThan(5);
		});
		const refused = await post(body);
		expect(refused.status).toBe(422);
		expect(refused.body.error.message).toMatch(/32 problems .*Nothing was imported/);
		expect(refused.body.error.issues[0]).toMatchObject({ row: 3, column: 'Kind' });
		expect(await counts()).toEqual(before);
		expect(await partsOf(maker)).toEqual([]);
	});

	test('an existing part is shown as an update with only its changed fields; the confirm writes parts and one audit row', async () => {
		const maker = unique('Fab');
		const [a, b, c] = [unique('IM'), unique('IM'), unique('IM')];
		const first = csv([`${a},${maker},diode,SOD-323,75,200,150,clamp; low-leak,in-use`, `${b},${maker},schottky,SOD-523,30,100,125,,in-use`, `${c},${maker},jfet-gate,SOT-23,40,50,150,guard,in-use`]);
		const before = await counts();
		const created = await post(first);
		expect(created.status, JSON.stringify(created.body).slice(0, 400)).toBe(201);
		expect(created.body.created).toHaveLength(3);
		expect(created.body.id).toBeTypeOf('number');
		const after = await counts();
		expect(after.parts - before.parts).toBe(3);
		expect(after.audit_log - before.audit_log).toBe(1);
		const [audit] = await db.select().from(auditLog).where(eq(auditLog.id, created.body.id));
		expect(audit.action).toBe('parts.import');
		const stored = await partsOf(maker);
		const pa = stored.find((p) => p.partNumber === a)!;
		// 200 mA in the header's unit is 0.2 A; tags are stored lower case.
		expect(pa.ratedForwardA).toBeCloseTo(0.2, 12);
		expect(pa.tags).toEqual(['clamp', 'low-leak']);
		expect(stored.find((p) => p.partNumber === b)!.material).toBe('metal-semiconductor');

		// Second list: a's reverse rating and lifecycle change, b is as it was, c's Tj cell is blank (kept).
		const second = csv([`${a},${maker},diode,SOD-323,100 V,200,150,clamp; low-leak,not-for-new`, `${b},${maker},schottky,SOD-523,30,100,125,,in-use`, `${c},${maker},jfet-gate,SOT-23,40,50,,guard,in-use`]);
		const preview = await post(second, '?dryRun=1');
		expect(preview.status).toBe(200);
		expect(preview.body.counts).toMatchObject({ create: 0, update: 1, unchanged: 2, invalid: 0 });
		const row = preview.body.rows.find((r: { row: number }) => r.row === 2);
		expect(row.action).toBe('update');
		expect(row.id).toBe(pa.id);
		expect(row.changes).toEqual([
			{ field: 'reverseV', label: 'Rated reverse voltage', from: 75, to: 100 },
			{ field: 'lifecycle', label: 'Lifecycle', from: 'in-use', to: 'not-for-new' }
		]);
		expect(await counts()).toEqual(after);

		// A confirm carrying another preview's fingerprint is refused.
		const stale = await post(second, '?fingerprint=0000');
		expect(stale.status).toBe(409);
		const done = await post(second, `?fingerprint=${preview.body.fingerprint}`);
		expect(done.status).toBe(201);
		expect(done.body.updated).toEqual([pa.id]);
		const [pa2] = await db.select().from(parts).where(eq(parts.id, pa.id));
		expect(pa2.ratedReverseV).toBe(100);
		expect(pa2.lifecycle).toBe('not-for-new');
		expect((await partsOf(maker)).find((p) => p.partNumber === c)!.ratedJunctionC).toBe(150);
		const again = await post(second);
		expect(again.status).toBe(200);
		expect(again.body.counts.unchanged).toBe(3);
	});

	test('an .xlsx list with number cells imports as the CSV does', async () => {
		const maker = unique('Fab');
		const wb = new ExcelJS.Workbook();
		const ws = wb.addWorksheet('parts');
		ws.addRow(['Part number', 'Maker', 'Kind', 'VR (V)', 'IF (A)', 'Tj (K)']);
		const pn = unique('XL');
		ws.addRow([pn, maker, 'LED', 5, 0.03, 358.15]);
		const bytes = Buffer.from(await wb.xlsx.writeBuffer());
		const r = await post(bytes, '', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
		expect(r.status, JSON.stringify(r.body).slice(0, 400)).toBe(201);
		const [p] = await partsOf(maker);
		expect(p).toMatchObject({ partNumber: pn, kind: 'led', ratedReverseV: 5, ratedForwardA: 0.03, admitsLight: true });
		// 358.15 K − 273.15 = 85 °C (BIPM SI Brochure, 9th ed., 2019, §2.3.1).
		expect(p.ratedJunctionC).toBeCloseTo(85, 9);
	});

	test('a body that is neither text nor a spreadsheet is refused plainly', async () => {
		const r = await post(new Uint8Array([0xff, 0xfe, 0x00, 0x81, 0x90]));
		expect(r.status).toBe(422);
		expect(r.body.error.message).toMatch(/neither UTF-8 text/);
	});
});

describe('the import page', () => {
	test('the preview action shows the rows and the confirm action imports them', async () => {
		const maker = unique('Fab');
		const pn = unique('PG');
		const table = JSON.stringify({ header: ['Part number', 'Maker', 'Kind'], rows: [{ row: 2, cells: [pn, maker, 'bjt-be'] }] });
		const refused = await browse('/parts/import?/confirm', { as: 'librarian', form: { table, fingerprint: 'nope' } });
		expect(refused.status).toBe(409);
		expect(await partsOf(maker)).toEqual([]);
		const ok = await browse('/parts/import?/confirm', { as: 'librarian', form: { table } });
		expect(ok.status).toBe(200);
		const stored = await partsOf(maker);
		expect(stored.map((p) => p.partNumber)).toEqual([pn]);
		const rows = await db.select().from(auditLog).where(inArray(auditLog.action, ['parts.import'])).orderBy(desc(auditLog.id)).limit(1);
		expect((rows[0].detail as { created: number[] }).created).toEqual([stored[0].id]);
	});
});

