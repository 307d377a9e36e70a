// The ranking as a spreadsheet: the rank screen's address plus ?format=, every listed part in
// the ranking's order, numbers exactly as POST /api/v1/rank gives them (SI base units), the
// operating point and basis stated above the table. The .xlsx is read back by Debian's
// python3-openpyxl, a reader independent of the package that writes it.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { CAUTIONS } from '$lib/cautions';
import type { StoredModel } from '$lib/server/db/schema';
import type { RankItem } from '$lib/schemas/rank';
import { APP_URL, cookieFor, unique } from './helpers';
import { createParts, deleteParts, rank, seen, type TestPart } from './rank-fixtures';

const created: number[] = [];
afterAll(async () => deleteParts(created));

const tag = unique('rx');
const silicon = (IS: number): StoredModel => ({ IS, N: 1.05, RS: 1, TNOM: 27, CJO: 2e-12, VJ: 0.7, M: 0.4 });
const list: TestPart[] = [
	{ partNumber: `${tag}-a`, samples: [0.8, 1, 1.3].map((f) => silicon(2e-14 * f)), sampleUnits: ['A1', 'A2', 'A3'] },
	{ partNumber: `${tag}-b`, samples: [0.5, 1, 2].map((f) => silicon(1e-15 * f)), sampleUnits: ['B1', 'B2', 'B3'] },
	{ partNumber: `${tag}-c`, samples: [silicon(3e-16)], sampleUnits: ['C1'] },
	{ partNumber: `${tag}-d`, samples: [1, 1.1].map((f) => silicon(5e-13 * f)), ratedReverseV: 4 }
];
// The screen's address: −5 V, 25 °C to 85 °C, clamping 1 mA under 0.7 V, a 1 GΩ source, only these parts.
const query = `v=-5&tlo=25&thi=85&ic=1m&vf=0.7&rs=1G&q=${tag}`;
const op = { biasV: -5, temperatureRangeC: [25, 85] as [number, number], clampCurrentA: 1e-3, maxForwardDropV: 0.7, sourceResistanceOhm: 1e9, q: tag };

async function download(q: string) {
	const res = await fetch(`${APP_URL}/rank/export?${q}`, { headers: { cookie: await cookieFor('designer') }, redirect: 'manual' });
	return { status: res.status, type: res.headers.get('content-type') ?? '', disposition: res.headers.get('content-disposition') ?? '', bytes: new Uint8Array(await res.arrayBuffer()) };
}

/** Each column's expected cell for an item, as the API answers it. */
function expectedCells(item: RankItem): Record<string, string | number | null> {
	return {
		Rank: item.rank,
		'Part number': item.partNumber,
		'Leakage typical, hot end': item.leakageA.typical,
		'Leakage worst sample, hot end': item.leakageA.worst,
		'Leakage bound, hot end': item.leakageA.bound,
		'Forward drop worst': item.forwardDropV?.worst ?? null,
		'Error voltage': item.errorVoltageV,
		Capacitance: item.capacitanceF,
		'Current noise worst sample': item.noiseA_rtHz.worst,
		'Catalogue id': item.id
	};
}

let items: RankItem[] = [];
beforeAll(async () => {
	created.push(...(await createParts(list)));
	await seen(tag, list.length);
	items = (await rank({ ...op, limit: 100 })).items;
	// The over-rated part (4 V rating at −5 V) is left out, as on the screen.
	expect(items.map((i) => i.partNumber)).not.toContain(`${tag}-d`);
	expect(items.length).toBe(3);
});

