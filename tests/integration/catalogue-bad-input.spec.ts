// Malformed uploads: each is refused with a message saying what and where, and none of
// them writes a row anywhere (counted in every table an upload can touch).
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { api, unique } from './helpers';
import { counts, forwardCsv } from './catalogue-fixtures';

type Case = {
	name: string;
	body?: BodyInit;
	type?: string;
	json?: unknown;
	query?: string;
	status: number;
	message: RegExp;
	/** An issue must name this row and/or column. */
	row?: number;
	column?: string | RegExp;
};

const good = forwardCsv();
const lines = good.trim().split('\n');
const withRow = (k: number, row: string) => [...lines.slice(0, k), row, ...lines.slice(k + 1)].join('\n') + '\n';
const bigBody = 'V (V),I (A)\n' + '0.512345678,1.23456789e-6\n'.repeat(90_000); // ≈ 2.4 MB
const binary = new Uint8Array(4096).map((_, k) => (k * 37 + 11) % 256);

const CASES: Case[] = [
	{ name: 'empty body', body: '', status: 422, message: /empty/ },
	{ name: 'only blank lines', body: '\n\n  \n', status: 422, message: /empty/ },
	{ name: 'header only', body: 'V (V),I (A)\n', status: 422, message: /no data rows/, row: 1 },
	{ name: 'text in a number', body: withRow(3, '0.41,abc'), status: 422, message: /expected a number/, row: 4, column: 'I (A)' },
	{ name: 'NaN', body: withRow(5, '0.45,NaN'), status: 422, message: /not a finite number/, row: 6, column: 'I (A)' },
	{ name: 'infinity', body: withRow(5, 'Infinity,1e-6'), status: 422, message: /not a finite number/, row: 6, column: 'V (V)' },
	{ name: 'missing value', body: withRow(4, '0.43,'), status: 422, message: /missing value/, row: 5, column: 'I (A)' },
	{ name: 'mixed units in a column', body: 'V,I\n0.30,1nA\n0.40,20nA\n0.50,1uA\n0.6,30uA\n', status: 422, message: /mixed units/, column: 'I' },
	{ name: 'cell unit against header unit', body: 'V (V),I (nA)\n0.3,1\n0.4,2uA\n0.5,30\n', status: 422, message: /conflicts with the header unit/, row: 3 },
	{ name: 'unknown voltage unit', body: 'V (volts-ish),I (A)\n0.3,1e-9\n', status: 422, message: /unknown voltage unit/, row: 1 },
	{ name: 'unknown current unit', body: 'V (V),I (furlongs)\n0.3,1e-9\n', status: 422, message: /unknown current unit/, row: 1 },
	{ name: 'decimal commas in a comma-separated file', body: 'V,I\n0,30,1e-9\n0,40,1e-8\n0,50,1e-7\n0,60,1e-6\n0,70,1e-5\n', status: 422, message: /./ },
	{ name: 'BOM then header only', body: '\uFEFFV (V),I (A)\n', status: 422, message: /no data rows/ },
	{ name: 'binary junk', body: binary, type: 'application/octet-stream', status: 422, message: /binary|UTF-8/ },
	{ name: 'negative currents in a forward sweep', body: forwardCsv().replace(/,(\d)/g, ',-$1'), status: 422, message: /negative at forward bias|wrong sign/ },
	{ name: 'all-zero current', body: 'V (V),I (A)\n0.1,0\n0.2,0\n0.3,0\n0.4,0\n', status: 422, message: /every current is zero/, column: 'I (A)' },
	{ name: 'one point', body: 'V (V),I (A)\n0.5,1e-6\n', status: 422, message: /only 1 data point/ },
	{ name: 'duplicate voltages with conflicting currents', body: 'V (V),I (A)\n0.3,1e-9\n0.4,1e-8\n0.4,5e-6\n0.5,1e-6\n0.6,1e-5\n', status: 422, message: /same voltage/, column: 'I (A)' },
	{ name: 'no voltage column', body: 'Alpha,Beta\n0.3,1e-9\n0.4,1e-8\n', status: 422, message: /no voltage column/, row: 1 },
	{ name: 'two current columns', body: 'V (V),I (A),Current (nA)\n0.3,1e-9,1\n', status: 422, message: /second current column/, row: 1 },
	{ name: 'temperature entered in kelvin', body: good, query: 'sample=U9&temperatureC=298.15', status: 400, message: /kelvin/ },
	{ name: 'temperature not a number', body: good, query: 'sample=U9&temperatureC=warm', status: 400, message: /Not read as a temperature/ },
	{ name: 'temperature column in °C holding kelvin', body: 'V (V),I (A),Temp (°C)\n0.3,1e-9,298\n0.4,1e-8,298\n0.5,1e-7,298\n', query: 'sample=U9', status: 422, message: /kelvin/, row: 2, column: 'Temp (°C)' },
	{ name: 'no temperature anywhere', body: good, query: 'sample=U9', status: 422, message: /temperature/ },
	{ name: 'two temperatures in one file', body: 'V (V),I (A),T (°C)\n' + lines.slice(1).map((l, k) => `${l},${k % 2 ? 25 : 85}`).join('\n'), query: 'sample=U9', status: 422, message: /one temperature per file/ },
	{ name: 'file temperature disagrees with the entered one', body: 'V (V),I (A),T (°C)\n' + lines.slice(1).map((l) => `${l},85`).join('\n'), query: 'sample=U9&temperatureC=25', status: 422, message: /disagrees|correct one/ },
	{ name: 'reverse points only', body: 'V (V),I (A)\n-5,-1e-11\n-4,-0.9e-11\n-3,-0.8e-11\n-2,-0.7e-11\n-1,-0.5e-11\n', status: 422, message: /no forward-bias points/ },
	{ name: 'too few forward points to fit', body: 'V (V),I (A)\n0.3,1e-9\n0.4,5e-8\n0.5,2e-6\n0.6,1e-4\n', status: 422, message: /too few forward points/ },
	{ name: 'less than a decade of current', body: forwardCsv({ from: 1e-6, to: 5e-6 }), status: 422, message: /decades/ },
	{ name: 'over the size limit', body: bigBody, status: 413, message: /bytes/ },
	{ name: 'no sample label', body: good, query: 'temperatureC=25', status: 400, message: /sample/ },
	{ name: 'sample label with spaces', body: good, query: 'sample=unit%20one&temperatureC=25', status: 400, message: /sample/ },
	{ name: 'JSON point with text voltage', json: { sample: 'U9', temperatureC: 25, points: [{ voltageV: '0.5', currentA: 1e-6 }] }, status: 400, message: /does not match/ },
	{ name: 'JSON with no points', json: { sample: 'U9', temperatureC: 25, points: [] }, status: 400, message: /./ },
	{ name: 'JSON that is not JSON', body: '{"sample": "U9", ', type: 'application/json', status: 400, message: /not valid JSON/ },
	{ name: 'excluded range backwards', body: good, query: 'sample=U9&temperatureC=25&excludeFromV=0.6&excludeToV=0.5', status: 400, message: /left out of the fit/ },
	{ name: 'unsupported content type', body: '<sweep/>', type: 'application/xml', status: 400, message: /multipart|csv/ }
];

