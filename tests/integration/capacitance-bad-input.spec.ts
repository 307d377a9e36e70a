// Malformed C–V uploads: each is refused with a message saying what and where (the row and
// the column as the file names them, or the field), and none writes a row anywhere (counted
// in every table an upload can touch).
import { beforeAll, describe, expect, test } from 'vitest';
import { api, unique } from './helpers';
import { counts, cvCsv } from './catalogue-fixtures';

type Case = {
	name: string;
	body?: string;
	json?: unknown;
	query?: string;
	status: number;
	message: RegExp;
	/** An issue must name this row and column (or field path). */
	row?: number;
	column?: string;
	path?: string;
};

const good = cvCsv();
const lines = good.trim().split('\n');
/** The good file with data line k (1 = the first after the header) replaced. */
const withRow = (k: number, row: string) => [...lines.slice(0, k), row, ...lines.slice(k + 1)].join('\n') + '\n';
const body = (header: string, rows: string[]) => [header, ...rows].join('\n') + '\n';
const REVERSE = ['-5,2.1', '-4,2.3', '-3,2.5', '-2,2.8', '-1,3.3', '0,4.0'];

const CASES: Case[] = [
	{ name: 'header only', body: 'V (V),C (pF)\n', status: 422, message: /no data rows/, row: 1 },
	{ name: 'no capacitance column', body: body('V (V),Q (x)', REVERSE), query: 'sample=U9&temperatureC=25&measurement=cv', status: 422, message: /no capacitance column/, row: 1 },
	{ name: 'two capacitance columns', body: body('V (V),C (pF),Cs (pF)', REVERSE.map((r) => `${r},1`)), status: 422, message: /second capacitance column/, row: 1, column: 'Cs (pF)' },
	{ name: 'unknown capacitance unit', body: body('V (V),C (pH)', REVERSE), status: 422, message: /unknown capacitance unit/, row: 1, column: 'C (pH)' },
	{ name: 'unknown frequency unit', body: body('V (V),C (pF),Freq (rpm)', REVERSE.map((r) => `${r},5`)), status: 422, message: /unknown frequency unit/, row: 1, column: 'Freq (rpm)' },
	{ name: 'text in a capacitance', body: withRow(4, '-8.4,tbd'), status: 422, message: /expected a number, got 'tbd'/, row: 5, column: 'C (pF)' },
	{ name: 'text in a voltage', body: withRow(3, 'minus nine,2.5'), status: 422, message: /expected a number/, row: 4, column: 'V (V)' },
	{ name: 'NaN capacitance', body: withRow(6, '-7.5,NaN'), status: 422, message: /not a finite number/, row: 7, column: 'C (pF)' },
	{ name: 'missing capacitance', body: withRow(2, '-9.5,'), status: 422, message: /missing value/, row: 3, column: 'C (pF)' },
	{ name: 'missing cell in a row', body: withRow(2, '-9.5'), status: 422, message: /missing value/, row: 3, column: 'C (pF)' },
	{ name: 'negative capacitance', body: body('V (V),C (pF)', ['-5,2.1', '-4,-0.2', '-3,2.5', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /not above zero/, row: 3, column: 'C (pF)' },
	{ name: 'zero capacitance', body: body('V (V),C (pF)', ['-5,2.1', '-4,2.3', '-3,0', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /not above zero/, row: 4, column: 'C (pF)' },
	{ name: 'cell unit against the header unit', body: body('V (V),C (pF)', ['-5,2.1', '-4,2.3 nF', '-3,2.5', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /conflicts with the header unit/, row: 3, column: 'C (pF)' },
	{ name: 'mixed units in a column', body: body('V,C', ['-5,2.1 pF', '-4,0.0023 nF', '-3,2.5 pF', '-2,2.8 pF', '-1,3.3 pF', '0,4 pF']), status: 422, message: /mixed units/, row: 3, column: 'C' },
	{ name: 'a current in a capacitance column', body: body('V,C', ['-5,2.1 nA', '-4,2.3', '-3,2.5', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /unknown unit 'nA'/, row: 2, column: 'C' },
	{ name: 'decimal comma in a comma-separated file', body: withRow(5, '-8,0,2.2'), status: 422, message: /3 cells where 2 were expected .* decimal comma/, row: 6 },
	{ name: 'two test frequencies in one file', body: body('V (V),C (pF),Freq (kHz)', REVERSE.map((r, k) => `${r},${k < 3 ? 1 : 1000}`)), status: 422, message: /one test frequency per file/, row: 5, column: 'Freq (kHz)' },
	{ name: 'test level changing', body: body('V (V),C (pF),Level (mV)', REVERSE.map((r, k) => `${r},${k === 5 ? 100 : 30}`)), status: 422, message: /one test-signal level per file/, row: 7, column: 'Level (mV)' },
	{ name: 'conflicting repeats at one voltage', body: body('V (V),C (pF)', ['-5,2.1', '-4,2.3', '-4,6.9', '-3,2.5', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /conflicting capacitance/, row: 4, column: 'C (pF)' },
	{ name: 'temperature column in °C holding kelvin', body: body('V (V),C (pF),Temp (°C)', REVERSE.map((r) => `${r},298`)), query: 'sample=U9&measurement=cv', status: 422, message: /kelvin/, row: 2, column: 'Temp (°C)' },
	{ name: 'two temperatures in one file', body: body('V (V),C (pF),T (°C)', REVERSE.map((r, k) => `${r},${k % 2 ? 25 : 85}`)), query: 'sample=U9', status: 422, message: /one temperature per file/, column: 'T (°C)' },
	{ name: 'file frequency disagrees with the entered one', body: body('V (V),C (pF),Freq (kHz)', REVERSE.map((r) => `${r},1000`)), query: 'sample=U9&temperatureC=25&frequencyHz=1k', status: 422, message: /correct one of them/, column: 'Freq (kHz)' },
	{ name: 'frequency typed without a number', body: good, query: 'sample=U9&temperatureC=25&measurement=cv&frequencyHz=fast', status: 400, message: /Test frequency: expected a frequency/, path: 'frequencyHz' },
	{ name: 'negative stray capacitance', body: good, query: 'sample=U9&temperatureC=25&strayCapacitanceF=-1p', status: 400, message: /Stray capacitance is zero or more/, path: 'strayCapacitanceF' },
	{ name: 'unknown measurement', body: good, query: 'sample=U9&temperatureC=25&measurement=lcr', status: 400, message: /measurement is one of iv, cv/, path: 'measurement' },
	{ name: 'stray larger than the junction', body: good, query: 'sample=U9&temperatureC=25&strayCapacitanceF=3p', status: 422, message: /not above zero .* stray/ },
	{ name: 'fewer than 5 points', body: body('V (V),C (pF)', ['-3,2.5', '-2,2.8', '-1,3.3', '0,4']), status: 422, message: /the fit needs at least 5/ },
	{ name: 'under 1 V of bias', body: body('V (V),C (pF)', ['-0.8,3.4', '-0.6,3.5', '-0.4,3.7', '-0.2,3.85', '0,4']), status: 422, message: /the fit needs at least 1 V/ },
	{ name: 'capacitance rising with reverse bias', body: body('V (V),C (pF)', ['-5,4', '-4,3.3', '-3,2.8', '-2,2.5', '-1,2.3', '0,2.1']), status: 422, message: /does not fall with reverse bias/ },
	{ name: 'JSON capacitance as text', json: { sample: 'U9', temperatureC: 25, points: [{ voltageV: -1, capacitanceF: '3p' }] }, status: 400, message: /voltageV, capacitanceF/, path: 'points.0.capacitanceF' },
	{ name: 'JSON C–V points said to be I–V', json: { sample: 'U9', temperatureC: 25, measurement: 'iv', points: [{ voltageV: -1, capacitanceF: 3e-12 }] }, status: 400, message: /voltageV, capacitanceF/, path: 'measurement' },
	{ name: 'JSON stray not a capacitance', json: { sample: 'U9', temperatureC: 25, strayCapacitanceF: '1 V', points: [{ voltageV: -1, capacitanceF: 3e-12 }] }, status: 400, message: /does not match/, path: 'strayCapacitanceF' }
];

let partId: number;
let before: Record<string, number>;

beforeAll(async () => {
	const created = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: unique('BADCV'), maker: 'Calder Test Fab', kind: 'diode' } });
	expect(created.status).toBe(201);
	partId = created.body.id;
	before = await counts();
});

describe('malformed C–V uploads are refused with row and column, and write nothing', () => {
	for (const c of CASES) {
		test(c.name, async () => {
			const path = `/api/v1/junctions/${partId}/runs?${c.query ?? 'sample=U9&temperatureC=25'}`;
			const r = c.json !== undefined ? await api('POST', path, { as: 'librarian', json: c.json }) : await api('POST', path, { as: 'librarian', body: c.body, headers: { 'content-type': 'text/csv' } });
			expect(r.status, JSON.stringify(r.body)).toBe(c.status);
			expect(r.body.error.message).toMatch(c.message);
			const issues: { row?: number; column?: string; path?: string }[] = r.body.error.issues ?? [];
			if (c.row !== undefined || c.column !== undefined || c.path !== undefined) {
				const hit = issues.some((i) => (c.row === undefined || i.row === c.row) && (c.column === undefined || i.column === c.column) && (c.path === undefined || i.path === c.path));
				expect(hit, JSON.stringify(issues)).toBe(true);
			}
			expect(await counts()).toEqual(before);
		});
	}
});