describe('ranking export', () => {
	test('CSV: the operating point above, then every listed part in ranking order with the API’s numbers', async () => {
		const r = await download(`${query}&format=csv`);
		expect(r.status).toBe(200);
		expect(r.type).toMatch(/^text\/csv/);
		expect(r.disposition).toMatch(/attachment; filename="junctionary-ranking-\d{4}-\d{2}-\d{2}\.csv"/);
		const rows = Papa.parse<string[]>(new TextDecoder().decode(r.bytes).replace(/^\uFEFF/, ''), { skipEmptyLines: false }).data;
		const blank = rows.findIndex((row) => row.length === 1 && row[0] === '');
		const preamble = rows.slice(0, blank).map((row) => row[0]);
		expect(preamble[0]).toMatch(/^Operating point: −5\.000 V, 25 °C to 85 °C, clamping 1 mA under 0\.700 V, source 1 GΩ/);
		expect(preamble).toContain('Ranked by statistical bound (95 % of parts, 90 % confidence)');
		expect(preamble).toContain('4 parts evaluated, 1 left out for exceeding their reverse rating; the first 3 listed');
		for (const line of CAUTIONS) expect(preamble).toContain(line);
		const head = rows[blank + 1];
		const units = rows[blank + 2];
		expect(units[head.indexOf('Leakage bound, hot end')]).toBe('A');
		expect(units[head.indexOf('Error voltage')]).toBe('V');
		expect(units[head.indexOf('Capacitance')]).toBe('F');
		const data = rows.slice(blank + 3).filter((row) => row.some((c) => c !== ''));
		expect(data.length).toBe(items.length);
		data.forEach((row, k) => {
			for (const [label, want] of Object.entries(expectedCells(items[k]))) {
				const cell = row[head.indexOf(label)];
				// CSV numbers are written in the shortest form that reads back as the same double.
				if (typeof want === 'number') expect(Number(cell), `${label}, row ${k + 1}`).toBe(want);
				else expect(cell, `${label}, row ${k + 1}`).toBe(want ?? '');
			}
		});
		// The one-sample part has no bound: its cell is empty and its standing says why, in words.
		const one = data.find((row) => row[head.indexOf('Part number')] === `${tag}-c`)!;
		expect(one[head.indexOf('Leakage bound, hot end')]).toBe('');
		expect(one[head.indexOf('Standing')]).toMatch(/one sample: no bound/);
	});

	test('.xlsx read by python3-openpyxl: number cells are floats equal to the API’s values', async () => {
		const r = await download(`${query}&format=xlsx`);
		expect(r.status).toBe(200);
		expect(r.type).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
		const file = join(mkdtempSync(join(tmpdir(), 'rank-export-')), 'ranking.xlsx');
		writeFileSync(file, r.bytes);
		const script = `import json, sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1]).worksheets[0]
print(json.dumps([[{"t": type(c.value).__name__, "v": c.value} for c in row] for row in ws.iter_rows()]))`;
		const out = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script, file], { encoding: 'utf8' })) as { t: string; v: unknown }[][];
		const headAt = out.findIndex((row) => row[0]?.v === 'Rank');
		expect(String(out[0][0].v)).toMatch(/^Operating point: /);
		const head = out[headAt].map((c) => c.v);
		items.forEach((item, k) => {
			const row = out[headAt + 2 + k];
			for (const [label, want] of Object.entries(expectedCells(item))) {
				const cell = row[head.indexOf(label)];
				if (typeof want === 'number') {
					expect(['float', 'int'], `${label}, row ${k + 1}`).toContain(cell.t);
					expect(cell.v, `${label}, row ${k + 1}`).toBe(want);
				} else expect(cell.v ?? null, `${label}, row ${k + 1}`).toBe(want);
			}
		});
	});

	test('an address the screen cannot read is a 400 naming the parameter; an unknown format names the choices', async () => {
		const bad = await download(`v=abc&thi=85&format=csv`);
		expect(bad.status).toBe(400);
		const body = JSON.parse(new TextDecoder().decode(bad.bytes));
		expect(body.error.issues.map((i: { path: string }) => i.path)).toEqual(['v']);
		expect(body.error.message).toMatch(/^The ranking address cannot be read: v: /);
		const pdf = await download(`${query}&format=pdf`);
		expect(pdf.status).toBe(400);
		expect(new TextDecoder().decode(pdf.bytes)).toMatch(/csv or xlsx/);
	});
});