let partId: number;
let before: Record<string, number>;

beforeAll(async () => {
	const created = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: unique('BAD'), maker: 'Test Fab', kind: 'diode' } });
	expect(created.status).toBe(201);
	partId = created.body.id;
	before = await counts();
});

describe('malformed uploads are refused and write nothing', () => {
	for (const c of CASES) {
		test(c.name, async () => {
			const path = `/api/v1/junctions/${partId}/runs?${c.query ?? 'sample=U9&temperatureC=25'}`;
			const r = c.json !== undefined ? await api('POST', path, { as: 'librarian', json: c.json }) : await api('POST', path, { as: 'librarian', body: c.body, headers: { 'content-type': c.type ?? 'text/csv' } });
			expect(r.status, JSON.stringify(r.body)).toBe(c.status);
			expect(r.body.error.code).toBeTypeOf('string');
			expect(r.body.error.message).toMatch(c.message);
			if (c.row !== undefined || c.column !== undefined) {
				const issues: { row?: number; column?: string }[] = r.body.error.issues ?? [];
				const hit = issues.some((i) => (c.row === undefined || i.row === c.row) && (c.column === undefined || (typeof c.column === 'string' ? i.column === c.column : c.column.test(i.column ?? ''))));
				expect(hit, JSON.stringify(issues)).toBe(true);
			}
			expect(await counts()).toEqual(before);
		});
	}
});

afterAll(async () => {
	// Nothing to clean: the test part stays as an empty catalogue entry with a unique number.
});
